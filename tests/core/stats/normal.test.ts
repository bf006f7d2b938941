import { describe, expect, it } from 'vitest';
import { normalCdf, normalQuantile, normalSurvival } from '../../../src/core/stats';

const density = (z: number) => Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);

/**
 * Oracle for the centre: Φ(z) = 1/2 + φ(z) Σₙ z^(2n+1) / (1·3·5···(2n+1))
 * (Abramowitz & Stegun, Handbook of Mathematical Functions, 26.2.11). All terms share one sign,
 * so the series loses nothing to cancellation.
 */
function centralSeries(z: number): number {
  let term = z;
  let sum = z;
  for (let n = 1; n < 500 && Math.abs(term) > 1e-18 * Math.abs(sum); n++) {
    term *= (z * z) / (2 * n + 1);
    sum += term;
  }
  return 0.5 + density(z) * sum;
}

/**
 * Oracle for the upper tail: Laplace's continued fraction for the Mills ratio,
 * Q(z) = φ(z) / (z + 1/(z + 2/(z + 3/(z + …)))) (Abramowitz & Stegun 26.2.14), evaluated
 * bottom-up from a deep truncation.
 */
function tailContinuedFraction(z: number): number {
  let fraction = z;
  for (let k = 2000; k >= 1; k--) fraction = z + k / fraction;
  return density(z) / fraction;
}

const relativeError = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('normalCdf', () => {
  it('matches the A&S 26.2.11 series to 1e-14 relative on [-2, 2]', () => {
    for (let z = -2; z <= 2; z += 0.03125) {
      expect(relativeError(normalCdf(z), centralSeries(z))).toBeLessThan(1e-14);
    }
  });

  it('matches the Laplace continued fraction to 1e-14 relative in the lower tail down to z = -37', () => {
    for (let z = 2; z <= 37; z += 0.25) {
      expect(relativeError(normalCdf(-z), tailContinuedFraction(z))).toBeLessThan(1e-14);
    }
  });

  it('reproduces two well-known values', () => {
    // From memory (standard tables): Φ(1.96) = 0.9750021048517795, Φ(-8) = 6.22096057427178e-16.
    expect(normalCdf(1.96)).toBeCloseTo(0.9750021048517795, 15);
    expect(relativeError(normalCdf(-8), 6.22096057427178e-16)).toBeLessThan(1e-13);
  });

  it('is exactly 1/2 at 0, symmetric, and saturates at the infinities', () => {
    expect(normalCdf(0)).toBe(0.5);
    for (const z of [0.3, 0.7, 1.5, 4, 6]) expect(normalCdf(z) + normalCdf(-z)).toBeCloseTo(1, 15);
    expect(normalCdf(-Infinity)).toBe(0);
    expect(normalCdf(Infinity)).toBe(1);
    expect(normalCdf(NaN)).toBeNaN();
  });

  it('underflows to 0 only below z = -37.519 (Cody, double precision)', () => {
    expect(normalCdf(-37.5)).toBeGreaterThan(0);
    expect(normalCdf(-38)).toBe(0);
  });
});

describe('normalSurvival', () => {
  it('keeps relative accuracy where 1 - Φ(z) would round to 0', () => {
    for (const z of [3, 5, 8, 10, 20, 30]) {
      expect(relativeError(normalSurvival(z), tailContinuedFraction(z))).toBeLessThan(1e-14);
    }
    expect(1 - normalCdf(10)).toBe(0);
    expect(normalSurvival(10)).toBeGreaterThan(0);
  });

  it('equals Φ(-z)', () => {
    for (const z of [-3, -0.5, 0, 0.5, 3]) expect(normalSurvival(z)).toBe(normalCdf(-z));
  });
});

describe('normalQuantile', () => {
  it('inverts normalCdf from p = 1e-300 to 1/2 with about 1e-14 relative error in z', () => {
    // A relative error δ in z moves Φ by a relative z²·δ (d ln Φ / d ln|z| ≈ z² in the tail),
    // so the round trip is allowed 1e-14·max(1, z²).
    const check = (p: number) => {
      const z = normalQuantile(p);
      expect(relativeError(normalCdf(z), p)).toBeLessThan(1e-14 * Math.max(1, z * z));
    };
    for (let e = -300; e <= -1; e += 1.5) check(10 ** e);
    for (let p = 0.05; p < 0.5; p += 0.01) check(p);
  });

  it('is antisymmetric about 1/2 and reproduces the 97.5 % point', () => {
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0.9)).toBeCloseTo(-normalQuantile(0.1), 14);
    // From memory (standard tables): Φ⁻¹(0.975) = 1.959963984540054.
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 14);
  });

  it('returns ∓Infinity at 0 and 1 and throws a sentence outside [0, 1]', () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(() => normalQuantile(1.2)).toThrow(/between 0 and 1/);
    expect(() => normalQuantile(NaN)).toThrow(/between 0 and 1/);
  });
});
