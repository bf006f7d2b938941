import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { compensatedSum, mean } from '../../../src/core/stats';
import { seeded } from '../../support/random';

describe('mean', () => {
  it('ignores NaN, ±Infinity, null and undefined', () => {
    expect(mean([1, NaN, 2, Infinity, null, 3, undefined, -Infinity])).toBe(2);
  });

  it('returns undefined for an empty input or when no value is finite', () => {
    expect(mean([])).toBeUndefined();
    expect(mean(new Float64Array([NaN, NaN]))).toBeUndefined();
  });

  it('returns the value itself for a single value', () => {
    expect(mean([42.5])).toBe(42.5);
  });

  it('agrees with simple-statistics mean on random data', () => {
    const random = seeded(1);
    for (let trial = 0; trial < 20; trial++) {
      const values = Array.from({ length: 1 + Math.floor(random() * 500) }, () => (random() - 0.3) * 1e3);
      // Reference: simple-statistics mean (npm).
      expect(mean(values)).toBeCloseTo(ss.mean(values), 10);
    }
  });

  it('keeps every digit when the values share a large offset', () => {
    // Worked example with dyadic values, so the exact mean is representable:
    // 1e8 + i/8 for i = 0..999 has mean 1e8 + 999/16 = 100000062.4375 exactly.
    const values = Float64Array.from({ length: 1000 }, (_, i) => 1e8 + i / 8);
    expect(mean(values)).toBe(100000062.4375);
  });

  it('does not overflow when the sum of the values would', () => {
    // Exact arithmetic: the mean of 1.5e308 and 1.7e308 is 1.6e308, a finite double.
    expect(mean([1.5e308, 1.7e308])).toBeCloseTo(1.6e308, -293);
    expect(Number.isFinite(mean([1.5e308, 1.7e308]))).toBe(true);
  });
});

describe('compensatedSum', () => {
  it('recovers small terms that plain summation loses next to large ones', () => {
    // Neumaier's example (from memory): 1 + 1e100 + 1 - 1e100 is exactly 2 (naive summation gives 0).
    expect(compensatedSum([1, 1e100, 1, -1e100])).toBe(2);
    expect(compensatedSum([1, NaN, 2, null])).toBe(3);
  });

  it('sums 0.1 ten thousand times to the double nearest 1000', () => {
    // Exact arithmetic: the double 0.1 is 0.1000000000000000055511151231257827..., so the exact sum
    // is 1000.000000000000055511..., whose nearest double is 1000.
    expect(compensatedSum(new Float64Array(10000).fill(0.1))).toBe(1000);
  });
});
