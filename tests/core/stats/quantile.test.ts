import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { quantile, quantileSorted, quantiles, selectInPlace, selectManyInPlace } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/**
 * Oracle: Hyndman & Fan 1996, type 7 definition, on a full sort. With 1-based order statistics
 * x(1) <= ... <= x(n): h = (n - 1)p + 1, Q(p) = x(⌊h⌋) + (h - ⌊h⌋)(x(⌊h⌋+1) - x(⌊h⌋)).
 */
function type7(values: number[], p: number): number {
  const x = values.filter(Number.isFinite).sort((a, b) => a - b);
  const h = (x.length - 1) * p + 1;
  const lo = Math.floor(h);
  if (lo >= x.length) return x[x.length - 1];
  return x[lo - 1] + (h - lo) * (x[lo] - x[lo - 1]);
}

const PS = [0, 0.01, 0.1, 0.25, 1 / 3, 0.5, 0.75, 0.9, 0.99, 1];

describe('quantile (Hyndman & Fan type 7)', () => {
  it('interpolates linearly between order statistics', () => {
    // Hyndman & Fan 1996, type 7 definition: n = 10, p = 0.33 gives h = 3.97, so 3 + 0.97 * (4 - 3).
    expect(quantile([1, 2, 3, 4, 5, 6, 7, 8, 9, 10], 0.33)).toBeCloseTo(3.97, 14);
    // n = 4, p = 0.25: h = 1.75, so x(1) + 0.75 (x(2) - x(1)) = 1.75.
    expect(quantile([4, 3, 2, 1], 0.25)).toBe(1.75);
  });

  it('returns the minimum at p = 0 and the maximum at p = 1', () => {
    expect(quantile([5, -2, 9, 3], 0)).toBe(-2);
    expect(quantile([5, -2, 9, 3], 1)).toBe(9);
  });

  it('returns the value itself for any p when only one value is finite', () => {
    for (const p of PS) expect(quantile([NaN, 7, null], p)).toBe(7);
  });

  it('returns undefined when no value is finite', () => {
    expect(quantile([], 0.5)).toBeUndefined();
    expect(quantile([NaN, Infinity, -Infinity], 0.5)).toBeUndefined();
  });

  it('throws a sentence for p outside [0, 1] or NaN, even on empty input', () => {
    expect(() => quantile([1, 2], 1.5)).toThrow(/between 0 and 1/);
    expect(() => quantile([1, 2], -0.1)).toThrow(/between 0 and 1/);
    expect(() => quantile([], NaN)).toThrow(/between 0 and 1/);
  });

  it('does not modify its input', () => {
    const input = new Float64Array([5, 1, 4, 2, 3]);
    quantile(input, 0.3);
    expect(Array.from(input)).toEqual([5, 1, 4, 2, 3]);
  });

  it('matches the type 7 definition and simple-statistics on random data of many sizes', () => {
    const random = seeded(3);
    for (const n of [1, 2, 3, 4, 5, 10, 99, 100, 601, 602, 1000, 5000, 20001]) {
      const values = Array.from({ length: n }, () => random() * 2 - 1);
      for (const p of PS) {
        // The oracle forms the fraction as ((n-1)p + 1) - ⌊·⌋, so the last bit may differ.
        expect(quantile(values, p)).toBeCloseTo(type7(values, p), 14);
        // Reference: simple-statistics quantile (npm, 7.12: (n - 1)p index with linear interpolation, type 7).
        expect(quantile(values, p)).toBeCloseTo(ss.quantile(values, p), 14);
      }
    }
  });

  it('handles ties, sorted, reversed and constant inputs that trouble naive selection', () => {
    const n = 3001;
    const shapes: Record<string, number[]> = {
      sorted: Array.from({ length: n }, (_, i) => i),
      reversed: Array.from({ length: n }, (_, i) => n - i),
      constant: new Array(n).fill(2.5),
      fewDistinct: Array.from({ length: n }, (_, i) => i % 3),
      organPipe: Array.from({ length: n }, (_, i) => Math.min(i, n - i)),
    };
    for (const values of Object.values(shapes)) {
      for (const p of PS) expect(quantile(values, p)).toBeCloseTo(type7(values, p), 12);
    }
  });
});

describe('quantiles', () => {
  it('returns several quantiles in the order asked, from one copy', () => {
    // Hyndman & Fan 1996, type 7 definition on 1..5: quartiles 2, 3, 4.
    expect(quantiles([5, 3, 1, 4, 2], [0.75, 0.25, 0.5])).toEqual([4, 2, 3]);
  });

  it('agrees with the type 7 definition for many probabilities at once, duplicates included', () => {
    const random = seeded(4);
    const values = Array.from({ length: 12345 }, () => Math.round(random() * 200) / 10);
    values[17] = NaN;
    const ps = [...PS, 0.5, 0.25, 0.001, 0.999];
    const got = quantiles(values, ps)!;
    ps.forEach((p, i) => expect(got[i]).toBeCloseTo(type7(values, p), 13));
  });

  it('returns undefined when no value is finite, and throws for a bad probability', () => {
    expect(quantiles([NaN], [0.5])).toBeUndefined();
    expect(() => quantiles([1, 2, 3], [0.5, 2])).toThrow(/between 0 and 1/);
  });
});

describe('quantileSorted', () => {
  it('applies the type 7 rule to an already sorted array', () => {
    const sorted = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
    for (const p of PS) expect(quantileSorted(sorted, p)).toBeCloseTo(type7(sorted, p), 13);
    expect(quantileSorted([], 0.5)).toBeUndefined();
    expect(() => quantileSorted(sorted, 1.01)).toThrow(/between 0 and 1/);
  });
});

describe('selectInPlace and selectManyInPlace (Floyd–Rivest)', () => {
  it('put the k-th smallest value at k with smaller values before it and larger after', () => {
    const random = seeded(5);
    const original = Float64Array.from({ length: 10007 }, () => Math.floor(random() * 500));
    const sorted = Float64Array.from(original).sort();
    for (const k of [0, 1, 600, 5003, 10006]) {
      const a = Float64Array.from(original);
      selectInPlace(a, k);
      expect(a[k]).toBe(sorted[k]);
      expect(a.subarray(0, k).every((v) => v <= a[k])).toBe(true);
      expect(a.subarray(k + 1).every((v) => v >= a[k])).toBe(true);
    }
    const many = Float64Array.from(original);
    const positions = [3, 700, 701, 5000, 9999];
    selectManyInPlace(many, positions);
    for (const k of positions) expect(many[k]).toBe(sorted[k]);
  });
});
