import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { IQR_PER_SIGMA, MAD_TO_SIGMA, iqrSigma, madSigma, medianAbsoluteDeviation, normalQuantile } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/** Standard normal deviates by the Box–Muller transform (G. E. P. Box and M. E. Muller, 1958). */
function normalSample(n: number, random: () => number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 2) {
    const r = Math.sqrt(-2 * Math.log(1 - random()));
    const angle = 2 * Math.PI * random();
    out[i] = r * Math.cos(angle);
    if (i + 1 < n) out[i + 1] = r * Math.sin(angle);
  }
  return out;
}

describe('robust sigma constants', () => {
  it('1.349 is 2·Φ⁻¹(3/4) rounded to four significant digits', () => {
    // Definition: the IQR of N(0, 1) is 2 Φ⁻¹(0.75) = 1.34897950…
    expect((2 * normalQuantile(0.75)).toFixed(3)).toBe(IQR_PER_SIGMA.toFixed(3));
  });

  it('the MAD consistency constant is 1/Φ⁻¹(3/4)', () => {
    // Rousseeuw & Croux (1993): b = 1 / Φ⁻¹(3/4).
    expect(MAD_TO_SIGMA).toBeCloseTo(1 / normalQuantile(0.75), 15);
  });
});

describe('iqrSigma', () => {
  it('is the type 7 interquartile range divided by 1.349', () => {
    // Hyndman & Fan type 7 on 1..5: Q1 = 2, Q3 = 4.
    expect(iqrSigma([1, 2, 3, 4, 5])).toBe(2 / 1.349);
  });

  it('agrees with simple-statistics interquartileRange / 1.349 on random data', () => {
    const random = seeded(7);
    for (let n = 2; n < 3000; n += 211) {
      const values = Array.from({ length: n }, () => random() * 50);
      // Reference: simple-statistics interquartileRange (npm, type 7 quartiles).
      expect(iqrSigma(values)).toBeCloseTo(ss.interquartileRange(values)! / 1.349, 12);
    }
  });

  it('returns undefined for fewer than two finite values', () => {
    expect(iqrSigma([])).toBeUndefined();
    expect(iqrSigma([1, NaN])).toBeUndefined();
  });

  it('estimates sigma of normal data', () => {
    // Consistency: for N(0, 2²) the estimate tends to 2 (200,000 draws: sampling error about 0.3 %).
    const values = normalSample(200000, seeded(8)).map((v) => 2 * v);
    expect(iqrSigma(values)! / 2).toBeCloseTo(1, 1);
    expect(Math.abs(iqrSigma(values)! / 2 - 1)).toBeLessThan(0.01);
  });
});

describe('medianAbsoluteDeviation and madSigma', () => {
  it('computes median |x - median(x)|', () => {
    // Worked example: median of [1, 1, 2, 2, 4, 6, 9] is 2; deviations [1, 1, 0, 0, 2, 4, 7]; their median is 1.
    expect(medianAbsoluteDeviation([1, 1, 2, 2, 4, 6, 9])).toBe(1);
    expect(madSigma([1, 1, 2, 2, 4, 6, 9])).toBe(1.482602218505602);
  });

  it('agrees with simple-statistics medianAbsoluteDeviation on random data', () => {
    const random = seeded(9);
    for (let n = 1; n < 3000; n += 199) {
      const values = Array.from({ length: n }, () => random() * 10 - 5);
      // Reference: simple-statistics medianAbsoluteDeviation (npm).
      expect(medianAbsoluteDeviation(values)).toBeCloseTo(ss.medianAbsoluteDeviation(values), 14);
    }
  });

  it('ignores non-finite values and returns undefined below its minimum count', () => {
    expect(medianAbsoluteDeviation([NaN])).toBeUndefined();
    expect(madSigma([5])).toBeUndefined();
    expect(madSigma([1, NaN, 3, Infinity])).toBe(1.482602218505602);
  });

  it('estimates sigma of normal data and resists a tenth of gross outliers better than the IQR', () => {
    const values = normalSample(200000, seeded(10));
    expect(Math.abs(madSigma(values)! - 1)).toBeLessThan(0.01);
    for (let i = 0; i < values.length; i += 10) values[i] = 1e6;
    // With 10 % contamination the MAD moves less than the IQR does (breakdown 50 % vs 25 %).
    expect(Math.abs(madSigma(values)! - 1)).toBeLessThan(Math.abs(iqrSigma(values)! - 1));
  });
});
