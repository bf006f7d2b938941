import { describe, expect, it } from 'vitest';
import { chiSquareSurvival, kruskalWallis, mannWhitney } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/**
 * Oracle: Kruskal & Wallis's textbook formula, H = [12/(N(N+1)) Σ R²ᵢ/nᵢ - 3(N+1)] / C with
 * C = 1 - Σ(t³ - t)/(N³ - N), ranks by counting (O(N²)), ties tallied by a Map.
 */
function textbookH(groups: number[][]): number {
  const pooled = groups.flat();
  const n = pooled.length;
  const rankOf = (v: number) => pooled.filter((w) => w < v).length + (pooled.filter((w) => w === v).length + 1) / 2;
  let sum = 0;
  for (const g of groups) {
    const r = g.reduce((acc, v) => acc + rankOf(v), 0);
    sum += (r * r) / g.length;
  }
  const tally = new Map<number, number>();
  for (const v of pooled) tally.set(v, (tally.get(v) ?? 0) + 1);
  let ties = 0;
  for (const t of tally.values()) ties += t ** 3 - t;
  return ((12 / (n * (n + 1))) * sum - 3 * (n + 1)) / (1 - ties / (n ** 3 - n));
}

describe('kruskalWallis', () => {
  it('matches a hand-worked example without ties', () => {
    const a = [2.9, 3.0, 2.5, 2.6, 3.2];
    const b = [3.8, 2.7, 4.0, 2.4];
    const c = [2.8, 3.4, 3.7, 2.2, 2.0];
    // By hand: pooled ranks 2.0→1, 2.2→2, 2.4→3, 2.5→4, 2.6→5, 2.7→6, 2.8→7, 2.9→8, 3.0→9, 3.2→10,
    // 3.4→11, 3.7→12, 3.8→13, 4.0→14. R_a = 36, R_b = 36, R_c = 33, N = 14.
    // H = 12/(14·15)·(36²/5 + 36²/4 + 33²/5) - 3·15 = (12/210)·801 - 45 = 27/35.
    const r = kruskalWallis([a, b, c])!;
    expect(r.h).toBeCloseTo(27 / 35, 14);
    expect(r.df).toBe(2);
    expect(r.n).toBe(14);
    // χ² with 2 degrees of freedom: P(χ² > h) = exp(-h/2).
    expect(r.p).toBeCloseTo(Math.exp(-27 / 70), 14);
  });

  it('matches a hand-worked example with ties', () => {
    // By hand: pooled [1, 2, 2, 2, 3, 3, 4, 5]; ranks 1→1, 2→3 (×3), 3→5.5 (×2), 4→7, 5→8.
    // Groups [1, 2, 2] R = 7; [2, 3, 3] R = 14; [4, 5] R = 15; N = 8.
    // Uncorrected H = 12/72·(49/3 + 196/3 + 225/2) - 27 = 8.9166…; ties (27 - 3) + (8 - 2) = 30,
    // C = 1 - 30/504, so H = (1/6·(245/3 + 112.5) - 27) / (474/504).
    const r = kruskalWallis([[1, 2, 2], [2, 3, 3], [4, 5]])!;
    expect(r.h).toBeCloseTo(((1 / 6) * (245 / 3 + 112.5) - 27) / (474 / 504), 13);
    expect(r.df).toBe(2);
  });

  it('agrees with the textbook formula on random grouped data with ties', () => {
    const random = seeded(19);
    for (let trial = 0; trial < 15; trial++) {
      const k = 2 + Math.floor(random() * 6);
      const groups = Array.from({ length: k }, (_, g) =>
        Array.from({ length: 1 + Math.floor(random() * 40) }, () => Math.round(random() * 20 + g * random() * 3)),
      );
      const r = kruskalWallis(groups)!;
      const expected = textbookH(groups);
      expect(r.h).toBeCloseTo(expected, 10);
      expect(r.df).toBe(k - 1);
      expect(r.p).toBe(chiSquareSurvival(r.h, r.df));
    }
  });

  it('agrees with the textbook formula when the pooled sample is large enough for the radix ordering', () => {
    const random = seeded(24);
    const groups = Array.from({ length: 6 }, (_, g) => Array.from({ length: 500 }, () => Math.round(random() * 300 + g * 5)));
    expect(kruskalWallis(groups)!.h).toBeCloseTo(textbookH(groups), 9);
  });

  it('equals the squared Mann–Whitney z without continuity correction for two groups', () => {
    // Identity: with k = 2, H = (U - n1n2/2)² / σ_U² (both tie-corrected).
    const a = [1.2, 3.4, 3.4, 5.0, 6.1, 7.7];
    const b = [0.5, 1.2, 2.0, 2.2, 3.4, 4.4, 4.9];
    const mw = mannWhitney(a, b)!;
    const n = a.length + b.length;
    const ties = (2 ** 3 - 2) + (3 ** 3 - 3);
    const varianceU = ((a.length * b.length) / 12) * (n + 1 - ties / (n * (n - 1)));
    const zPlain = (mw.u - (a.length * b.length) / 2) / Math.sqrt(varianceU);
    expect(kruskalWallis([a, b])!.h).toBeCloseTo(zPlain * zPlain, 13);
  });

  it('leaves out groups with no finite value and skips non-finite values', () => {
    const r = kruskalWallis([[1, 2, NaN], [], [NaN, null], [3, 4]])!;
    expect(r.df).toBe(1);
    expect(r.n).toBe(4);
    expect(r.h).toBeCloseTo(textbookH([[1, 2], [3, 4]]), 14);
  });

  it('returns undefined with fewer than two usable groups, and h = 0, p = 1 when all values tie', () => {
    expect(kruskalWallis([[1, 2, 3]])).toBeUndefined();
    expect(kruskalWallis([[1, 2], [NaN]])).toBeUndefined();
    expect(kruskalWallis([])).toBeUndefined();
    const tied = kruskalWallis([[2, 2], [2, 2, 2]])!;
    expect(tied.h).toBe(0);
    expect(tied.p).toBe(1);
  });
});
