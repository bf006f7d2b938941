// Streaming STDF V4 record splitter: push Uint8Array chunks in any sizes, get whole records out
// with their byte offsets. The byte order is fixed by the first record, FAR, whose CPU_TYPE says
// how the file's integers and floats are written (1 = big-endian, 2 = little-endian; 0, DEC VAX
// order, is refused). A truncated or corrupt file throws an StdfError naming the byte offset.

export class StdfError extends Error {
  override name = 'StdfError';
  constructor(message: string, readonly offset: number) { super(message); }
}

export interface RawRecord {
  /** Byte offset of the record header in the file. */
  offset: number;
  typ: number;
  sub: number;
  body: DataView;
}

/** True when bytes start like an STDF V4 file (a FAR in either byte order). */
export function looksLikeStdf(head: Uint8Array): boolean {
  if (head.length < 6 || head[2] !== 0 || head[3] !== 10) return false;
  const le = head[0] === 2 && head[1] === 0;
  const be = head[0] === 0 && head[1] === 2;
  return (le || be) && head[5] === 4;
}

export class StdfReader {
  private buffer: Uint8Array = new Uint8Array(0);
  private start = 0;
  private consumed = 0;
  /** True for little-endian files; known after the FAR. */
  little: boolean | undefined;
  cpuType: number | undefined;
  version: number | undefined;

  push(chunk: Uint8Array): RawRecord[] {
    if (this.start < this.buffer.length) {
      const rest = this.buffer.subarray(this.start);
      const joined = new Uint8Array(rest.length + chunk.length);
      joined.set(rest);
      joined.set(chunk, rest.length);
      this.buffer = joined;
    } else {
      this.buffer = chunk;
    }
    this.start = 0;
    return this.split();
  }

  /** Call after the last chunk: throws when a record was cut off. */
  end(): void {
    const left = this.buffer.length - this.start;
    if (left > 0) {
      const offset = this.consumed;
      throw new StdfError(`The file ends inside a record at byte offset ${offset} (${left} byte(s) of an incomplete record); the file is truncated.`, offset);
    }
    if (this.little === undefined) throw new StdfError('The file is empty: no FAR record at byte offset 0.', 0);
  }

  private split(): RawRecord[] {
    const out: RawRecord[] = [];
    const buf = this.buffer;
    while (buf.length - this.start >= 4) {
      const p = this.start;
      const offset = this.consumed;
      if (this.little === undefined) {
        if (buf[p + 2] !== 0 || buf[p + 3] !== 10) throw new StdfError('Not an STDF file: the first record at byte offset 0 is not a FAR (type 0, subtype 10).', 0);
        if (buf.length - p < 6) break;
        const cpu = buf[p + 4];
        if (cpu === 1) this.little = false;
        else if (cpu === 2) this.little = true;
        else throw new StdfError(`FAR CPU_TYPE ${cpu} at byte offset 4 is not supported (1 = big-endian and 2 = little-endian are).`, 4);
        this.cpuType = cpu;
        this.version = buf[p + 5];
        if (this.version !== 4) throw new StdfError(`FAR STDF_VER is ${this.version} at byte offset 5; Offstate reads STDF version 4.`, 5);
        const len = this.little ? buf[p] | (buf[p + 1] << 8) : (buf[p] << 8) | buf[p + 1];
        if (len !== 2) throw new StdfError(`FAR REC_LEN is ${len} at byte offset 0, but CPU_TYPE ${cpu} says the file is ${this.little ? 'little' : 'big'}-endian; the header is corrupt.`, 0);
      }
      const len = this.little ? buf[p] | (buf[p + 1] << 8) : (buf[p] << 8) | buf[p + 1];
      if (buf.length - p - 4 < len) break;
      const typ = buf[p + 2];
      const sub = buf[p + 3];
      if (typ === 0 && sub === 10 && offset !== 0) throw new StdfError(`A second FAR record at byte offset ${offset}: two files were joined, or the data is corrupt.`, offset);
      out.push({ offset, typ, sub, body: new DataView(buf.buffer, buf.byteOffset + p + 4, len) });
      this.start = p + 4 + len;
      this.consumed += 4 + len;
    }
    return out;
  }
}
