// A tiny STDF V4 writer for tests: each record's fields are written in the order and types of the
// published specification's tables (Standard Test Data Format Specification V4, 1999), in either
// byte order. Fields after `stopAfter` are left off, as the specification allows for trailing
// optional fields.

type Field = ['U1' | 'U2' | 'U4' | 'I1' | 'I2' | 'I4' | 'R4' | 'R8' | 'C1' | 'Cn' | 'Bn' | 'U1[]' | 'U2[]' | 'R4[]' | 'N1[]', unknown];

export class StdfWriter {
  private parts: Uint8Array[] = [];
  constructor(readonly little = true) {}

  private encode(fields: Field[]): Uint8Array {
    const out: number[] = [];
    const view = new DataView(new ArrayBuffer(8));
    const put = (n: number) => { for (let i = 0; i < n; i++) out.push(view.getUint8(i)); };
    for (const [type, value] of fields) {
      const v = value as number;
      switch (type) {
        case 'U1': view.setUint8(0, v); put(1); break;
        case 'I1': view.setInt8(0, v); put(1); break;
        case 'U2': view.setUint16(0, v, this.little); put(2); break;
        case 'I2': view.setInt16(0, v, this.little); put(2); break;
        case 'U4': view.setUint32(0, v, this.little); put(4); break;
        case 'I4': view.setInt32(0, v, this.little); put(4); break;
        case 'R4': view.setFloat32(0, v, this.little); put(4); break;
        case 'R8': view.setFloat64(0, v, this.little); put(8); break;
        case 'C1': out.push((value as string).charCodeAt(0)); break;
        case 'Cn': { const s = value as string; out.push(s.length); for (const ch of s) out.push(ch.charCodeAt(0)); break; }
        case 'Bn': { const b = value as number[]; out.push(b.length); out.push(...b); break; }
        case 'U1[]': out.push(...(value as number[])); break;
        case 'U2[]': for (const x of value as number[]) { view.setUint16(0, x, this.little); put(2); } break;
        case 'R4[]': for (const x of value as number[]) { view.setFloat32(0, x, this.little); put(4); } break;
        case 'N1[]': { const a = value as number[]; for (let i = 0; i < a.length; i += 2) out.push((a[i] & 15) | ((a[i + 1] ?? 0) << 4)); break; }
      }
    }
    return Uint8Array.from(out);
  }

  record(typ: number, sub: number, fields: Field[], stopAfter = fields.length): this {
    const body = this.encode(fields.slice(0, stopAfter));
    const head = new DataView(new ArrayBuffer(4));
    head.setUint16(0, body.length, this.little);
    head.setUint8(2, typ);
    head.setUint8(3, sub);
    this.parts.push(new Uint8Array(head.buffer), body);
    return this;
  }

  raw(bytes: Uint8Array): this { this.parts.push(bytes); return this; }

  bytes(): Uint8Array {
    const n = this.parts.reduce((s, p) => s + p.length, 0);
    const out = new Uint8Array(n);
    let o = 0;
    for (const p of this.parts) { out.set(p, o); o += p.length; }
    return out;
  }

  // FAR: CPU_TYPE U1, STDF_VER U1.
  far(): this { return this.record(0, 10, [['U1', this.little ? 2 : 1], ['U1', 4]]); }
  // MIR: SETUP_T, START_T U4, STAT_NUM U1, MODE_COD, RTST_COD, PROT_COD C1, BURN_TIM U2, CMOD_COD C1,
  // LOT_ID, PART_TYP, NODE_NAM, TSTR_TYP, JOB_NAM, JOB_REV, SBLOT_ID, OPER_NAM, EXEC_TYP, EXEC_VER,
  // TEST_COD, TST_TEMP C*n (later fields omitted).
  mir(lotId: string, testTemp = '25'): this {
    return this.record(1, 10, [['U4', 0], ['U4', 0], ['U1', 1], ['C1', 'P'], ['C1', ' '], ['C1', ' '], ['U2', 65535], ['C1', ' '],
      ['Cn', lotId], ['Cn', 'TESTCHIP'], ['Cn', ''], ['Cn', ''], ['Cn', ''], ['Cn', ''], ['Cn', ''], ['Cn', ''], ['Cn', ''], ['Cn', ''], ['Cn', ''], ['Cn', testTemp]]);
  }
  // SDR: HEAD_NUM, SITE_GRP, SITE_CNT U1, SITE_NUM kxU1 (later fields omitted).
  sdr(sites: number[]): this { return this.record(1, 80, [['U1', 1], ['U1', 1], ['U1', sites.length], ['U1[]', sites]]); }
  // WCR: WAFR_SIZ, DIE_HT, DIE_WID R4, WF_UNITS U1, WF_FLAT C1, CENTER_X, CENTER_Y I2, POS_X, POS_Y C1.
  wcr(g: { size: number; height: number; width: number; units: number; flat: string; cx: number; cy: number; posX: string; posY: string }): this {
    return this.record(2, 30, [['R4', g.size], ['R4', g.height], ['R4', g.width], ['U1', g.units], ['C1', g.flat], ['I2', g.cx], ['I2', g.cy], ['C1', g.posX], ['C1', g.posY]]);
  }
  // WIR: HEAD_NUM, SITE_GRP U1, START_T U4, WAFER_ID C*n.
  wir(waferId: string): this { return this.record(2, 10, [['U1', 1], ['U1', 255], ['U4', 0], ['Cn', waferId]]); }
  // WRR: HEAD_NUM, SITE_GRP U1, FINISH_T, PART_CNT, RTST_CNT, ABRT_CNT, GOOD_CNT, FUNC_CNT U4, WAFER_ID C*n (later omitted).
  wrr(waferId: string, parts: number): this {
    return this.record(2, 20, [['U1', 1], ['U1', 255], ['U4', 0], ['U4', parts], ['U4', 0], ['U4', 0], ['U4', parts], ['U4', 4294967295], ['Cn', waferId]]);
  }
  // PIR: HEAD_NUM, SITE_NUM U1.
  pir(site: number, head = 1): this { return this.record(5, 10, [['U1', head], ['U1', site]]); }
  // PRR: HEAD_NUM, SITE_NUM, PART_FLG B1, NUM_TEST U2, HARD_BIN, SOFT_BIN U2, X_COORD, Y_COORD I2, TEST_T U4, PART_ID, PART_TXT C*n, PART_FIX B*n.
  prr(p: { site: number; x: number; y: number; hard: number; soft: number; flag?: number; tests?: number; head?: number }): this {
    return this.record(5, 20, [['U1', p.head ?? 1], ['U1', p.site], ['U1', p.flag ?? 0], ['U2', p.tests ?? 0], ['U2', p.hard], ['U2', p.soft],
      ['I2', p.x], ['I2', p.y], ['U4', 0], ['Cn', ''], ['Cn', ''], ['Bn', []]]);
  }
  // PTR: TEST_NUM U4, HEAD_NUM, SITE_NUM U1, TEST_FLG, PARM_FLG B1, RESULT R4, TEST_TXT, ALARM_ID C*n,
  // OPT_FLAG B1, RES_SCAL, LLM_SCAL, HLM_SCAL I1, LO_LIMIT, HI_LIMIT R4, UNITS, C_RESFMT, C_LLMFMT, C_HLMFMT C*n, LO_SPEC, HI_SPEC R4.
  ptr(p: { test: number; site: number; result: number; text?: string; units?: string; testFlag?: number; parmFlag?: number; scale?: number; head?: number; short?: boolean }): this {
    const fields: Field[] = [['U4', p.test], ['U1', p.head ?? 1], ['U1', p.site], ['U1', p.testFlag ?? 0], ['U1', p.parmFlag ?? 0], ['R4', p.result],
      ['Cn', p.text ?? ''], ['Cn', ''], ['U1', 0x0e], ['I1', p.scale ?? 0], ['I1', p.scale ?? 0], ['I1', p.scale ?? 0], ['R4', 0], ['R4', 1],
      ['Cn', p.units ?? ''], ['Cn', ''], ['Cn', ''], ['Cn', ''], ['R4', 0], ['R4', 0]];
    // Later PTRs of a test may stop after RESULT (the first one carries the defaults).
    return this.record(15, 10, fields, p.short ? 6 : fields.length);
  }
  // MPR: TEST_NUM U4, HEAD_NUM, SITE_NUM U1, TEST_FLG, PARM_FLG B1, RTN_ICNT, RSLT_CNT U2, RTN_STAT jxN1, RTN_RSLT kxR4,
  // TEST_TXT, ALARM_ID C*n, OPT_FLAG B1, RES_SCAL, LLM_SCAL, HLM_SCAL I1, LO_LIMIT, HI_LIMIT, START_IN, INCR_IN R4, RTN_INDX jxU2, UNITS C*n.
  mpr(p: { test: number; site: number; results: number[]; text: string; units: string }): this {
    return this.record(15, 15, [['U4', p.test], ['U1', 1], ['U1', p.site], ['U1', 0], ['U1', 0], ['U2', 0], ['U2', p.results.length], ['N1[]', []],
      ['R4[]', p.results], ['Cn', p.text], ['Cn', ''], ['U1', 0x0e], ['I1', 0], ['I1', 0], ['I1', 0], ['R4', 0], ['R4', 0], ['R4', 0], ['R4', 0], ['U2[]', []], ['Cn', p.units]]);
  }
  // TSR: HEAD_NUM, SITE_NUM U1, TEST_TYP C1, TEST_NUM, EXEC_CNT, FAIL_CNT, ALRM_CNT U4, TEST_NAM C*n (later omitted).
  tsr(test: number, name: string, count: number): this {
    return this.record(10, 30, [['U1', 255], ['U1', 255], ['C1', 'P'], ['U4', test], ['U4', count], ['U4', 0], ['U4', 0], ['Cn', name]]);
  }
  // MRR: FINISH_T U4, DISP_COD C1, USR_DESC, EXC_DESC C*n.
  mrr(): this { return this.record(1, 20, [['U4', 0], ['C1', ' '], ['Cn', ''], ['Cn', '']]); }
}
