// Reads STDF V4 data types from one record's bytes. A record may end before its last optional
// fields (the specification allows omitting trailing fields), so every read past the end
// returns undefined instead of failing.

export class FieldCursor {
  private pos = 0;
  constructor(private readonly view: DataView, private readonly little: boolean) {}

  get left(): number { return this.view.byteLength - this.pos; }

  u1(): number | undefined { if (this.left < 1) return undefined; return this.view.getUint8(this.pos++); }
  i1(): number | undefined { if (this.left < 1) return undefined; return this.view.getInt8(this.pos++); }
  u2(): number | undefined { if (this.left < 2) return this.skipAll(); const v = this.view.getUint16(this.pos, this.little); this.pos += 2; return v; }
  i2(): number | undefined { if (this.left < 2) return this.skipAll(); const v = this.view.getInt16(this.pos, this.little); this.pos += 2; return v; }
  u4(): number | undefined { if (this.left < 4) return this.skipAll(); const v = this.view.getUint32(this.pos, this.little); this.pos += 4; return v; }
  i4(): number | undefined { if (this.left < 4) return this.skipAll(); const v = this.view.getInt32(this.pos, this.little); this.pos += 4; return v; }
  r4(): number | undefined { if (this.left < 4) return this.skipAll(); const v = this.view.getFloat32(this.pos, this.little); this.pos += 4; return v; }
  r8(): number | undefined { if (this.left < 8) return this.skipAll(); const v = this.view.getFloat64(this.pos, this.little); this.pos += 8; return v; }
  /** C*1: one character. */
  c1(): string | undefined { const v = this.u1(); return v === undefined ? undefined : String.fromCharCode(v); }
  /** C*n: a length byte, then that many characters (read as Latin-1). */
  cn(): string | undefined {
    const n = this.u1();
    if (n === undefined) return undefined;
    const take = Math.min(n, this.left);
    let s = '';
    for (let i = 0; i < take; i++) s += String.fromCharCode(this.view.getUint8(this.pos + i));
    this.pos += take;
    return s;
  }
  /** B*n: a length byte, then that many bytes. */
  bn(): Uint8Array | undefined {
    const n = this.u1();
    if (n === undefined) return undefined;
    const take = Math.min(n, this.left);
    const out = new Uint8Array(this.view.buffer, this.view.byteOffset + this.pos, take).slice();
    this.pos += take;
    return out;
  }
  /** k x U1 / U2 / R4 arrays and j x N1 nibble arrays. */
  u1Array(k: number): number[] { const out: number[] = []; for (let i = 0; i < k; i++) { const v = this.u1(); if (v === undefined) break; out.push(v); } return out; }
  u2Array(k: number): number[] { const out: number[] = []; for (let i = 0; i < k; i++) { const v = this.u2(); if (v === undefined) break; out.push(v); } return out; }
  r4Array(k: number): number[] { const out: number[] = []; for (let i = 0; i < k; i++) { const v = this.r4(); if (v === undefined) break; out.push(v); } return out; }
  n1Array(j: number): number[] {
    const out: number[] = [];
    for (let i = 0; i < j; i += 2) {
      const b = this.u1();
      if (b === undefined) break;
      out.push(b & 0x0f);
      if (i + 1 < j) out.push(b >> 4);
    }
    return out;
  }

  private skipAll(): undefined { this.pos = this.view.byteLength; return undefined; }
}
