import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { standardDeviation, variance } from '../../../src/core/stats';
import { seeded } from '../../support/random';

describe('variance and standardDeviation', () => {
  it('use the sample (n - 1) denominator', () => {
    // Worked example: [2, 4, 4, 4, 5, 5, 7, 9] has mean 5 and Σ(x - 5)² = 32, so s² = 32/7.
    expect(variance([2, 4, 4, 4, 5, 5, 7, 9])).toBeCloseTo(32 / 7, 15);
    expect(standardDeviation([2, 4, 4, 4, 5, 5, 7, 9])).toBeCloseTo(Math.sqrt(32 / 7), 15);
  });

  it('return undefined for fewer than two finite values', () => {
    expect(variance([])).toBeUndefined();
    expect(variance([3])).toBeUndefined();
    expect(variance([3, NaN, null, Infinity])).toBeUndefined();
    expect(standardDeviation([NaN, NaN])).toBeUndefined();
  });

  it('ignore NaN, ±Infinity, null and undefined', () => {
    expect(variance([1, NaN, 2, Infinity, 3, null, undefined])).toBe(1);
  });

  it('return 0 for constant data', () => {
    expect(variance([7.3, 7.3, 7.3, 7.3])).toBe(0);
  });

  it('agree with simple-statistics on random data', () => {
    const random = seeded(2);
    for (let trial = 0; trial < 20; trial++) {
      const values = Array.from({ length: 2 + Math.floor(random() * 500) }, () => random() * 100 - 20);
      // Reference: simple-statistics sampleVariance / sampleStandardDeviation (npm).
      expect(variance(values)! / ss.sampleVariance(values)).toBeCloseTo(1, 12);
      expect(standardDeviation(values)! / ss.sampleStandardDeviation(values)).toBeCloseTo(1, 12);
    }
  });

  it('lose nothing to a large common offset', () => {
    // Exact arithmetic: 1e9 + {0, 0.5, 1} (all exact doubles) have mean 1e9 + 0.5 and s² = 0.25.
    expect(variance([1e9, 1e9 + 0.5, 1e9 + 1])).toBe(0.25);
    // Same for 1e15 + i/4, i = 0..7 (exact doubles): s² = (1/16)·Σ(i - 3.5)²/7 = (1/16)·6 = 0.375.
    expect(variance(Float64Array.from({ length: 8 }, (_, i) => 1e15 + i / 4))).toBe(0.375);
  });
});
