import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { spearman } from '../../../src/core/stats';
import { seeded } from '../../support/random';

describe('spearman', () => {
  it('matches a hand-worked example with a tie', () => {
    // By hand: ranks x = [1, 2, 3, 4, 5], y = [5, 6, 7, 8, 7] -> [1, 2, 3.5, 5, 3.5];
    // centred: [-2, -1, 0, 1, 2] and [-2, -1, 0.5, 2, 0.5]; Sxy = 8, Sxx = 10, Syy = 9.5.
    expect(spearman([1, 2, 3, 4, 5], [5, 6, 7, 8, 7])).toBeCloseTo(8 / Math.sqrt(95), 15);
  });

  it('is 1 for any strictly increasing relation, however curved', () => {
    const x = [0.1, 1, 2, 5, 10, 100];
    expect(spearman(x, x.map((v) => Math.exp(v / 10)))).toBeCloseTo(1, 15);
    expect(spearman(x, x.map((v) => -Math.log(v)))).toBeCloseTo(-1, 15);
  });

  it('uses only complete pairs and needs at least 3 of them', () => {
    expect(spearman([1, NaN, 2, 3], [1, 5, 2, 3])).toBeCloseTo(1, 15);
    expect(spearman([1, NaN, 2], [1, 5, 2])).toBeUndefined();
    expect(() => spearman([1], [1, 2])).toThrow(/same length/);
  });

  it('agrees with simple-statistics sampleRankCorrelation on random data with ties', () => {
    const random = seeded(14);
    for (let trial = 0; trial < 20; trial++) {
      const n = 3 + Math.floor(random() * 300);
      const x = Array.from({ length: n }, () => Math.floor(random() * 20));
      const y = x.map((v) => Math.floor(v / 2 + random() * 8));
      // Reference: simple-statistics sampleRankCorrelation (npm, average ranks for ties).
      expect(spearman(x, y)).toBeCloseTo(ss.sampleRankCorrelation(x, y), 12);
    }
    // One large case, past the radix-ordering threshold.
    const x = Array.from({ length: 6000 }, () => random() * 2 - 1);
    const y = x.map((v) => v * v + 0.1 * random());
    expect(spearman(x, y)).toBeCloseTo(ss.sampleRankCorrelation(x, y), 12);
  });
});
