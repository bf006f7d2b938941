// Turns decoded STDF V4 records into wafer frames: PIR opens a part for a head and site, PTR and
// MPR results of that head and site belong to it, PRR closes it as one die (site, bins, X/Y).
// WIR/WRR bound a wafer (WRR's WAFER_ID supersedes WIR's). Rules applied:
// - A test's first PTR carries its defaults (TEST_TXT, UNITS, RES_SCAL, limits); later PTRs of the
//   same test number that omit them inherit them.
// - A result is usable only if TEST_FLG bits 0-5 and PARM_FLG bits 0-2 are 0; others are left
//   out (the die's value stays missing) and counted.
// - Values are stored in base units: RESULT is already in UNITS (for "A" no scaling); RES_SCAL only
//   tells how to display, so it is never applied.
// - A die at an X/Y already seen on the wafer supersedes the earlier one (PART_FLG bit 1 marks a
//   retest; an unmarked repeat is treated the same way and counted apart).

import type { ParamInfo, WaferFrame } from '../frame';
import { measurementOf } from '../import/headers';
import type { TestOverride } from '../import/mapping';
import { WaferAccumulator } from '../import/waferAccumulator';
import { parseUnit } from '../params';
import { FieldCursor } from './fields';
import { geometryOfWcr, type WaferGeometry } from './geometry';
import { decodeMir, decodeMpr, decodePir, decodePrr, decodePtr, decodeSdr, decodeTsr, decodeWcr, decodeWir, decodeWrr, type Mir } from './records';
import { StdfError, type RawRecord } from './reader';

export interface StdfWafer {
  frame: WaferFrame;
  hardBin: Int32Array;
  softBin: Int32Array;
}

export interface StdfReport {
  records: number;
  /** PRR records read. */
  parts: number;
  /** Dies stored (after retests). */
  diesStored: number;
  /** Dies superseded by a later PRR at the same X/Y flagged as a retest (PART_FLG bit 1). */
  retests: number;
  /** Dies superseded by a later PRR at the same X/Y without the retest flag. */
  repeatsReplaced: number;
  /** Parts rejected (no X/Y, no open PIR). */
  partsRejected: number;
  rejectedBy: Record<string, number>;
  /** Results left out because their flags say they are not usable, per reason. */
  unusableResults: number;
  unusableBy: Record<string, number>;
  /** Records of a type Offstate does not use, skipped. */
  skippedRecords: number;
  warnings: string[];
}

interface TestInfo { param: number; text: string; units: string; scale: number; name: string; unit: string; leftOut: boolean }
interface OpenPart { values: Map<number, number>; offset: number }

const TEST_FLAG_REASONS = ['alarm', 'result not valid', 'result unreliable', 'timeout', 'test not executed', 'test aborted'];
const PARM_FLAG_REASONS = ['scale error', 'drift error', 'oscillation'];
const KNOWN_TYPES = new Set([0, 1, 2, 5, 10, 15, 20, 50, 180, 181]);

export class StdfFrameBuilder {
  private little = true;
  lot: string;
  mir: Mir | undefined;
  geometry: WaferGeometry | undefined;
  private readonly params: ParamInfo[] = [];
  private readonly paramByName = new Map<string, number>();
  private readonly tests = new Map<number, TestInfo>();
  private readonly overrides: Map<string, TestOverride>;
  private readonly open = new Map<number, OpenPart>();
  private wafer: WaferAccumulator | undefined;
  private waferIdFromWir = '';
  private done: StdfWafer[] = [];
  private waferCount = 0;
  /** Site numbers the SDR records list. */
  readonly sites: number[] = [];
  /** Test names from TSR summaries (they come at the end, after the results). */
  readonly tsrNames = new Map<number, string>();
  sawMrr = false;
  readonly report: StdfReport = {
    records: 0, parts: 0, diesStored: 0, retests: 0, repeatsReplaced: 0, partsRejected: 0, rejectedBy: {},
    unusableResults: 0, unusableBy: {}, skippedRecords: 0, warnings: [],
  };

  constructor(defaultLot: string, tests: TestOverride[] = [], private readonly lotOverride?: string) {
    this.lot = lotOverride ?? defaultLot;
    this.overrides = new Map(tests.map((t) => [t.test.trim().toLowerCase(), t]));
  }

  setByteOrder(little: boolean): void { this.little = little; }

  get parameters(): ParamInfo[] { return this.params.map((p) => ({ ...p })); }

  /** Test numbers and names seen so far, for the mapping preview. */
  testList(): { number: number; text: string; name: string; unit: string; scale: number }[] {
    return [...this.tests.entries()].map(([number, t]) => ({ number, text: t.text, name: t.leftOut ? '' : t.param >= 0 ? this.params[t.param].name : t.name, unit: t.unit, scale: t.scale }));
  }

  private count(map: Record<string, number>, key: string): void { map[key] = (map[key] ?? 0) + 1; }

  add(record: RawRecord): void {
    this.report.records++;
    const c = new FieldCursor(record.body, this.little);
    const k = (record.typ << 8) | record.sub;
    switch (k) {
      case 0x000a: return; // FAR, read by the splitter
      case 0x010a: this.mir = decodeMir(c); if (!this.lotOverride && this.mir.lotId?.trim()) this.lot = this.mir.lotId.trim(); return;
      case 0x021e: this.geometry = geometryOfWcr(decodeWcr(c)); return;
      case 0x0150: { const sdr = decodeSdr(c); for (const site of sdr.sites) if (!this.sites.includes(site)) this.sites.push(site); return; }
      case 0x0a1e: { const tsr = decodeTsr(c); if (tsr.testNum !== undefined && tsr.testName) this.tsrNames.set(tsr.testNum, tsr.testName); return; }
      case 0x0114: this.sawMrr = true; return;
      case 0x020a: this.startWafer(decodeWir(c).waferId ?? ''); return;
      case 0x0214: this.finishWafer(decodeWrr(c).waferId ?? ''); return;
      case 0x050a: { const p = decodePir(c); this.open.set((p.head << 8) | p.site, { values: new Map(), offset: record.offset }); return; }
      case 0x0514: this.closePart(decodePrr(c), record.offset); return;
      case 0x0f0a: {
        const r = decodePtr(c);
        const test = this.testOf(r.testNum, r.testText, r.units, true);
        this.result(r.head, r.site, test.param, r.testFlag, r.parmFlag, r.result, test.scale, record.offset);
        return;
      }
      case 0x0f0f: {
        const r = decodeMpr(c);
        const test = this.testOf(r.testNum, r.testText, r.units, r.results.length === 1);
        if (r.results.length === 1) this.result(r.head, r.site, this.singleParam(r.testNum, test), r.testFlag, r.parmFlag, r.results[0], test.scale, record.offset);
        else if (!test.leftOut) r.results.forEach((v, i) => {
          const param = this.paramFor(`${test.name}[${i}]`, test.unit, `#${r.testNum}[${i}]`);
          this.result(r.head, r.site, param, r.testFlag, r.parmFlag, v, test.scale, record.offset);
        });
        return;
      }
      default:
        if (!KNOWN_TYPES.has(record.typ)) throw new StdfError(`Record at byte offset ${record.offset} has type ${record.typ}, which STDF V4 does not define; the file is corrupt.`, record.offset);
        this.report.skippedRecords++;
    }
  }

  private paramFor(name: string, unit: string, key: string): number {
    const existing = this.paramByName.get(key);
    if (existing !== undefined) return existing;
    let stored = name;
    if ([...this.params].some((p) => p.name === stored)) stored = `${name} ${key}`;
    const index = this.params.length;
    this.params.push({ name: stored, unit });
    this.paramByName.set(key, index);
    return index;
  }

  /** The test's parameter, using the first PTR's defaults for fields a later PTR omits. */
  private testOf(num: number, text: string | undefined, units: string | undefined, single: boolean): TestInfo {
    let info = this.tests.get(num);
    if (!info) {
      const t = (text ?? '').trim();
      const u = (units ?? '').trim();
      const override = this.overrides.get(`#${num}`) ?? (t ? this.overrides.get(t.toLowerCase()) : undefined);
      if (override && override.name.trim() === '') {
        info = { param: -1, text: t, units: u, scale: 1, name: '', unit: '', leftOut: true };
      } else {
        const unitText = override?.unit?.trim() || u;
        const m = measurementOf(override?.name?.trim() || t || `T${num}`, unitText === '' ? undefined : unitText);
        if (m.error) this.report.warnings.push(`Test ${num} "${t}": ${m.error} Its values are kept as written.`);
        if (unitText !== '' && !parseUnit(unitText)) this.report.warnings.push(`Test ${num} "${t}": unit "${unitText}" is not one Offstate knows; values are kept as written.`);
        info = { param: -1, text: t, units: u, scale: m.scale, name: m.name, unit: m.unit, leftOut: false };
      }
      this.tests.set(num, info);
    }
    if (single) this.singleParam(num, info);
    return info;
  }

  private singleParam(num: number, info: TestInfo): number {
    if (info.leftOut) return -1;
    if (info.param < 0) info.param = this.paramFor(info.name, info.unit, `#${num}`);
    return info.param;
  }

  private result(head: number, site: number, param: number, testFlag: number, parmFlag: number, value: number | undefined, scale: number, offset: number): void {
    if (param < 0) return;
    const part = this.open.get((head << 8) | site);
    if (!part) {
      this.count(this.report.rejectedBy, 'result outside a part');
      if (this.report.warnings.length < 20) this.report.warnings.push(`A result at byte offset ${offset} has no open PIR for head ${head}, site ${site}; it was left out.`);
      return;
    }
    const tf = testFlag & 0x3f;
    const pf = parmFlag & 0x07;
    if (tf !== 0 || pf !== 0 || value === undefined || !Number.isFinite(value)) {
      this.report.unusableResults++;
      let reason = value === undefined ? 'no result' : !Number.isFinite(value) ? 'not a finite number' : '';
      for (let b = 0; b < 6 && !reason; b++) if (tf & (1 << b)) reason = TEST_FLAG_REASONS[b];
      for (let b = 0; b < 3 && !reason; b++) if (pf & (1 << b)) reason = PARM_FLAG_REASONS[b];
      this.count(this.report.unusableBy, reason);
      return;
    }
    part.values.set(param, value * scale);
  }

  private startWafer(waferId: string): void {
    if (this.wafer) this.finishWafer('');
    this.waferIdFromWir = waferId.trim();
    this.wafer = new WaferAccumulator(this.lot, this.waferIdFromWir || String(this.waferCount + 1), this.params.length);
  }

  private finishWafer(waferId: string): void {
    const acc = this.wafer;
    if (!acc) return;
    this.wafer = undefined;
    const id = waferId.trim() || this.waferIdFromWir || String(this.waferCount + 1);
    this.waferCount++;
    this.emit(acc, id);
  }

  private emit(acc: WaferAccumulator, waferId: string): void {
    if (acc.dies === 0) return;
    acc.ensureColumns(this.params.length);
    const frame = acc.toFrame(this.params);
    frame.lot = this.lot;
    frame.wafer = waferId;
    this.done.push({ frame, hardBin: acc.extra('hardBin').take(), softBin: acc.extra('softBin').take() });
  }

  private closePart(prr: ReturnType<typeof decodePrr>, offset: number): void {
    this.report.parts++;
    const key = (prr.head << 8) | prr.site;
    const part = this.open.get(key);
    this.open.delete(key);
    if (!part) { this.reject('part without PIR', `PRR at byte offset ${offset} closes head ${prr.head}, site ${prr.site}, which has no open PIR`); return; }
    if (prr.x === undefined || prr.y === undefined || prr.x === -32768 || prr.y === -32768) {
      this.reject('no die coordinates', `PRR at byte offset ${offset} has no X/Y die coordinates`);
      return;
    }
    if (!this.wafer) this.wafer = new WaferAccumulator(this.lot, '1', this.params.length);
    const acc = this.wafer;
    acc.ensureColumns(this.params.length);
    let row = acc.find(prr.x, prr.y);
    if (row >= 0) {
      if (prr.partFlag & 0x02) this.report.retests++; else this.report.repeatsReplaced++;
      acc.site.data[row] = prr.site;
      for (const column of acc.columns) column.data[row] = NaN;
    } else {
      row = acc.addDie(prr.x, prr.y, prr.site);
      this.report.diesStored++;
    }
    for (const [param, v] of part.values) acc.columns[param].data[row] = v;
    acc.extra('hardBin').data[row] = prr.hardBin ?? -1;
    acc.extra('softBin').data[row] = prr.softBin === undefined || prr.softBin === 65535 ? -1 : prr.softBin;
  }

  private reject(kind: string, message: string): void {
    this.report.partsRejected++;
    this.count(this.report.rejectedBy, kind);
    if (this.report.warnings.length < 20) this.report.warnings.push(`${message}; it was left out.`);
  }

  /** Wafers finished (WRR seen) since the last call. */
  takeFinished(): StdfWafer[] {
    const out = this.done;
    this.done = [];
    return out;
  }

  /** At the end of the file: the open wafer (no WRR) is finished too. */
  finish(): StdfWafer[] {
    if (this.wafer) this.finishWafer('');
    if (this.open.size > 0) this.report.warnings.push(`${this.open.size} part(s) were opened by a PIR and never closed by a PRR; their results were left out.`);
    if (!this.sawMrr) this.report.warnings.push('The file has no MRR (master results record): the tester may not have finished writing it.');
    return this.takeFinished();
  }
}
