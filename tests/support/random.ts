// A small deterministic generator for random checks, so every run draws the same numbers:
// mulberry32, a public-domain 32-bit generator (author Tommy Ettinger, from memory), uniform on
// [0, 1).
export function seeded(seed: number): () => number {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
