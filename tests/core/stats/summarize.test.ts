import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { summarize } from '../../../src/core/stats';
import { seeded } from '../../support/random';

describe('summarize', () => {
  it('agrees field by field with simple-statistics on random data', () => {
    const random = seeded(22);
    for (const n of [2, 3, 4, 7, 100, 1001, 40000]) {
      const values = Array.from({ length: n }, () => Math.exp(random() * 4));
      const s = summarize(values)!;
      // Reference: simple-statistics (npm) mean, sampleStandardDeviation, median, quantile (type 7),
      // interquartileRange, min and max.
      expect(s.n).toBe(n);
      expect(s.mean).toBeCloseTo(ss.mean(values), 12);
      expect(s.sigma).toBeCloseTo(ss.sampleStandardDeviation(values), 12);
      expect(s.median).toBeCloseTo(ss.median(values), 14);
      expect(s.q1).toBeCloseTo(ss.quantile(values, 0.25), 14);
      expect(s.q3).toBeCloseTo(ss.quantile(values, 0.75), 14);
      expect(s.robustSigma).toBeCloseTo(ss.interquartileRange(values)! / 1.349, 13);
      expect(s.min).toBe(ss.min(values));
      expect(s.max).toBe(ss.max(values));
    }
  });

  it('skips non-finite values', () => {
    const s = summarize([4, NaN, 1, Infinity, 3, null, 2, -Infinity, undefined])!;
    // Hyndman & Fan type 7 on [1, 2, 3, 4]: Q1 = 1.75, median 2.5, Q3 = 3.25.
    expect(s).toMatchObject({ n: 4, mean: 2.5, median: 2.5, q1: 1.75, q3: 3.25, min: 1, max: 4 });
    expect(s.sigma).toBeCloseTo(Math.sqrt(5 / 3), 15);
    expect(s.robustSigma).toBeCloseTo(1.5 / 1.349, 15);
  });

  it('reports sigma NaN and zero robust sigma for a single value', () => {
    const s = summarize([NaN, 7])!;
    expect(s).toMatchObject({ n: 1, mean: 7, median: 7, q1: 7, q3: 7, min: 7, max: 7, robustSigma: 0 });
    expect(s.sigma).toBeNaN();
  });

  it('returns undefined when no value is finite', () => {
    expect(summarize([])).toBeUndefined();
    expect(summarize(new Float64Array([NaN, NaN]))).toBeUndefined();
  });

  it('leaves its input untouched', () => {
    const input = new Float64Array([5, 3, 9, 1, 7]);
    summarize(input);
    expect(Array.from(input)).toEqual([5, 3, 9, 1, 7]);
  });
});
