// Collects validated rows of a delimited file into wafer frames, one per lot and wafer, and
// records every rejected row with its line number and reason. Wide layout: one row per die.
// Long layout: one row per die and test, pivoted into one column per test.
//
// Rules (stated once, applied everywhere):
// - A row is stored whole or not at all: a row with any unreadable or impossible field is rejected.
// - Impossible: a current (unit A) of exactly 0 (an open contact, not a reading), any infinite
//   value, die coordinates outside the mapping's grid (or beyond +/-100,000 without one).
// - A die given twice on one wafer in one file: the later row wins (a retest is written after the
//   first test), and the count is reported. In the long layout this applies per die and test.
// - Memory is bounded: when more than maxHeldCells values are held, the least recently used
//   wafer is handed out early (takeEvicted); the store merges it if the file brings it back.

import type { ParamInfo, WaferFrame } from '../frame';
import { measurementOf, type ColumnPlan, type HeaderPlan } from './headers';
import type { GridBounds, TestOverride } from './mapping';
import { parseInteger, parseValue } from './numbers';
import * as fast from './fastNumber';
import { decodeUtf8, scanField, scanNumber } from './fastNumber';
import { COORD_LIMIT, WaferAccumulator } from './waferAccumulator';
import { parseUnit } from '../params';

export { parseValue } from './numbers';

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
  /** Rejected rows per kind of problem. */
  rejectedBy: Record<string, number>;
  /** Dies (long layout: die and test) given again later in the file: the later row replaces the earlier one. */
  duplicatesReplaced: number;
  /** Long layout: rows of tests the mapping leaves out. */
  rowsLeftOut: number;
}

export interface BuildOptions {
  grid?: GridBounds;
  /** Long layout: test name -> parameter corrections. */
  tests?: TestOverride[];
  /** Values held in memory before the least recently used wafer is handed out early. */
  maxHeldCells?: number;
}

const MAX_REJECTED_KEPT = 200;
const DEFAULT_MAX_HELD_CELLS = 12_000_000;

interface LongParam { column: number; info: ParamInfo; scale: number; unitText: string; line: number }

export class FrameBuilder {
  private readonly wafers = new Map<string, WaferAccumulator>();
  private current: WaferAccumulator | undefined;
  private currentLot = '';
  private currentWafer = '';
  private evicted: WaferFrame[] = [];
  private held = 0;
  private readonly maxHeld: number;
  private readonly measurements: ColumnPlan[];
  private readonly params: ParamInfo[];
  private readonly isCurrent: boolean[];
  private readonly scratch: Float64Array;
  private readonly col: Record<'lot' | 'wafer' | 'x' | 'y' | 'site' | 'test' | 'value' | 'unit', number>;
  private readonly width: number;
  private readonly grid: GridBounds;
  private readonly longParams = new Map<string, LongParam | null>();
  private readonly testOverrides: Map<string, TestOverride>;
  private readonly starts: Int32Array;
  private readonly ends: Int32Array;
  private readonly scales: Float64Array;
  /** Per column on the fast path: 1 measurement, 2 die x, 3 die y, 4 site, 0 text or ignored. */
  private readonly kinds: Int8Array;
  private lastLotBytes = new Uint8Array(0);
  private lastWaferBytes = new Uint8Array(0);
  private lastLot = '';
  private lastWafer = '';
  readonly report: BuildReport = { rowsRead: 0, rowsStored: 0, rejected: [], rejectedCount: 0, rejectedBy: {}, duplicatesReplaced: 0, rowsLeftOut: 0 };

  constructor(private readonly plan: HeaderPlan, private readonly defaultLot: string, options: BuildOptions = {}) {
    this.measurements = plan.layout === 'long' ? [] : plan.columns.filter((c) => c.role === 'measurement');
    this.params = this.measurements.map((c) => ({ name: c.name!, unit: c.unit ?? '' }));
    this.isCurrent = this.params.map((p) => p.unit === 'A');
    this.scratch = new Float64Array(this.measurements.length);
    const find = (role: string) => plan.columns.find((c) => c.role === role)?.index ?? -1;
    this.col = { lot: find('lot'), wafer: find('wafer'), x: find('x'), y: find('y'), site: find('site'), test: find('test'), value: find('value'), unit: find('unit') };
    this.width = Math.max(...Object.values(this.col), ...this.measurements.map((c) => c.index)) + 1;
    this.grid = options.grid ?? { xMin: -COORD_LIMIT, xMax: COORD_LIMIT, yMin: -COORD_LIMIT, yMax: COORD_LIMIT };
    this.maxHeld = options.maxHeldCells ?? DEFAULT_MAX_HELD_CELLS;
    this.testOverrides = new Map((options.tests ?? []).map((t) => [t.test.trim().toLowerCase(), t]));
    this.starts = new Int32Array(plan.columns.length);
    this.ends = new Int32Array(plan.columns.length);
    this.scales = Float64Array.from(this.measurements, (c) => c.scale ?? 1);
    this.kinds = new Int8Array(plan.columns.length);
    for (const c of this.measurements) this.kinds[c.index] = 1;
    if (this.col.x >= 0) this.kinds[this.col.x] = 2;
    if (this.col.y >= 0) this.kinds[this.col.y] = 3;
    if (this.col.site >= 0) this.kinds[this.col.site] = 4;
  }

  private textOf(buf: Uint8Array, field: number, cachedBytes: Uint8Array, cachedText: string): string | undefined {
    const s = this.starts[field];
    const e = this.ends[field];
    if (e - s === cachedBytes.length) {
      let same = true;
      for (let i = 0; i < cachedBytes.length; i++) if (buf[s + i] !== cachedBytes[i]) { same = false; break; }
      if (same) return cachedText;
    }
    return undefined;
  }

  /**
   * The fast path for a wide-layout line that starts at buf[start] and ends at the next line feed
   * (or limit), with no quote character: fields are split and numbers read in one pass without
   * making strings. Returns the index of the line's end when the row was taken, or -1, having
   * recorded nothing, for any line that is not plainly valid; the caller then takes the string
   * path (add), which gives the exact rejection message. Both paths store identical values.
   */
  addLineBytes(buf: Uint8Array, start: number, limit: number, delimiter: number): number {
    if (this.plan.layout !== 'wide') return -1;
    const n = this.plan.columns.length;
    const starts = this.starts;
    const ends = this.ends;
    const kinds = this.kinds;
    const values = this.scratch;
    const count = values.length;
    let pos = start;
    let m = 0;
    let fieldEnd = start;
    let x = 0;
    let y = 0;
    let site = -1;
    // One pass: each field is found and, for a number, read as soon as it is reached.
    for (let f = 0; f < n; f++) {
      if (f > 0 && (fieldEnd >= limit || buf[fieldEnd] === 10)) return -1; // fewer fields than the header
      let cs = pos;
      let ce = -1;
      let next = -1;
      if (pos < limit && buf[pos] === 34) {
        // A simple quoted field: no doubled quote and no line break inside (the string path does those).
        let q = pos + 1;
        while (q < limit) { const b = buf[q]; if (b === 34 || b === 10) break; q++; }
        if (q >= limit || buf[q] !== 34) return -1;
        let t = q + 1;
        if (t < limit) {
          const b = buf[t];
          if (b === 13 && (t + 1 >= limit || buf[t + 1] === 10)) t++;
          else if (b !== delimiter && b !== 10) return -1;
        }
        cs = pos + 1;
        ce = q;
        next = t;
      }
      const kind = kinds[f];
      if (kind !== 0) {
        let v: number;
        if (ce >= 0) {
          v = cs === ce ? NaN : scanNumber(buf, cs, ce, delimiter);
          if (cs !== ce && fast.scanEnd !== ce) return -1;
          if (cs === ce && kind !== 1) return -1;
          fieldEnd = next;
        } else {
          const c0 = pos < limit ? buf[pos] : 10;
          if (c0 === delimiter || c0 === 10 || (c0 === 13 && (pos + 1 >= limit || buf[pos + 1] === 10))) {
            // An empty field: a missing value for a measurement, as on the string path.
            if (kind !== 1) return -1;
            v = NaN;
            fieldEnd = c0 === 13 ? pos + 1 : Math.min(pos, limit);
          } else {
            v = scanNumber(buf, pos, limit, delimiter);
            if (v !== v) return -1;
            fieldEnd = fast.scanEnd;
          }
        }
        if (kind === 1) {
          if (v === 0 && this.isCurrent[m]) return -1;
          values[m] = v * this.scales[m];
          m++;
        } else {
          // Die x, y and site, read in the same pass; the string path applies the same test.
          if (!Number.isInteger(v)) return -1;
          if (kind === 2) x = v; else if (kind === 3) y = v; else site = v;
        }
        starts[f] = cs;
        ends[f] = ce >= 0 ? ce : fieldEnd;
      } else if (ce >= 0) {
        starts[f] = cs;
        ends[f] = ce;
        fieldEnd = next;
      } else {
        fieldEnd = scanField(buf, pos, limit, delimiter);
        if (fieldEnd < limit && buf[fieldEnd] === 34) return -1; // a quote inside a field: the string path decides
        starts[f] = pos;
        ends[f] = fieldEnd;
      }
      pos = fieldEnd + 1;
    }
    if (fieldEnd < limit && buf[fieldEnd] !== 10) return -1; // more fields than the header: the string path decides
    const lineEnd = fieldEnd;
    const g = this.grid;
    if (x < g.xMin || x > g.xMax || y < g.yMin || y > g.yMax) return -1;
    if (this.col.site >= 0 && !(site >= 0)) return -1;
    let lot = this.defaultLot;
    if (this.col.lot >= 0) {
      const known = this.textOf(buf, this.col.lot, this.lastLotBytes, this.lastLot);
      if (known === undefined) {
        lot = decodeUtf8(buf, starts[this.col.lot], ends[this.col.lot]).trim();
        if (lot === '') return -1;
        this.lastLotBytes = buf.slice(starts[this.col.lot], ends[this.col.lot]);
        this.lastLot = lot;
      } else lot = known;
    }
    let wafer: string | undefined = this.textOf(buf, this.col.wafer, this.lastWaferBytes, this.lastWafer);
    if (wafer === undefined) {
      wafer = decodeUtf8(buf, starts[this.col.wafer], ends[this.col.wafer]).trim();
      if (wafer === '') return -1;
      this.lastWaferBytes = buf.slice(starts[this.col.wafer], ends[this.col.wafer]);
      this.lastWafer = wafer;
    }
    const waferName: string = wafer;
    this.report.rowsRead++;
    const acc = this.waferFor(lot, waferName);
    const row = acc.find(x, y);
    if (row >= 0) {
      acc.site.data[row] = site;
      this.report.duplicatesReplaced++;
      const columns = acc.columns;
      for (let k = 0; k < count; k++) columns[k].data[row] = values[k];
    } else {
      acc.addDieWith(x, y, site, values);
      this.held += count + 3;
    }
    this.report.rowsStored++;
    if (this.held > this.maxHeld) this.evictIfNeeded();
    return lineEnd;
  }

  /** Parameters seen so far, in column order. */
  get parameters(): ParamInfo[] { return this.params.map((p) => ({ ...p })); }

  private reject(line: number, kind: string, reason: string): void {
    this.report.rejectedCount++;
    this.report.rejectedBy[kind] = (this.report.rejectedBy[kind] ?? 0) + 1;
    if (this.report.rejected.length < MAX_REJECTED_KEPT) this.report.rejected.push({ line, reason });
  }

  private waferFor(lot: string, wafer: string): WaferAccumulator {
    if (this.current && lot === this.currentLot && wafer === this.currentWafer) return this.current;
    const key = `${lot}\u0000${wafer}`;
    let acc = this.wafers.get(key);
    if (acc) {
      this.wafers.delete(key); // re-insert: the Map's order is least recently used first
    } else {
      acc = new WaferAccumulator(lot, wafer, this.params.length);
    }
    this.wafers.set(key, acc);
    this.current = acc;
    this.currentLot = lot;
    this.currentWafer = wafer;
    return acc;
  }

  private evictIfNeeded(): void {
    while (this.held > this.maxHeld && this.wafers.size > 1) {
      const [key, acc] = this.wafers.entries().next().value as [string, WaferAccumulator];
      if (acc === this.current) break;
      this.wafers.delete(key);
      this.held -= acc.dies * (acc.columns.length + 3);
      acc.ensureColumns(this.params.length);
      this.evicted.push(acc.toFrame(this.params));
    }
  }

  /** Wafers handed out early to bound memory; the caller stores them now. */
  takeEvicted(): WaferFrame[] {
    const out = this.evicted;
    this.evicted = [];
    return out;
  }

  /** Reads the key fields (lot, wafer, x, y, site) shared by both layouts; undefined when rejected. */
  private keyOf(line: number, fields: string[]): { acc: WaferAccumulator; x: number; y: number; site: number } | undefined {
    if (fields.length < this.width) {
      this.reject(line, 'field count', `has ${fields.length} fields, the header has ${this.plan.columns.length}`);
      return undefined;
    }
    const lot = this.col.lot >= 0 ? fields[this.col.lot].trim() : this.defaultLot;
    const wafer = fields[this.col.wafer].trim();
    if (lot === '') { this.reject(line, 'empty lot or wafer', 'lot is empty'); return undefined; }
    if (wafer === '') { this.reject(line, 'empty lot or wafer', 'wafer is empty'); return undefined; }
    const x = parseInteger(fields[this.col.x]);
    const y = parseInteger(fields[this.col.y]);
    if (x === undefined || y === undefined) {
      this.reject(line, 'die coordinates', `die coordinates "${fields[this.col.x].trim()}", "${fields[this.col.y].trim()}" are not whole numbers`);
      return undefined;
    }
    const g = this.grid;
    if (x < g.xMin || x > g.xMax || y < g.yMin || y > g.yMax) {
      this.reject(line, 'outside the grid', `die (${x}, ${y}) is outside the grid x ${g.xMin}..${g.xMax}, y ${g.yMin}..${g.yMax}`);
      return undefined;
    }
    let site = -1;
    if (this.col.site >= 0) {
      const text = fields[this.col.site];
      // "Head/Site" style values such as "1/3" keep the site part.
      const slash = text.lastIndexOf('/');
      const s = parseInteger(slash >= 0 ? text.slice(slash + 1) : text);
      if (s === undefined || s < 0) { this.reject(line, 'probe site', `probe site "${text.trim()}" is not a whole number`); return undefined; }
      site = s;
    }
    return { acc: this.waferFor(lot, wafer), x, y, site };
  }

  private checkValue(line: number, label: string, text: string, v: number | undefined, current: boolean): boolean {
    if (v === undefined) { this.reject(line, 'not a number', `${label} "${text.trim()}" is not a number`); return false; }
    if (v === Infinity || v === -Infinity) { this.reject(line, 'not finite', `${label} "${text.trim()}" is not a finite value`); return false; }
    if (v === 0 && current) { this.reject(line, 'zero current', `${label} is exactly 0 A, which no leakage measurement reads (an open contact?)`); return false; }
    return true;
  }

  /** Counts a row that cannot be read at all (for example cut off inside a quoted field). */
  rejectUnreadable(line: number, reason: string): void {
    this.report.rowsRead++;
    this.reject(line, 'unreadable', reason);
  }

  add(line: number, fields: string[]): void {
    this.report.rowsRead++;
    if (this.plan.layout === 'long') { this.addLong(line, fields); return; }
    const measurements = this.measurements;
    const values = this.scratch;
    // Values first: a rejected row must not create its wafer.
    if (fields.length >= this.width) {
      for (let m = 0; m < measurements.length; m++) {
        const column = measurements[m];
        const text = fields[column.index];
        const v = parseValue(text);
        if (v === undefined || v === Infinity || v === -Infinity || (v === 0 && this.isCurrent[m])) {
          this.checkValue(line, column.header, text, v, this.isCurrent[m]);
          return;
        }
        values[m] = v * column.scale!;
      }
    }
    const key = this.keyOf(line, fields);
    if (!key) return;
    const { acc, x, y, site } = key;
    let row = acc.find(x, y);
    if (row >= 0) {
      acc.site.data[row] = site;
      this.report.duplicatesReplaced++;
    } else {
      row = acc.addDie(x, y, site);
      this.held += measurements.length + 3;
    }
    for (let m = 0; m < values.length; m++) acc.columns[m].data[row] = values[m];
    this.report.rowsStored++;
    if (this.held > this.maxHeld) this.evictIfNeeded();
  }

  private longParam(line: number, testText: string, unitText: string): LongParam | null | string {
    const cacheKey = `${testText}\u0000${unitText}`;
    const cached = this.longParams.get(cacheKey);
    if (cached !== undefined) return cached;
    const override = this.testOverrides.get(testText.toLowerCase());
    if (override && override.name.trim() === '') { this.longParams.set(cacheKey, null); return null; }
    const m = measurementOf(override?.name || testText, override?.unit || (unitText === '' ? undefined : unitText));
    if (m.error) return m.error;
    let column = this.params.findIndex((p) => p.name === m.name);
    if (column >= 0) {
      const earlier = [...this.longParams.values()].find((p) => p && p.column === column)!;
      if (earlier.info.unit !== m.unit) {
        return `mixed units: ${m.name} was given in ${earlier.unitText || 'no unit'} on line ${earlier.line}, here in ${unitText || 'no unit'}`;
      }
    } else {
      column = this.params.length;
      this.params.push({ name: m.name, unit: m.unit });
      this.isCurrent.push(m.unit === 'A');
    }
    const param: LongParam = { column, info: this.params[column], scale: m.scale, unitText, line };
    this.longParams.set(cacheKey, param);
    return param;
  }

  private addLong(line: number, fields: string[]): void {
    if (fields.length < this.width) { this.keyOf(line, fields); return; }
    const testText = fields[this.col.test].trim();
    if (testText === '') { this.reject(line, 'test name', 'the test name is empty'); return; }
    const unitText = this.col.unit >= 0 ? fields[this.col.unit].trim() : '';
    if (unitText !== '' && !parseUnit(unitText)) { this.reject(line, 'unit', `unit "${unitText}" is not one Offstate knows`); return; }
    const param = this.longParam(line, testText, unitText);
    if (param === null) { this.report.rowsLeftOut++; return; } // left out by the mapping
    if (typeof param === 'string') { this.reject(line, 'mixed units', param); return; }
    const text = fields[this.col.value];
    const v = parseValue(text);
    if (!this.checkValue(line, testText, text, v, param.info.unit === 'A')) return;
    const key = this.keyOf(line, fields);
    if (!key) return;
    const { acc, x, y, site } = key;
    if (acc.columns.length < this.params.length) {
      this.held += acc.dies * (this.params.length - acc.columns.length);
      acc.ensureColumns(this.params.length);
    }
    let row = acc.find(x, y);
    if (row < 0) {
      row = acc.addDie(x, y, site);
      this.held += acc.columns.length + 3;
    } else {
      acc.site.data[row] = site;
      if (!Number.isNaN(acc.columns[param.column].data[row])) this.report.duplicatesReplaced++;
    }
    acc.columns[param.column].data[row] = v! * param.scale;
    this.report.rowsStored++;
    if (this.held > this.maxHeld) this.evictIfNeeded();
  }

  /** Every wafer not yet handed out. */
  frames(): WaferFrame[] {
    const out = [...this.evicted, ...[...this.wafers.values()].map((acc) => { acc.ensureColumns(this.params.length); return acc.toFrame(this.params); })];
    this.evicted = [];
    this.wafers.clear();
    this.current = undefined;
    this.held = 0;
    return out;
  }
}
