// Header inference for delimited per-die files: which column is the lot, the wafer, die x/y, the
// probe site, and which are measurements (with their unit scale to SI base units). A file with a
// test-name column and a value column is in the long layout (one row per die and test).

import { canonicalBaseUnit, parseMeasurementHeader, parseUnit } from '../params';

export type ColumnRole = 'lot' | 'wafer' | 'x' | 'y' | 'site' | 'measurement' | 'test' | 'value' | 'unit' | 'ignored';
export type Layout = 'wide' | 'long';

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
  /** Wide: one row per die, one column per measurement. Long: one row per die and test. */
  layout: Layout;
  /** Problems that stop the import, as sentences. */
  errors: string[];
  /** Things worth telling the user that do not stop the import. */
  warnings: string[];
}

type KeyRole = Exclude<ColumnRole, 'measurement' | 'ignored'>;

const ROLE_WORDS: Record<KeyRole, string[]> = {
  lot: ['lot', 'lotid', 'lot_id', 'lotno', 'lot_no', 'lotname', 'lot_name', 'lotnumber'],
  wafer: ['wafer', 'waferid', 'wafer_id', 'waferno', 'wafer_no', 'slot', 'slotid', 'slot_id', 'wf', 'wafernum', 'wafer_num', 'wafernumber'],
  x: ['x', 'diex', 'die_x', 'col', 'column', 'xcoord', 'x_coord', 'xadr', 'xloc', 'x_pos', 'xpos'],
  y: ['y', 'diey', 'die_y', 'row', 'ycoord', 'y_coord', 'yadr', 'yloc', 'y_pos', 'ypos'],
  site: ['site', 'siteno', 'site_no', 'site_num', 'sitenum', 'siteid', 'site_id', 'probesite', 'probe_site', 'head/site', 'head_site'],
  test: ['test', 'testname', 'test_name', 'testid', 'test_id', 'parameter', 'param', 'paramname', 'param_name', 'test_txt'],
  value: ['value', 'result', 'reading', 'meas_value', 'measvalue', 'testvalue', 'test_value'],
  unit: ['unit', 'units', 'test_unit', 'testunit'],
};

export function roleOf(header: string): KeyRole | undefined {
  const key = header.trim().toLowerCase().replace(/\s+/g, '');
  for (const [role, words] of Object.entries(ROLE_WORDS)) {
    if (words.includes(key)) return role as KeyRole;
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

/** A measurement column's name, base unit and scale from its header text (or a unit override). */
export function measurementOf(header: string, unitOverride?: string): { name: string; unit: string; scale: number; error?: string; warning?: string } {
  const parsed = parseMeasurementHeader(header);
  const expected = parsed.canonical ? canonicalBaseUnit(parsed.name) : undefined;
  const unitText = unitOverride ?? parsed.unitText;
  const unit = unitText !== undefined ? parseUnit(unitText) : undefined;
  if (unit) {
    if (expected && expected !== unit.base) {
      return { name: parsed.name, unit: unit.base, scale: unit.scale, error: `${parsed.name} is measured in ${expected}, but the header says ${unitText}.` };
    }
    return { name: parsed.name, unit: unit.base, scale: unit.scale };
  }
  if (unitText !== undefined && unitText !== '') {
    return { name: parsed.name, unit: '', scale: 1, warning: `unit "${unitText}" is not one Offstate knows; values are kept as written.` };
  }
  return { name: parsed.name, unit: expected ?? '', scale: 1 };
}

/** Checks a list of planned columns: required roles present, one column per role and name. */
export function checkPlan(columns: ColumnPlan[], errors: string[], warnings: string[]): Layout {
  const has = (role: ColumnRole) => columns.some((c) => c.role === role);
  const layout: Layout = has('test') && has('value') ? 'long' : 'wide';
  for (const role of ['wafer', 'x', 'y'] as const) {
    if (!has(role)) {
      errors.push(`No ${role === 'x' ? 'die X' : role === 'y' ? 'die Y' : 'wafer'} column found; expected a header such as ${ROLE_WORDS[role].slice(0, 3).map((w) => `"${w}"`).join(', ')}.`);
    }
  }
  if (layout === 'wide') {
    if (has('test') !== has('value')) errors.push(`A ${has('test') ? 'test-name' : 'value'} column without a ${has('test') ? 'value' : 'test-name'} column: a long-layout file needs both.`);
    if (!columns.some((c) => c.role === 'measurement')) errors.push('No measurement columns found.');
  } else {
    for (const c of columns) {
      if (c.role === 'measurement') { warnings.push(`Column ${c.index + 1} "${c.header}" is ignored in a file with one row per die and test.`); c.role = 'ignored'; }
    }
  }
  const names = new Map<string, number>();
  for (const c of columns) {
    if (c.role !== 'measurement') continue;
    if (names.has(c.name!)) errors.push(`Columns ${names.get(c.name!)! + 1} and ${c.index + 1} both hold ${c.name}.`);
    names.set(c.name!, c.index);
  }
  return layout;
}

/** Plans how each header column is read. */
export function planHeader(headers: string[]): HeaderPlan {
  const errors: string[] = [];
  const warnings: string[] = [];
  const seenRoles = new Map<ColumnRole, number>();
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
    if (header === '') return { index, header, role: 'ignored' };
    const m = measurementOf(header);
    if (m.error) errors.push(`Column ${index + 1} "${header}": ${m.error}`);
    if (m.warning) warnings.push(`Column ${index + 1} "${header}": ${m.warning}`);
    return { index, header, role: 'measurement', name: m.name, unit: m.unit, scale: m.scale };
  });
  const layout = checkPlan(columns, errors, warnings);
  return { columns, layout, errors, warnings };
}
