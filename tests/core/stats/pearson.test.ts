import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { pearson } from '../../../src/core/stats';
import { seeded } from '../../support/random';

describe('pearson', () => {
  it('matches a hand-worked example', () => {
    // By hand: x̄ = 2.5, ȳ = 5; deviations [-1.5, -0.5, 0.5, 1.5] and [-3, -1, 0, 4];
    // Sxy = 4.5 + 0.5 + 0 + 6 = 11, Sxx = 5, Syy = 26, r = 11 / √130.
    expect(pearson([1, 2, 3, 4], [2, 4, 5, 9])).toBeCloseTo(11 / Math.sqrt(130), 15);
  });

  it('is ±1 for exact linear relations', () => {
    expect(pearson([1, 2, 3, 4, 5], [3, 5, 7, 9, 11])).toBeCloseTo(1, 15);
    expect(pearson([1, 2, 3, 4, 5], [-1, -2, -3, -4, -5])).toBeCloseTo(-1, 15);
  });

  it('uses only the pairs where both values are finite', () => {
    const x = [1, 2, NaN, 3, 4, 5, null];
    const y = [2, 4, 100, 5, Infinity, 9, 7];
    expect(pearson(x, y)).toBe(pearson([1, 2, 3, 5], [2, 4, 5, 9]));
  });

  it('returns undefined for fewer than 3 complete pairs', () => {
    expect(pearson([1, 2], [3, 4])).toBeUndefined();
    expect(pearson([1, 2, NaN], [3, 4, 5])).toBeUndefined();
    expect(pearson([], [])).toBeUndefined();
  });

  it('returns NaN when one variable is constant', () => {
    expect(pearson([1, 1, 1, 1], [1, 2, 3, 4])).toBeNaN();
  });

  it('throws a sentence when x and y differ in length', () => {
    expect(() => pearson([1, 2, 3], [1, 2])).toThrow(/same length/);
  });

  it('agrees with simple-statistics sampleCorrelation on random data', () => {
    const random = seeded(13);
    for (let trial = 0; trial < 20; trial++) {
      const n = 3 + Math.floor(random() * 400);
      const x = Array.from({ length: n }, () => random());
      const slope = random() * 2 - 1;
      const y = x.map((v) => slope * v + 0.3 * random());
      // Reference: simple-statistics sampleCorrelation (npm).
      expect(pearson(x, y)).toBeCloseTo(ss.sampleCorrelation(x, y), 12);
    }
  });

  it('loses no accuracy to a large offset on either variable', () => {
    // Shift invariance of r (definition); the offset values are exact dyadic doubles.
    const x = [0, 0.25, 0.5, 1, 2];
    const y = [1, 0.5, 2, 2.5, 4];
    const r = pearson(x, y)!;
    expect(pearson(x.map((v) => v + 2 ** 30), y.map((v) => v - 2 ** 31))).toBeCloseTo(r, 14);
  });
});
