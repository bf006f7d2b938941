// Typed columns to and from SQLite blobs. Blobs come back as Buffers that may share a pool and
// sit at any alignment, so reading copies them into a fresh, aligned typed array.

export function blobOf(array: Float64Array | Int32Array): Buffer {
  return Buffer.from(array.buffer, array.byteOffset, array.byteLength);
}

export function float64Of(blob: Buffer): Float64Array {
  const copy = new Float64Array(blob.byteLength / 8);
  new Uint8Array(copy.buffer).set(blob);
  return copy;
}

export function int32Of(blob: Buffer): Int32Array {
  const copy = new Int32Array(blob.byteLength / 4);
  new Uint8Array(copy.buffer).set(blob);
  return copy;
}
