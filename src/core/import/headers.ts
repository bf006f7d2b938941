// Header inference for delimited per-die files: which column is the lot, the wafer, die x/y, the
// probe site, and which are measurements (with their unit scale to SI base units).

import { canonicalBaseUnit, parseMeasurementHeader } from '../params';

export type ColumnRole = 'lot' | 'wafer' | 'x' | 'y' | 'site' | 'measurement' | 'ignored';

export interface ColumnPlan {
  index: number;
  header: string;
  role: ColumnRole;
  /** For measurements: stored parameter name. */
  name?: string;
  /** For measurements: SI base unit ("A", "V" or "" when unknown). */
  unit?: string;
  /** For measurements: factor from the written unit to the base unit. */
  scale?: number;
}

export interface HeaderPlan {
  columns: ColumnPlan[];
  /** Problems that stop the import, as sentences. */
  errors: string[];
  /** Things worth telling the user that do not stop the import. */
  warnings: string[];
}

const ROLE_WORDS: Record<Exclude<ColumnRole, 'measurement' | 'ignored'>, string[]> = {
  lot: ['lot', 'lotid', 'lot_id', 'lotno', 'lot_no', 'lotname'],
  wafer: ['wafer', 'waferid', 'wafer_id', 'waferno', 'wafer_no', 'slot', 'wf', 'wafernum'],
  x: ['x', 'diex', 'die_x', 'col', 'column', 'xcoord', 'x_coord', 'xadr', 'xloc'],
  y: ['y', 'diey', 'die_y', 'row', 'ycoord', 'y_coord', 'yadr', 'yloc'],
  site: ['site', 'siteno', 'site_no', 'site_num', 'sitenum', 'probesite', 'probe_site', 'head/site'],
};

function roleOf(header: string): ColumnRole | undefined {
  const key = header.trim().toLowerCase().replace(/\s+/g, '');
  for (const [role, words] of Object.entries(ROLE_WORDS)) {
    if (words.includes(key)) return role as ColumnRole;
  }
  return undefined;
}

/** True when a line of fields looks like a header (used to skip repeated header lines). */
export function looksLikeHeader(fields: string[], plan: HeaderPlan): boolean {
  if (fields.length !== plan.columns.length) return false;
  let same = 0;
  for (let i = 0; i < fields.length; i++) if (fields[i].trim() === plan.columns[i].header) same++;
  return same >= Math.max(2, Math.ceil(fields.length / 2));
}

/** Plans how each header column is read. */
export function planHeader(headers: string[]): HeaderPlan {
  const errors: string[] = [];
  const warnings: string[] = [];
  const seenRoles = new Map<ColumnRole, number>();
  const seenNames = new Map<string, number>();
  const columns: ColumnPlan[] = headers.map((raw, index) => {
    const header = raw.trim();
    const role = roleOf(header);
    if (role) {
      if (seenRoles.has(role)) {
        warnings.push(`Column ${index + 1} "${header}" repeats the ${role} column ${seenRoles.get(role)! + 1}; it is ignored.`);
        return { index, header, role: 'ignored' };
      }
      seenRoles.set(role, index);
      return { index, header, role };
    }
    if (header === '') {
      return { index, header, role: 'ignored' };
    }
    const parsed = parseMeasurementHeader(header);
    let unit = '';
    let scale = 1;
    const expected = parsed.canonical ? canonicalBaseUnit(parsed.name) : undefined;
    if (parsed.unit) {
      unit = parsed.unit.base;
      scale = parsed.unit.scale;
      if (expected && expected !== unit) {
        errors.push(`Column ${index + 1} "${header}": ${parsed.name} is measured in ${expected}, but the header says ${parsed.unitText}.`);
      }
    } else if (parsed.unitText !== undefined) {
      warnings.push(`Column ${index + 1} "${header}": unit "${parsed.unitText}" is not one Offstate knows; values are kept as written.`);
    } else if (expected) {
      unit = expected;
    }
    if (seenNames.has(parsed.name)) {
      errors.push(`Columns ${seenNames.get(parsed.name)! + 1} and ${index + 1} both hold ${parsed.name}.`);
    }
    seenNames.set(parsed.name, index);
    return { index, header, role: 'measurement', name: parsed.name, unit, scale };
  });
  for (const role of ['wafer', 'x', 'y'] as const) {
    if (!seenRoles.has(role)) {
      errors.push(`No ${role === 'x' ? 'die X' : role === 'y' ? 'die Y' : 'wafer'} column found; expected a header such as ${ROLE_WORDS[role].slice(0, 3).map((w) => `"${w}"`).join(', ')}.`);
    }
  }
  if (!columns.some((c) => c.role === 'measurement')) {
    errors.push('No measurement columns found.');
  }
  return { columns, errors, warnings };
}
