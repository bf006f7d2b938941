// Typed columns to and from SQLite blobs. Blobs come back as Buffers that may share a pool and
// sit at any alignment, so reading copies them into a fresh, aligned typed array; `shared` puts
// that copy in a SharedArrayBuffer, which helper threads then read without another copy.

export function blobOf(array: Float64Array | Int32Array): Buffer {
  return Buffer.from(array.buffer, array.byteOffset, array.byteLength);
}

function memory(bytes: number, shared: boolean): ArrayBuffer | SharedArrayBuffer {
  return shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes);
}

export function float64Of(blob: Buffer, shared = false): Float64Array {
  const copy = new Float64Array(memory(blob.byteLength, shared));
  new Uint8Array(copy.buffer).set(blob);
  return copy;
}

export function int32Of(blob: Buffer, shared = false): Int32Array {
  const copy = new Int32Array(memory(blob.byteLength, shared));
  new Uint8Array(copy.buffer).set(blob);
  return copy;
}
