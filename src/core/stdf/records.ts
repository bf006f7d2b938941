// STDF V4 record layouts used by Offstate, decoded from the field lists of the published
// specification (Standard Test Data Format Specification, Version 4, 1999). Fields the analysis
// never needs are read past, not kept. Optional trailing fields come back undefined.

import { FieldCursor } from './fields';

export const REC = {
  FAR: [0, 10], ATR: [0, 20], MIR: [1, 10], MRR: [1, 20], PCR: [1, 30], HBR: [1, 40], SBR: [1, 50],
  PMR: [1, 60], PGR: [1, 62], PLR: [1, 63], RDR: [1, 70], SDR: [1, 80], WIR: [2, 10], WRR: [2, 20],
  WCR: [2, 30], PIR: [5, 10], PRR: [5, 20], TSR: [10, 30], PTR: [15, 10], MPR: [15, 15], FTR: [15, 20],
  BPS: [20, 10], EPS: [20, 20], GDR: [50, 10], DTR: [50, 30],
} as const;

export const recKey = (typ: number, sub: number) => (typ << 8) | sub;

export interface Mir { lotId?: string; partType?: string; testTemp?: string; sublotId?: string; startT?: number }
export interface Sdr { head?: number; siteGroup?: number; sites: number[] }
export interface Wir { head?: number; waferId?: string }
export interface Wrr { head?: number; partCount?: number; retestCount?: number; goodCount?: number; waferId?: string }
export interface Wcr { waferSize?: number; dieHeight?: number; dieWidth?: number; units?: number; flat?: string; centerX?: number; centerY?: number; posX?: string; posY?: string }
export interface Pir { head: number; site: number }
export interface Prr { head: number; site: number; partFlag: number; numTests?: number; hardBin?: number; softBin?: number; x?: number; y?: number; partId?: string }
export interface Ptr {
  testNum: number; head: number; site: number; testFlag: number; parmFlag: number; result?: number;
  testText?: string; optFlag?: number; resScale?: number; loLimit?: number; hiLimit?: number; units?: string;
}
export interface Mpr {
  testNum: number; head: number; site: number; testFlag: number; parmFlag: number; results: number[];
  testText?: string; optFlag?: number; resScale?: number; units?: string;
}
export interface Tsr { head?: number; site?: number; testNum?: number; execCount?: number; failCount?: number; testName?: string }

export function decodeMir(c: FieldCursor): Mir {
  c.u4(); const startT = c.u4(); c.u1(); c.c1(); c.c1(); c.c1(); c.u2(); c.c1();
  const lotId = c.cn(); const partType = c.cn();
  c.cn(); c.cn(); c.cn(); c.cn(); // NODE_NAM, TSTR_TYP, JOB_NAM, JOB_REV
  const sublotId = c.cn();
  c.cn(); c.cn(); c.cn(); c.cn(); // OPER_NAM, EXEC_TYP, EXEC_VER, TEST_COD
  const testTemp = c.cn();
  return { lotId, partType, testTemp, sublotId, startT };
}

export function decodeSdr(c: FieldCursor): Sdr {
  const head = c.u1(); const siteGroup = c.u1(); const count = c.u1() ?? 0;
  return { head, siteGroup, sites: c.u1Array(count) };
}

export function decodeWir(c: FieldCursor): Wir {
  const head = c.u1(); c.u1(); c.u4();
  return { head, waferId: c.cn() };
}

export function decodeWrr(c: FieldCursor): Wrr {
  const head = c.u1(); c.u1(); c.u4();
  const partCount = c.u4(); const retestCount = c.u4(); c.u4(); const goodCount = c.u4(); c.u4();
  return { head, partCount, retestCount, goodCount, waferId: c.cn() };
}

export function decodeWcr(c: FieldCursor): Wcr {
  return {
    waferSize: c.r4(), dieHeight: c.r4(), dieWidth: c.r4(), units: c.u1(), flat: c.c1(),
    centerX: c.i2(), centerY: c.i2(), posX: c.c1(), posY: c.c1(),
  };
}

export function decodePir(c: FieldCursor): Pir {
  return { head: c.u1() ?? 1, site: c.u1() ?? 1 };
}

export function decodePrr(c: FieldCursor): Prr {
  const head = c.u1() ?? 1; const site = c.u1() ?? 1; const partFlag = c.u1() ?? 0;
  const numTests = c.u2(); const hardBin = c.u2(); const softBin = c.u2();
  const x = c.i2(); const y = c.i2(); c.u4();
  return { head, site, partFlag, numTests, hardBin, softBin, x, y, partId: c.cn() };
}

export function decodePtr(c: FieldCursor): Ptr {
  const testNum = c.u4() ?? 0; const head = c.u1() ?? 1; const site = c.u1() ?? 1;
  const testFlag = c.u1() ?? 0; const parmFlag = c.u1() ?? 0; const result = c.r4();
  const testText = c.cn(); c.cn(); // ALARM_ID
  const optFlag = c.u1(); const resScale = c.i1(); c.i1(); c.i1();
  const loLimit = c.r4(); const hiLimit = c.r4(); const units = c.cn();
  return { testNum, head, site, testFlag, parmFlag, result, testText, optFlag, resScale, loLimit, hiLimit, units };
}

export function decodeMpr(c: FieldCursor): Mpr {
  const testNum = c.u4() ?? 0; const head = c.u1() ?? 1; const site = c.u1() ?? 1;
  const testFlag = c.u1() ?? 0; const parmFlag = c.u1() ?? 0;
  const statCount = c.u2() ?? 0; const resultCount = c.u2() ?? 0;
  c.n1Array(statCount);
  const results = c.r4Array(resultCount);
  const testText = c.cn(); c.cn();
  const optFlag = c.u1(); const resScale = c.i1(); c.i1(); c.i1(); c.r4(); c.r4(); c.r4(); c.r4();
  c.u2Array(statCount); // RTN_INDX
  const units = c.cn();
  return { testNum, head, site, testFlag, parmFlag, results, testText, optFlag, resScale, units };
}

export function decodeTsr(c: FieldCursor): Tsr {
  const head = c.u1(); const site = c.u1(); c.c1();
  const testNum = c.u4(); const execCount = c.u4(); const failCount = c.u4(); c.u4();
  return { head, site, testNum, execCount, failCount, testName: c.cn() };
}
