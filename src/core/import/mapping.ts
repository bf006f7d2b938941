// Column mappings: the user's corrections to how a file's columns are read, as plain data that
// can be saved by name and given again (API, CLI --mapping). A mapping names columns by their
// header text, not their position, so it still fits when a tester reorders columns.

import type { Delimiter } from './delimited';
import { parseMeasurementHeader } from '../params';
import { checkPlan, measurementOf, planHeader, type ColumnPlan, type ColumnRole, type HeaderPlan } from './headers';

export interface ColumnOverride {
  /** Header text as written in the file (compared after trimming, case-insensitively). */
  header: string;
  role: ColumnRole;
  /** Measurements: the parameter name to store (e.g. "Ioff_n"). */
  name?: string;
  /** Measurements: the unit the values are written in ("pA", "uA", "V"); empty = as written. */
  unit?: string;
}

/** Long layout and STDF: how one test (by name or number) becomes a parameter. */
export interface TestOverride {
  /** Test name as written, or "#" followed by the STDF test number ("#1200"). */
  test: string;
  /** Parameter name to store; "" leaves the test out. */
  name: string;
  /** Unit the values are written in, when the file does not say or says it wrongly. */
  unit?: string;
}

export interface GridBounds { xMin: number; xMax: number; yMin: number; yMax: number }

export interface ColumnMapping {
  /** Header texts the mapping was made for; a saved mapping whose headers match a file is applied to it. */
  headers?: string[];
  delimiter?: Delimiter;
  /** Lot name for files without a lot column (default: the file name). */
  lot?: string;
  columns?: ColumnOverride[];
  tests?: TestOverride[];
  /** Dies outside these inclusive bounds are rejected. */
  grid?: GridBounds;
}

const ROLES: readonly ColumnRole[] = ['lot', 'wafer', 'x', 'y', 'site', 'measurement', 'test', 'value', 'unit', 'ignored'];

/** Checks that an unknown value (JSON from a file or a transport) is a ColumnMapping; returns sentences. */
export function mappingProblems(value: unknown): string[] {
  const problems: string[] = [];
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return ['A mapping must be an object.'];
  const m = value as Record<string, unknown>;
  const known = new Set(['headers', 'delimiter', 'lot', 'columns', 'tests', 'grid']);
  for (const key of Object.keys(m)) if (!known.has(key)) problems.push(`Unknown mapping field "${key.slice(0, 40)}".`);
  if (m.headers !== undefined && !(Array.isArray(m.headers) && m.headers.every((h) => typeof h === 'string'))) problems.push('headers must be a list of texts.');
  if (m.delimiter !== undefined && ![',', '\t', ';'].includes(m.delimiter as string)) problems.push('delimiter must be ",", tab or ";".');
  if (m.lot !== undefined && (typeof m.lot !== 'string' || m.lot.trim() === '')) problems.push('lot must be a non-empty text.');
  if (m.columns !== undefined) {
    if (!Array.isArray(m.columns)) problems.push('columns must be a list.');
    else m.columns.forEach((c, i) => {
      const o = c as Record<string, unknown>;
      if (typeof o !== 'object' || o === null || typeof o.header !== 'string') problems.push(`columns[${i}] needs a header text.`);
      else if (!ROLES.includes(o.role as ColumnRole)) problems.push(`columns[${i}] role must be one of ${ROLES.join(', ')}.`);
      else if ((o.name !== undefined && typeof o.name !== 'string') || (o.unit !== undefined && typeof o.unit !== 'string')) problems.push(`columns[${i}] name and unit must be texts.`);
    });
  }
  if (m.tests !== undefined) {
    if (!Array.isArray(m.tests)) problems.push('tests must be a list.');
    else m.tests.forEach((t, i) => {
      const o = t as Record<string, unknown>;
      if (typeof o !== 'object' || o === null || typeof o.test !== 'string' || typeof o.name !== 'string' || (o.unit !== undefined && typeof o.unit !== 'string')) {
        problems.push(`tests[${i}] needs test and name texts.`);
      }
    });
  }
  if (m.grid !== undefined) {
    const g = m.grid as Record<string, unknown>;
    const ok = typeof g === 'object' && g !== null && ['xMin', 'xMax', 'yMin', 'yMax'].every((k) => Number.isInteger(g[k]));
    if (!ok || (g.xMin as number) > (g.xMax as number) || (g.yMin as number) > (g.yMax as number)) problems.push('grid needs integer xMin <= xMax and yMin <= yMax.');
  }
  return problems;
}

const key = (text: string) => text.trim().toLowerCase();

/** True when a saved mapping was made for exactly these headers. */
export function mappingFits(mapping: ColumnMapping, headers: string[]): boolean {
  if (!mapping.headers || mapping.headers.length !== headers.length) return false;
  return mapping.headers.every((h, i) => key(h) === key(headers[i]));
}

/** Plans the header with the mapping's corrections on top of the inferred plan. */
export function planWithMapping(headers: string[], mapping: ColumnMapping | undefined): HeaderPlan {
  const inferred = planHeader(headers);
  if (!mapping?.columns || mapping.columns.length === 0) return inferred;
  const overrides = new Map(mapping.columns.map((c) => [key(c.header), c]));
  const errors: string[] = [];
  const warnings: string[] = [];
  const byRole = new Map<ColumnRole, ColumnPlan>();
  const chosen = new Set<ColumnPlan>();
  const columns = inferred.columns.map((column): ColumnPlan => {
    const o = overrides.get(key(column.header));
    overrides.delete(key(column.header));
    let plan: ColumnPlan = { ...column };
    if (o) {
      plan = { index: column.index, header: column.header, role: o.role };
      if (o.role === 'measurement') {
        const unitText = o.unit && o.unit.trim() !== '' ? o.unit.trim() : parseMeasurementHeader(column.header).unitText;
        const m = measurementOf(o.name && o.name.trim() !== '' ? o.name.trim() : column.header, unitText);
        plan = { ...plan, name: m.name, unit: m.unit, scale: m.scale };
        if (m.error) errors.push(`Column ${column.index + 1} "${column.header}": ${m.error}`);
      }
    }
    if (plan.role !== 'measurement' && plan.role !== 'ignored') {
      const earlier = byRole.get(plan.role);
      if (earlier) {
        if (o && chosen.has(earlier)) {
          errors.push(`The mapping gives the ${plan.role} role to both "${earlier.header}" and "${column.header}".`);
        } else if (o) { // the user's choice wins over an inferred column with the same role
          earlier.role = 'ignored';
        } else {
          warnings.push(`Column ${column.index + 1} "${column.header}" repeats the ${plan.role} column; it is ignored.`);
          return { index: column.index, header: column.header, role: 'ignored' };
        }
      }
      byRole.set(plan.role, plan);
    }
    if (o) chosen.add(plan);
    return plan;
  });
  for (const header of overrides.keys()) warnings.push(`The mapping names a column "${header}" that this file does not have.`);
  const layout = checkPlan(columns, errors, warnings);
  return { columns, layout, errors, warnings };
}
