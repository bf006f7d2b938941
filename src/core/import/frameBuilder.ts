// Collects validated rows of a delimited file into wafer frames (growable typed columns), one per
// lot and wafer, and records every rejected row with its line number and reason.

import type { ParamInfo, WaferFrame } from '../frame';
import type { ColumnPlan, HeaderPlan } from './headers';

const MISSING = new Set(['', 'na', 'n/a', 'nan', 'null', 'none', '-', '--']);

/** Parses one measurement field: a number, NaN for an accepted missing marker, undefined if bad. */
export function parseValue(field: string): number | undefined {
  const t = field.trim();
  if (MISSING.has(t.toLowerCase())) return NaN;
  const v = Number(t);
  if (t === '' || Number.isNaN(v)) return undefined;
  return v;
}

class GrowableFloat64 {
  data = new Float64Array(1024);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  take(): Float64Array { return this.data.slice(0, this.length); }
}

class GrowableInt32 {
  data = new Int32Array(1024);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Int32Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  take(): Int32Array { return this.data.slice(0, this.length); }
}

interface WaferBuilder {
  lot: string;
  wafer: string;
  x: GrowableInt32;
  y: GrowableInt32;
  site: GrowableInt32;
  values: GrowableFloat64[];
  /** "x,y" -> row index, for the duplicate-die rule. */
  seen: Map<number, number>;
}

export interface RejectedRow {
  line: number;
  reason: string;
}

export interface BuildReport {
  rowsRead: number;
  rowsStored: number;
  rejected: RejectedRow[];
  /** Count of rejected rows (the list keeps only the first ones). */
  rejectedCount: number;
  /** Dies given again later in the file: the later row replaces the earlier one. */
  duplicatesReplaced: number;
}

const MAX_REJECTED_KEPT = 200;
const COORD_LIMIT = 100_000;

/**
 * Builds frames from records. Rule for a die listed twice on one wafer: the later row wins (a
 * retest is written after the first test), and the count is reported.
 */
export class FrameBuilder {
  private wafers = new Map<string, WaferBuilder>();
  private readonly measurements: ColumnPlan[];
  private readonly params: ParamInfo[];
  private readonly col: Record<'lot' | 'wafer' | 'x' | 'y' | 'site', number>;
  readonly report: BuildReport = { rowsRead: 0, rowsStored: 0, rejected: [], rejectedCount: 0, duplicatesReplaced: 0 };

  constructor(private readonly plan: HeaderPlan, private readonly defaultLot: string) {
    this.measurements = plan.columns.filter((c) => c.role === 'measurement');
    this.params = this.measurements.map((c) => ({ name: c.name!, unit: c.unit ?? '' }));
    const find = (role: string) => plan.columns.find((c) => c.role === role)?.index ?? -1;
    this.col = { lot: find('lot'), wafer: find('wafer'), x: find('x'), y: find('y'), site: find('site') };
  }

  private reject(line: number, reason: string): void {
    this.report.rejectedCount++;
    if (this.report.rejected.length < MAX_REJECTED_KEPT) this.report.rejected.push({ line, reason });
  }

  add(line: number, fields: string[]): void {
    this.report.rowsRead++;
    const width = this.plan.columns.length;
    if (fields.length < width) {
      this.reject(line, `has ${fields.length} fields, the header has ${width}`);
      return;
    }
    const lot = this.col.lot >= 0 ? fields[this.col.lot].trim() : this.defaultLot;
    const wafer = fields[this.col.wafer].trim();
    if (lot === '') { this.reject(line, 'lot is empty'); return; }
    if (wafer === '') { this.reject(line, 'wafer is empty'); return; }
    const x = Number(fields[this.col.x]);
    const y = Number(fields[this.col.y]);
    if (!Number.isInteger(x) || !Number.isInteger(y) || Math.abs(x) > COORD_LIMIT || Math.abs(y) > COORD_LIMIT) {
      this.reject(line, `die coordinates "${fields[this.col.x].trim()}", "${fields[this.col.y].trim()}" are not integers within ±${COORD_LIMIT}`);
      return;
    }
    let site = -1;
    if (this.col.site >= 0) {
      const text = fields[this.col.site].trim();
      // "Head/Site" style values such as "1/3" keep the site part.
      const part = text.includes('/') ? text.slice(text.lastIndexOf('/') + 1) : text;
      const s = Number(part);
      if (part === '' || !Number.isInteger(s) || s < 0) { this.reject(line, `probe site "${text}" is not a whole number`); return; }
      site = s;
    }
    const values = new Float64Array(this.measurements.length);
    for (let m = 0; m < this.measurements.length; m++) {
      const column = this.measurements[m];
      const v = parseValue(fields[column.index]);
      if (v === undefined) { this.reject(line, `${column.header} "${fields[column.index].trim()}" is not a number`); return; }
      values[m] = v * (column.scale ?? 1);
    }
    const key = `${lot}\u0000${wafer}`;
    let builder = this.wafers.get(key);
    if (!builder) {
      builder = {
        lot, wafer, x: new GrowableInt32(), y: new GrowableInt32(), site: new GrowableInt32(),
        values: this.measurements.map(() => new GrowableFloat64()), seen: new Map(),
      };
      this.wafers.set(key, builder);
    }
    const dieKey = (x + COORD_LIMIT) * (2 * COORD_LIMIT + 1) + (y + COORD_LIMIT);
    const earlier = builder.seen.get(dieKey);
    if (earlier !== undefined) {
      builder.site.data[earlier] = site;
      for (let m = 0; m < values.length; m++) builder.values[m].data[earlier] = values[m];
      this.report.duplicatesReplaced++;
      this.report.rowsStored++;
      return;
    }
    builder.seen.set(dieKey, builder.x.length);
    builder.x.push(x);
    builder.y.push(y);
    builder.site.push(site);
    for (let m = 0; m < values.length; m++) builder.values[m].push(values[m]);
    this.report.rowsStored++;
  }

  frames(): WaferFrame[] {
    const out: WaferFrame[] = [];
    for (const b of this.wafers.values()) {
      const values: Record<string, Float64Array> = {};
      this.params.forEach((p, m) => { values[p.name] = b.values[m].take(); });
      out.push({ lot: b.lot, wafer: b.wafer, x: b.x.take(), y: b.y.take(), site: b.site.take(), params: this.params.map((p) => ({ ...p })), values });
    }
    return out;
  }
}
