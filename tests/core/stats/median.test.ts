import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { median } from '../../../src/core/stats';
import { seeded } from '../../support/random';

describe('median', () => {
  it('returns the middle value for odd n', () => {
    expect(median([9, 1, 5])).toBe(5);
  });

  it('averages the two middle values for even n', () => {
    // Definition (DOMAIN.md, Hyndman & Fan type 7 at p = 1/2): (2 + 3) / 2.
    expect(median([4, 1, 3, 2])).toBe(2.5);
  });

  it('ignores NaN, ±Infinity, null and undefined', () => {
    expect(median([3, NaN, 1, Infinity, null, 2, undefined])).toBe(2);
  });

  it('returns undefined when no value is finite and the value itself for n = 1', () => {
    expect(median([])).toBeUndefined();
    expect(median([NaN])).toBeUndefined();
    expect(median([-4])).toBe(-4);
  });

  it('handles ties', () => {
    expect(median([2, 2, 2, 1, 3, 3])).toBe(2);
    expect(median([1, 1, 5, 5])).toBe(3);
  });

  it('agrees with simple-statistics median on random data of odd and even sizes', () => {
    const random = seeded(6);
    for (let n = 1; n < 2000; n += 97) {
      const values = Array.from({ length: n }, () => random() * 1e-9);
      // Reference: simple-statistics median (npm).
      expect(median(values)).toBe(ss.median(values));
    }
  });
});
