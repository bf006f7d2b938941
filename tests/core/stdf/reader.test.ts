import { describe, expect, it } from 'vitest';
import { FieldCursor, StdfError, StdfFrameBuilder, StdfReader, decodePtr, looksLikeStdf } from '../../../src/core/stdf';
import { StdfWriter } from '../../support/stdfWriter';
import { inventedWafer, writeStdfLot } from '../../support/stdfLot';

function readAll(bytes: Uint8Array, chunk = bytes.length, lot = 'FILE') {
  const reader = new StdfReader();
  const builder = new StdfFrameBuilder(lot);
  const wafers = [];
  for (let i = 0; i < bytes.length; i += chunk) {
    const records = reader.push(bytes.slice(i, i + chunk));
    if (reader.little !== undefined) builder.setByteOrder(reader.little);
    for (const r of records) builder.add(r);
    wafers.push(...builder.takeFinished());
  }
  reader.end();
  wafers.push(...builder.finish());
  return { reader, builder, wafers };
}

describe('STDF V4 record layout', () => {
  // STDF V4 specification, FAR: REC_LEN = 2, REC_TYP = 0, REC_SUB = 10, CPU_TYPE, STDF_VER = 4;
  // CPU_TYPE 1 = Sun (big-endian), 2 = PC (little-endian) [from memory].
  it('writes and recognises the FAR in both byte orders byte for byte', () => {
    expect(Array.from(new StdfWriter(true).far().bytes())).toEqual([0x02, 0x00, 0x00, 0x0a, 0x02, 0x04]);
    expect(Array.from(new StdfWriter(false).far().bytes())).toEqual([0x00, 0x02, 0x00, 0x0a, 0x01, 0x04]);
    expect(looksLikeStdf(Uint8Array.of(0x00, 0x02, 0x00, 0x0a, 0x01, 0x04))).toBe(true);
    expect(looksLikeStdf(new TextEncoder().encode('Lot,Wafer'))).toBe(false);
  });

  // The specification's worked scaling example: 123.45 uA is stored as RESULT = 123.4517e-6 (A)
  // with RES_SCAL = 6; RES_SCAL only says to show it in micro-units. The PTR below is assembled by
  // hand, big-endian, field by field from the PTR table, and ends after UNITS (trailing fields omitted).
  it('decodes a hand-assembled PTR and keeps RESULT in base units whatever RES_SCAL says', () => {
    const r4 = new DataView(new ArrayBuffer(4));
    r4.setFloat32(0, 123.4517e-6, false);
    const f32 = [0, 1, 2, 3].map((i) => r4.getUint8(i));
    const body = [
      0x00, 0x00, 0x03, 0xe8, // TEST_NUM U*4 = 1000
      0x01, 0x02, // HEAD_NUM 1, SITE_NUM 2
      0x00, 0x00, // TEST_FLG, PARM_FLG
      ...f32, // RESULT R*4
      0x05, ...'Ion_n'.split('').map((c) => c.charCodeAt(0)), // TEST_TXT C*n
      0x00, // ALARM_ID C*n, empty
      0x0e, // OPT_FLAG
      0x06, 0x06, 0x06, // RES_SCAL, LLM_SCAL, HLM_SCAL I*1 = 6
      0, 0, 0, 0, 0x3f, 0x80, 0, 0, // LO_LIMIT 0, HI_LIMIT 1.0 (R*4 big-endian)
      0x01, 0x41, // UNITS "A"
    ];
    const ptr = decodePtr(new FieldCursor(new DataView(Uint8Array.from(body).buffer), false));
    expect(ptr).toMatchObject({ testNum: 1000, head: 1, site: 2, testText: 'Ion_n', resScale: 6, hiLimit: 1, units: 'A' });
    expect(ptr.result).toBe(Math.fround(123.4517e-6));
    expect((ptr.result! * 10 ** ptr.resScale!).toFixed(2)).toBe('123.45');

    const file = new StdfWriter(false).far().wir('1').pir(2).raw(Uint8Array.of(0, body.length, 15, 10, ...body)).prr({ site: 2, x: 0, y: 0, hard: 1, soft: 1 }).wrr('1', 1).bytes();
    const [w] = readAll(file).wafers;
    expect(w.frame.params).toEqual([{ name: 'Ion_n', unit: 'A' }]);
    expect(w.frame.values.Ion_n[0]).toBe(Math.fround(123.4517e-6));
  });
});

describe('StdfReader and StdfFrameBuilder', () => {
  const wafers = [{ id: 'W01', dies: inventedWafer(1) }, { id: 'W02', dies: inventedWafer(2) }];
  it('gives the same wafers from little- and big-endian files and from any chunk size', () => {
    const le = readAll(writeStdfLot('LOTA', wafers, true));
    const be = readAll(writeStdfLot('LOTA', wafers, false), 7);
    expect(le.reader.little).toBe(true);
    expect(be.reader.little).toBe(false);
    expect(be.wafers).toEqual(le.wafers);
    expect(readAll(writeStdfLot('LOTA', wafers, true), 1).wafers).toEqual(le.wafers);
    const [w1] = le.wafers;
    expect(w1.frame.lot).toBe('LOTA');
    expect(w1.frame.wafer).toBe('W01');
    expect(w1.frame.params.map((p) => `${p.name} ${p.unit}`)).toEqual(['Ioff_n A', 'Ion_n A', 'Vtsat_n V']);
    expect(Array.from(w1.frame.values.Ioff_n)).toEqual(wafers[0].dies.map((d) => d.ioff));
    // Later PTRs carried only up to RESULT: name and units came from the test's first PTR.
    expect(Array.from(w1.frame.values.Vtsat_n)).toEqual(wafers[0].dies.map((d) => d.vt));
    expect(Array.from(w1.frame.site)).toEqual(wafers[0].dies.map((d) => d.site));
    expect(Array.from(w1.hardBin)).toEqual(wafers[0].dies.map((d) => d.hard));
    expect(Array.from(w1.softBin)).toEqual(wafers[0].dies.map((d) => d.hard * 10));
    expect(le.builder.geometry).toEqual({ waferSize: 300, dieHeight: 1, dieWidth: 1, units: 'mm', flat: 'D', centerX: 3, centerY: 3, posX: 'R', posY: 'D' });
    expect(le.builder.mir?.testTemp).toBe('25');
  });

  it('lets WRR WAFER_ID supersede the WIR one', () => {
    const bytes = new StdfWriter().far().wir('A').pir(1).ptr({ test: 1, site: 1, result: 1e-9, text: 'Isb', units: 'A' }).prr({ site: 1, x: 1, y: 1, hard: 1, soft: 1 }).wrr('A-final', 1).bytes();
    expect(readAll(bytes).wafers[0].frame.wafer).toBe('A-final');
  });

  // STDF V4 PTR: TEST_FLG bits 0-5 and PARM_FLG bits 0-2 must be 0 for RESULT to be usable.
  it('leaves out results whose flags say they are not usable, and counts them by reason', () => {
    const w = new StdfWriter().far().wir('1');
    w.pir(1).ptr({ test: 1, site: 1, result: 1e-9, text: 'Isb', units: 'A' }).prr({ site: 1, x: 0, y: 0, hard: 1, soft: 1 });
    w.pir(1).ptr({ test: 1, site: 1, result: 2e-9, testFlag: 0x02 }).prr({ site: 1, x: 1, y: 0, hard: 1, soft: 1 });
    w.pir(1).ptr({ test: 1, site: 1, result: 3e-9, parmFlag: 0x04 }).prr({ site: 1, x: 2, y: 0, hard: 1, soft: 1 });
    w.pir(1).ptr({ test: 1, site: 1, result: 4e-9, testFlag: 0x80 }).prr({ site: 1, x: 3, y: 0, hard: 1, soft: 1 }); // bit 7 = failed, still a valid reading
    const { builder, wafers } = readAll(w.wrr('1', 4).bytes());
    const v = Array.from(wafers[0].frame.values.Isb);
    expect(v.map((x) => Number.isNaN(x))).toEqual([false, true, true, false]);
    expect(v[3]).toBe(Math.fround(4e-9));
    expect(builder.report.unusableResults).toBe(2);
    expect(builder.report.unusableBy).toEqual({ 'result not valid': 1, oscillation: 1 });
  });

  // STDF V4 PRR: PART_FLG bit 1 = this part supersedes an earlier one with the same X/Y.
  it('lets a retested die supersede the earlier result at the same X/Y', () => {
    const w = new StdfWriter().far().wir('1');
    w.pir(1).ptr({ test: 1, site: 1, result: 1e-9, text: 'Isb', units: 'A' }).ptr({ test: 2, site: 1, result: 0.3, text: 'Vtsat_n', units: 'V' }).prr({ site: 1, x: 5, y: 5, hard: 5, soft: 5 });
    w.pir(2).ptr({ test: 1, site: 2, result: 2e-9 }).prr({ site: 2, x: 5, y: 5, hard: 1, soft: 1, flag: 0x02 });
    const { builder, wafers } = readAll(w.wrr('1', 2).bytes());
    const f = wafers[0].frame;
    expect(f.x.length).toBe(1);
    expect(f.values.Isb[0]).toBe(Math.fround(2e-9));
    expect(f.values.Vtsat_n[0]).toBeNaN(); // the earlier part's other results are superseded too
    expect(f.site[0]).toBe(2);
    expect(wafers[0].hardBin[0]).toBe(1);
    expect(builder.report.retests).toBe(1);
  });

  it('keeps results of interleaved sites apart by head and site', () => {
    const w = new StdfWriter().far().wir('1').pir(1).pir(2);
    w.ptr({ test: 1, site: 2, result: 2e-9, text: 'Isb', units: 'A' }).ptr({ test: 1, site: 1, result: 1e-9 });
    w.prr({ site: 1, x: 0, y: 0, hard: 1, soft: 1 }).prr({ site: 2, x: 1, y: 0, hard: 1, soft: 1 });
    const f = readAll(w.wrr('1', 2).bytes()).wafers[0].frame;
    expect(Array.from(f.values.Isb)).toEqual([Math.fround(1e-9), Math.fround(2e-9)]);
  });

  it('reads MPR results as one parameter per result', () => {
    const w = new StdfWriter().far().wir('1').pir(1).mpr({ test: 9, site: 1, results: [1e-9, 2e-9], text: 'Ig_n', units: 'A' }).prr({ site: 1, x: 0, y: 0, hard: 1, soft: 1 });
    const f = readAll(w.wrr('1', 1).bytes()).wafers[0].frame;
    expect(f.params.map((p) => p.name)).toEqual(['Ig_n[0]', 'Ig_n[1]']);
    expect(f.values['Ig_n[1]'][0]).toBe(Math.fround(2e-9));
  });

  it('maps tests to parameters by number or name with a mapping', () => {
    const w = new StdfWriter().far().wir('1').pir(1).ptr({ test: 7, site: 1, result: 5e-12, text: 'LEAK_N_VDD', units: 'A' }).ptr({ test: 8, site: 1, result: 1, text: 'CONT', units: '' }).prr({ site: 1, x: 0, y: 0, hard: 1, soft: 1 }).wrr('1', 1).bytes();
    const reader = new StdfReader();
    const builder = new StdfFrameBuilder('X', [{ test: '#7', name: 'Ioff_n' }, { test: 'cont', name: '' }]);
    const records = reader.push(w);
    builder.setByteOrder(true);
    for (const r of records) builder.add(r);
    const f = builder.finish()[0].frame;
    expect(f.params).toEqual([{ name: 'Ioff_n', unit: 'A' }]);
  });

  it('names the byte offset of a truncated record', () => {
    const bytes = writeStdfLot('LOTA', wafers, true);
    const cut = bytes.slice(0, bytes.length - 3);
    let error: unknown;
    try { readAll(cut); } catch (e) { error = e; }
    expect(error).toBeInstanceOf(StdfError);
    // The MRR is the last record: 4-byte header + FINISH_T(4) + DISP_COD(1) + two empty C*n = 11 bytes.
    expect((error as StdfError).offset).toBe(bytes.length - 11);
    expect((error as Error).message).toMatch(new RegExp(`byte offset ${bytes.length - 11}.*truncated`));
  });

  it('refuses a record type STDF V4 does not define, naming its offset', () => {
    const w = new StdfWriter().far().wir('1');
    const offset = w.bytes().length;
    w.record(77, 1, [['U1', 0]]);
    expect(() => readAll(w.bytes())).toThrow(new RegExp(`byte offset ${offset} has type 77`));
  });

  it('refuses a file that does not start with a FAR', () => {
    expect(() => readAll(new StdfWriter().wir('1').bytes())).toThrow(/not a FAR/);
  });
});
