import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { mannWhitney, normalCdf } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/** Oracle: Mann & Whitney's definition of U by counting pairs, ties counting one half. O(n1·n2). */
function bruteForceU(a: number[], b: number[]): number {
  let u = 0;
  for (const x of a) for (const y of b) u += x > y ? 1 : x === y ? 0.5 : 0;
  return u;
}

/** Oracle: the normal approximation written out from its textbook formula, ties tallied by a Map. */
function textbookZ(a: number[], b: number[]): number {
  const n1 = a.length;
  const n2 = b.length;
  const n = n1 + n2;
  const tally = new Map<number, number>();
  for (const v of [...a, ...b]) tally.set(v, (tally.get(v) ?? 0) + 1);
  let ties = 0;
  for (const t of tally.values()) ties += t ** 3 - t;
  const sigma = Math.sqrt(((n1 * n2) / 12) * (n + 1 - ties / (n * (n - 1))));
  const d = bruteForceU(a, b) - (n1 * n2) / 2;
  return (Math.sign(d) * Math.max(Math.abs(d) - 0.5, 0)) / sigma;
}

describe('mannWhitney', () => {
  it('matches a hand-worked example with a tie', () => {
    const a = [1.1, 2.3, 3.0, 4.8];
    const b = [2.3, 5.1, 6.0, 6.2, 7.5];
    // By hand: pooled ranks 1.1→1, 2.3→2.5 (twice), 3.0→4, 4.8→5, 5.1→6, 6.0→7, 6.2→8, 7.5→9.
    // R_a = 1 + 2.5 + 4 + 5 = 12.5, U_a = 12.5 - 4·5/2 = 2.5. n1·n2 = 20, E[U] = 10.
    // One tie group of 2: Σ(t³ - t) = 6, N = 9: σ² = (20/12)(10 - 6/72).
    // Continuity-corrected z = -(10 - 2.5 - 0.5)/σ; two-sided p = 2Φ(z).
    const r = mannWhitney(a, b)!;
    const sigma = Math.sqrt((20 / 12) * (10 - 6 / 72));
    expect(r.u).toBe(2.5);
    expect(r.n1).toBe(4);
    expect(r.n2).toBe(5);
    expect(r.z).toBeCloseTo(-7 / sigma, 14);
    expect(r.p).toBeCloseTo(2 * normalCdf(-7 / sigma), 14);
    expect(r.rankBiserial).toBeCloseTo((2 * 2.5) / 20 - 1, 15);
  });

  it('agrees with pair counting, with simple-statistics rank sums and with the textbook z on random data', () => {
    const random = seeded(16);
    for (let trial = 0; trial < 25; trial++) {
      const n1 = 2 + Math.floor(random() * 60);
      const n2 = 2 + Math.floor(random() * 60);
      const shift = random() * 3;
      const a = Array.from({ length: n1 }, () => Math.round(random() * 10 + shift));
      const b = Array.from({ length: n2 }, () => Math.round(random() * 10));
      const r = mannWhitney(a, b)!;
      expect(r.u).toBe(bruteForceU(a, b));
      // Reference: simple-statistics wilcoxonRankSum (npm), the rank sum of the first sample.
      expect(r.u).toBe(ss.wilcoxonRankSum(a, b) - (n1 * (n1 + 1)) / 2);
      expect(r.z).toBeCloseTo(textbookZ(a, b), 12);
      expect(r.p).toBeCloseTo(Math.min(1, 2 * normalCdf(-Math.abs(textbookZ(a, b)))), 12);
    }
  });

  it('agrees with simple-statistics rank sums for samples large enough for the radix ordering', () => {
    const random = seeded(23);
    const a = Array.from({ length: 3000 }, () => Math.round(random() * 500) / 4);
    const b = Array.from({ length: 2500 }, () => Math.round(random() * 520) / 4);
    // Reference: simple-statistics wilcoxonRankSum (npm).
    expect(mannWhitney(a, b)!.u).toBe(ss.wilcoxonRankSum(a, b) - (3000 * 3001) / 2);
  });

  it('is antisymmetric in its two samples', () => {
    const a = [3.1, 4.2, 5.5, 5.5, 9];
    const b = [1, 2.2, 3.1, 4, 4.1, 7];
    const ab = mannWhitney(a, b)!;
    const ba = mannWhitney(b, a)!;
    expect(ba.u).toBe(ab.n1 * ab.n2 - ab.u);
    expect(ba.z).toBeCloseTo(-ab.z, 15);
    expect(ba.p).toBeCloseTo(ab.p, 15);
    expect(ba.rankBiserial).toBeCloseTo(-ab.rankBiserial, 15);
  });

  it('gives rank-biserial ±1 for completely separated samples', () => {
    expect(mannWhitney([10, 11, 12], [1, 2, 3, 4])!.rankBiserial).toBe(1);
    expect(mannWhitney([1, 2, 3, 4], [10, 11, 12])!.rankBiserial).toBe(-1);
  });

  it('reports z = 0 and p = 1 when every value is tied', () => {
    const r = mannWhitney([5, 5, 5], [5, 5])!;
    expect(r.z).toBe(0);
    expect(r.p).toBe(1);
    expect(r.rankBiserial).toBe(0);
  });

  it('ignores non-finite values and returns undefined when a sample has fewer than 2 of them', () => {
    expect(mannWhitney([1, NaN, 3], [2, Infinity, 4])!.n1).toBe(2);
    expect(mannWhitney([1, NaN], [2, 3, 4])).toBeUndefined();
    expect(mannWhitney([1, 2], [])).toBeUndefined();
  });

  it('finds a clear shift between two large samples and none between identical distributions', () => {
    const random = seeded(17);
    const a = Array.from({ length: 400 }, () => random() + 0.2);
    const b = Array.from({ length: 400 }, () => random());
    expect(mannWhitney(a, b)!.p).toBeLessThan(1e-10);
    const c = Array.from({ length: 400 }, () => random());
    expect(mannWhitney(b, c)!.p).toBeGreaterThan(0.001);
  });

  it('handles 200,000 values per group quickly (O(N log N), not pair counting)', () => {
    const random = seeded(18);
    const a = Float64Array.from({ length: 200000 }, () => random());
    const b = Float64Array.from({ length: 200000 }, () => random());
    const start = performance.now();
    const r = mannWhitney(a, b)!;
    // Pair counting would need 4e10 comparisons (minutes); the sort-based method takes well under a second.
    expect(performance.now() - start).toBeLessThan(3000);
    expect(r.n1 + r.n2).toBe(400000);
  });
});
