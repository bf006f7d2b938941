import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { chiSquareSurvival, logGamma, normalSurvival, regularizedGammaP, regularizedGammaQ } from '../../../src/core/stats';
import { seeded } from '../../support/random';

const relativeError = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/** Exact factorial as a BigInt. */
function factorial(n: number): bigint {
  let f = 1n;
  for (let k = 2n; k <= BigInt(n); k++) f *= k;
  return f;
}

/** ln of a positive BigInt, exact to double rounding: split off a power of ten first. */
function logBig(v: bigint): number {
  const digits = v.toString();
  const head = digits.slice(0, 17);
  return Math.log(Number(head) / 10 ** (head.length - 1)) + (digits.length - 1) * Math.LN10;
}

describe('logGamma', () => {
  it('equals ln((n - 1)!) at whole numbers', () => {
    // Definition: Γ(n) = (n - 1)!, factorials exact in BigInt.
    for (let n = 1; n <= 60; n++) {
      const expected = logBig(factorial(n - 1));
      expect(Math.abs(logGamma(n) - expected)).toBeLessThan(1e-14 * Math.max(1, expected));
    }
  });

  it('equals ln(√π (2n)! / (4ⁿ n!)) at half-integers', () => {
    // Definition: Γ(n + ½) = (2n)! √π / (4ⁿ n!) (Abramowitz & Stegun 6.1.12).
    for (let n = 0; n <= 40; n++) {
      const expected = 0.5 * Math.log(Math.PI) + logBig(factorial(2 * n)) - n * Math.log(4) - logBig(factorial(n));
      expect(Math.abs(logGamma(n + 0.5) - expected)).toBeLessThan(2e-14 * Math.max(1, Math.abs(expected)));
    }
  });

  it('agrees with simple-statistics gammaln (Lanczos) across (0, 300)', () => {
    const random = seeded(15);
    for (let i = 0; i < 2000; i++) {
      const x = random() < 0.3 ? random() * 2 : random() * 300;
      const expected = ss.gammaln(x);
      // Reference: simple-statistics gammaln (npm), an independent Lanczos approximation.
      expect(Math.abs(logGamma(x) - expected)).toBeLessThan(1e-13 * Math.max(1, Math.abs(expected)));
    }
  });

  it('satisfies ln Γ(x + 1) - ln Γ(x) = ln x across its internal branch points', () => {
    for (const x of [1e-8, 0.5, 0.999, 1.5, 8.75, 9.99, 10, 22.5, 23, 50.25]) {
      expect(logGamma(x + 1) - logGamma(x)).toBeCloseTo(Math.log(x), 13);
    }
  });

  it('returns NaN outside x > 0 and Infinity at Infinity', () => {
    expect(logGamma(0)).toBeNaN();
    expect(logGamma(-2.5)).toBeNaN();
    expect(logGamma(NaN)).toBeNaN();
    expect(logGamma(Infinity)).toBe(Infinity);
  });
});

describe('regularizedGammaP and regularizedGammaQ', () => {
  it('reduce to e^(-x) for a = 1', () => {
    // Definition: Q(1, x) = ∫ₓ^∞ e^(-t) dt = e^(-x).
    for (const x of [0.01, 0.5, 1, 2, 5, 30, 200]) {
      expect(relativeError(regularizedGammaQ(1, x), Math.exp(-x))).toBeLessThan(1e-14);
    }
  });

  it('equal the Poisson sum for whole a', () => {
    // Identity: Q(k, x) = e^(-x) Σ_{j<k} x^j / j! (Abramowitz & Stegun 6.5.13).
    for (const k of [2, 3, 7, 20]) {
      for (const x of [0.3, 2, 6.5, 15, 40]) {
        let term = Math.exp(-x);
        let sum = term;
        for (let j = 1; j < k; j++) {
          term *= x / j;
          sum += term;
        }
        expect(relativeError(regularizedGammaQ(k, x), sum)).toBeLessThan(1e-13);
      }
    }
  });

  it('reduce to the normal tail for a = ½', () => {
    // Identity: Q(½, x) = erfc(√x) = 2 Q_normal(√(2x)).
    for (const x of [0.01, 0.3, 1, 4, 12, 50]) {
      expect(relativeError(regularizedGammaQ(0.5, x), 2 * normalSurvival(Math.sqrt(2 * x)))).toBeLessThan(1e-13);
    }
  });

  it('add up to 1 and take their limits at 0 and Infinity', () => {
    for (const [a, x] of [[0.7, 0.2], [3.2, 4.1], [12, 9], [50, 60]]) {
      expect(regularizedGammaP(a, x) + regularizedGammaQ(a, x)).toBeCloseTo(1, 14);
    }
    expect(regularizedGammaQ(2.5, 0)).toBe(1);
    expect(regularizedGammaP(2.5, 0)).toBe(0);
    expect(regularizedGammaQ(2.5, Infinity)).toBe(0);
  });

  it('throw a sentence for a <= 0 or x < 0', () => {
    expect(() => regularizedGammaQ(0, 1)).toThrow(/a > 0/);
    expect(() => regularizedGammaP(1, -1)).toThrow(/x >= 0/);
  });
});

describe('chiSquareSurvival', () => {
  it('equals exp(-x/2) for 2 degrees of freedom', () => {
    // Definition: the χ² density with df = 2 is e^(-x/2)/2, so P(χ² > x) = e^(-x/2).
    for (const x of [0.001, 0.5, 2, 5.991464547107979, 10, 50, 300, 1400]) {
      expect(relativeError(chiSquareSurvival(x, 2), Math.exp(-x / 2))).toBeLessThan(1e-14);
    }
  });

  it('equals the two-sided normal tail for 1 degree of freedom and its closed form for 3', () => {
    // Identities: P(χ²₁ > x) = 2 Q(√x); P(χ²₃ > x) = 2 Q(√x) + √(2x/π) e^(-x/2).
    for (const x of [0.1, 1, 3.841458820694124, 9, 25, 100]) {
      const q = normalSurvival(Math.sqrt(x));
      expect(relativeError(chiSquareSurvival(x, 1), 2 * q)).toBeLessThan(1e-13);
      expect(relativeError(chiSquareSurvival(x, 3), 2 * q + Math.sqrt((2 * x) / Math.PI) * Math.exp(-x / 2))).toBeLessThan(1e-13);
    }
  });

  it('matches the Poisson-sum closed form for 1000 degrees of freedom', () => {
    // Identity: P(χ²_{2k} > x) = Σ_{j<k} e^(-x/2) (x/2)^j / j!, terms formed in log space.
    const k = 500;
    for (const x of [900, 1000, 1100, 1300]) {
      const half = x / 2;
      let sum = 0;
      for (let j = 0; j < k; j++) sum += Math.exp(-half + j * Math.log(half) - logBig(factorial(j)));
      expect(relativeError(chiSquareSurvival(x, 2 * k), sum)).toBeLessThan(1e-11);
    }
  });

  it('gives 5 % at the familiar critical values', () => {
    // From memory (standard tables): 95 % points 3.841458820694124 (df 1) and 18.307038053275146 (df 10).
    expect(chiSquareSurvival(3.841458820694124, 1)).toBeCloseTo(0.05, 13);
    expect(chiSquareSurvival(18.307038053275146, 10)).toBeCloseTo(0.05, 13);
  });

  it('is 1 at and below zero, NaN for NaN, and throws for degrees of freedom <= 0', () => {
    expect(chiSquareSurvival(0, 4)).toBe(1);
    expect(chiSquareSurvival(-3, 4)).toBe(1);
    expect(chiSquareSurvival(NaN, 4)).toBeNaN();
    expect(() => chiSquareSurvival(1, 0)).toThrow(/degrees of freedom/);
  });
});
