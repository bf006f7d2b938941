// Reusable scratch arrays for the analysis of one lot: a wafer's per-site split, NNR grids and
// residuals are needed only while one parameter of one wafer is worked on, so the same memory
// serves every wafer instead of being allocated (and collected) 25 times per parameter.
// A key must not be reused while an earlier view under that key is still being read.

export class Buffers {
  private readonly f64s = new Map<string, Float64Array>();
  private readonly u32s = new Map<string, Uint32Array>();
  private readonly u8s = new Map<string, Uint8Array>();
  private readonly f32s = new Map<string, Float32Array>();

  f64(key: string, n: number): Float64Array {
    let b = this.f64s.get(key);
    if (!b || b.length < n) { b = new Float64Array(n); this.f64s.set(key, b); }
    return b.subarray(0, n);
  }

  u32(key: string, n: number): Uint32Array {
    let b = this.u32s.get(key);
    if (!b || b.length < n) { b = new Uint32Array(n); this.u32s.set(key, b); }
    return b.subarray(0, n);
  }

  f32(key: string, n: number): Float32Array {
    let b = this.f32s.get(key);
    if (!b || b.length < n) { b = new Float32Array(n); this.f32s.set(key, b); }
    return b.subarray(0, n);
  }

  u8(key: string, n: number): Uint8Array {
    let b = this.u8s.get(key);
    if (!b || b.length < n) { b = new Uint8Array(n); this.u8s.set(key, b); }
    return b.subarray(0, n);
  }
}
