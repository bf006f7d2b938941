// A small binary envelope for API results that carry typed arrays (wafer frames): JSON for the
// structure, the arrays' bytes appended after it, so a 70,000-die wafer is not sent as text.
// Layout: "OFS1" magic, u32 little-endian JSON byte length, JSON, zero padding to 8 bytes, data.

const MAGIC = [0x4f, 0x46, 0x53, 0x31]; // "OFS1"

type TypedArrayName = 'Float64Array' | 'Float32Array' | 'Int32Array' | 'Uint32Array' | 'Uint8Array' | 'Int16Array' | 'Uint16Array' | 'Int8Array';
const CONSTRUCTORS = {
  Float64Array, Float32Array, Int32Array, Uint32Array, Uint8Array, Int16Array, Uint16Array, Int8Array,
} as const;

interface ArrayRef { $typed: TypedArrayName; offset: number; length: number }

function isTypedArray(value: unknown): value is ArrayBufferView & { length: number; constructor: { name: string } } {
  return ArrayBuffer.isView(value) && !(value instanceof DataView);
}

/** Encodes plain data (objects, arrays, numbers incl. NaN/Infinity, strings, typed arrays). */
export function encodePayload(value: unknown): Uint8Array {
  const chunks: Uint8Array[] = [];
  let dataLength = 0;
  // JSON.stringify's replacer sees every value once, on the way out: no copy of the whole
  // structure is built first (a lot's analysis is tens of MB of JSON).
  const replace = (_key: string, v: unknown): unknown => {
    if (typeof v === 'number') return Number.isFinite(v) ? v : { $num: String(v) };
    if (isTypedArray(v)) {
      const name = v.constructor.name as TypedArrayName;
      if (!(name in CONSTRUCTORS)) throw new Error(`encodePayload cannot send a ${name}`);
      const bytes = new Uint8Array(v.buffer, v.byteOffset, v.byteLength);
      const pad = (8 - (dataLength % 8)) % 8;
      if (pad) { chunks.push(new Uint8Array(pad)); dataLength += pad; }
      const ref: ArrayRef = { $typed: name, offset: dataLength, length: v.length };
      chunks.push(bytes);
      dataLength += bytes.byteLength;
      return ref;
    }
    return v;
  };
  const json = new TextEncoder().encode(JSON.stringify(value, replace));
  const headerLength = 8 + json.byteLength;
  const dataStart = headerLength + ((8 - (headerLength % 8)) % 8);
  const out = new Uint8Array(dataStart + dataLength);
  out.set(MAGIC, 0);
  new DataView(out.buffer).setUint32(4, json.byteLength, true);
  out.set(json, 8);
  let at = dataStart;
  for (const chunk of chunks) { out.set(chunk, at); at += chunk.byteLength; }
  return out;
}

/** Decodes what encodePayload made. Typed arrays come back as copies aligned for their type. */
export function decodePayload<T = unknown>(bytes: Uint8Array): T {
  if (bytes.byteLength < 8 || MAGIC.some((b, i) => bytes[i] !== b)) {
    throw new Error('decodePayload: not an Offstate payload (bad magic)');
  }
  const jsonLength = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(4, true);
  if (8 + jsonLength > bytes.byteLength) throw new Error('decodePayload: payload is truncated');
  const headerLength = 8 + jsonLength;
  const dataStart = headerLength + ((8 - (headerLength % 8)) % 8);
  const text = new TextDecoder().decode(bytes.subarray(8, headerLength));
  const parsed = JSON.parse(text);
  // Nothing to revive (no array, no NaN or infinity): the parse is the result.
  if (!text.includes('"$typed"') && !text.includes('"$num"')) return parsed as T;
  const revive = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(revive);
    if (v !== null && typeof v === 'object') {
      const obj = v as Record<string, unknown>;
      if (typeof obj.$typed === 'string') {
        const ref = obj as unknown as ArrayRef;
        const Ctor = CONSTRUCTORS[ref.$typed];
        if (!Ctor) throw new Error(`decodePayload: unknown array type ${ref.$typed}`);
        const byteLength = ref.length * Ctor.BYTES_PER_ELEMENT;
        const start = dataStart + ref.offset;
        if (start + byteLength > bytes.byteLength) throw new Error('decodePayload: array runs past the end');
        const copy = new Uint8Array(byteLength);
        copy.set(bytes.subarray(start, start + byteLength));
        return new Ctor(copy.buffer);
      }
      if (typeof obj.$num === 'string' && Object.keys(obj).length === 1) return Number(obj.$num);
      const out: Record<string, unknown> = {};
      for (const [k, inner] of Object.entries(obj)) out[k] = revive(inner);
      return out;
    }
    return v;
  };
  return revive(parsed) as T;
}
