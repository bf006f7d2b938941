import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { leastSquares, linearFit, mean, polynomialFit, standardDeviation } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/**
 * Oracle for well-conditioned problems: the normal equations XᵀX b = Xᵀy solved by Gaussian
 * elimination with partial pivoting, and (XᵀX)⁻¹ for the standard errors. Textbook, independent
 * of the QR code under test.
 */
function normalEquations(columns: number[][], y: number[]) {
  const n = y.length;
  const x = [new Array(n).fill(1), ...columns];
  const p = x.length;
  const a = x.map((ci) => [...x.map((cj) => ci.reduce((s, v, r) => s + v * cj[r], 0)), ...x.map((_, j) => (j === x.indexOf(ci) ? 1 : 0))]);
  const rhs = x.map((ci) => ci.reduce((s, v, r) => s + v * y[r], 0));
  for (let col = 0; col < p; col++) {
    let pivot = col;
    for (let r = col + 1; r < p; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    [rhs[col], rhs[pivot]] = [rhs[pivot], rhs[col]];
    for (let r = 0; r < p; r++) {
      if (r === col) continue;
      const f = a[r][col] / a[col][col];
      for (let c = col; c < 2 * p; c++) a[r][c] -= f * a[col][c];
      rhs[r] -= f * rhs[col];
    }
  }
  const b = rhs.map((v, i) => v / a[i][i]);
  const inverseDiagonal = a.map((row, i) => row[p + i] / row[i]);
  const residuals = y.map((v, r) => v - x.reduce((s, c, j) => s + b[j] * c[r], 0));
  const sigma2 = residuals.reduce((s, v) => s + v * v, 0) / (n - p);
  return { b, se: inverseDiagonal.map((d) => Math.sqrt(sigma2 * d)) };
}

describe('linearFit', () => {
  it('matches a hand-worked example', () => {
    // By hand: x̄ = 3, ȳ = 4, Sxy = 6, Sxx = 10 → slope 0.6, intercept 2.2; residuals
    // [-0.8, 0.6, 1, -0.6, -0.2], RSS = 2.4, TSS = 6 → R² = 0.6, residual SD = √(2.4/3).
    const fit = linearFit([1, 2, 3, 4, 5], [2, 4, 5, 4, 5])!;
    expect(fit.slope).toBeCloseTo(0.6, 14);
    expect(fit.intercept).toBeCloseTo(2.2, 14);
    expect(fit.rSquared).toBeCloseTo(0.6, 14);
    expect(fit.residualSd).toBeCloseTo(Math.sqrt(0.8), 14);
    expect(fit.n).toBe(5);
  });

  it('agrees with simple-statistics linearRegression and rSquared on random data', () => {
    const random = seeded(20);
    for (let trial = 0; trial < 20; trial++) {
      const n = 3 + Math.floor(random() * 300);
      const x = Array.from({ length: n }, () => random() * 10);
      const y = x.map((v) => 3 - 0.7 * v + random());
      const pairs = x.map((v, i) => [v, y[i]]);
      // Reference: simple-statistics linearRegression / rSquared (npm).
      const line = ss.linearRegression(pairs);
      const fit = linearFit(x, y)!;
      expect(fit.slope).toBeCloseTo(line.m, 10);
      expect(fit.intercept).toBeCloseTo(line.b, 10);
      expect(fit.rSquared).toBeCloseTo(ss.rSquared(pairs, ss.linearRegressionLine(line)), 10);
    }
  });

  it('uses only complete pairs and returns undefined for fewer than 3 or a constant x', () => {
    expect(linearFit([1, 2, NaN, 3, 4], [2, 4, 0, 6, null])!.n).toBe(3);
    expect(linearFit([1, 2], [3, 4])).toBeUndefined();
    expect(linearFit([2, 2, 2, 2], [1, 2, 3, 4])).toBeUndefined();
    expect(() => linearFit([1, 2, 3], [1, 2])).toThrow(/same length/);
  });

  it('fits an exact line exactly', () => {
    const fit = linearFit([0, 1, 2, 3], [1, 3, 5, 7])!;
    expect(fit.slope).toBeCloseTo(2, 14);
    expect(fit.intercept).toBeCloseTo(1, 14);
    expect(fit.residualSd).toBeLessThan(1e-14);
    expect(fit.rSquared).toBeCloseTo(1, 14);
  });
});

describe('leastSquares', () => {
  it('matches the normal equations on well-conditioned random multiple regressions', () => {
    const random = seeded(21);
    for (let trial = 0; trial < 10; trial++) {
      const n = 20 + Math.floor(random() * 200);
      const p = 1 + Math.floor(random() * 4);
      const columns = Array.from({ length: p }, () => Array.from({ length: n }, () => random() * 4 - 2));
      const y = Array.from({ length: n }, (_, r) => 1.5 + columns.reduce((s, c, j) => s + (j + 1) * c[r], 0) + random());
      const fit = leastSquares(columns, y)!;
      const oracle = normalEquations(columns, y);
      fit.coefficients.forEach((b, j) => expect(b).toBeCloseTo(oracle.b[j], 10));
      fit.standardErrors.forEach((se, j) => expect(se).toBeCloseTo(oracle.se[j], 10));
      expect(fit.dof).toBe(n - p - 1);
    }
  });

  it('gives the textbook standard errors for a straight line', () => {
    // By hand (same data as above): s² = 0.8, Sxx = 10, x̄ = 3, n = 5:
    // se(slope) = √(s²/Sxx) = √0.08, se(intercept) = √(s²(1/n + x̄²/Sxx)) = √0.88.
    const fit = leastSquares([[1, 2, 3, 4, 5]], [2, 4, 5, 4, 5])!;
    expect(fit.standardErrors[1]).toBeCloseTo(Math.sqrt(0.08), 14);
    expect(fit.standardErrors[0]).toBeCloseTo(Math.sqrt(0.88), 14);
  });

  it('fits through the origin without an intercept, with R² about zero', () => {
    // By hand: b = Σxy/Σx² = 33/14; RSS = Σy² - b·Σxy = 78 - 33²/14 = 3/14; TSS about 0 = Σy² = 78.
    const fit = leastSquares([[1, 2, 3]], [2, 5, 7], { intercept: false })!;
    expect(fit.coefficients).toHaveLength(1);
    expect(fit.coefficients[0]).toBeCloseTo(33 / 14, 14);
    expect(fit.residualSd).toBeCloseTo(Math.sqrt(3 / 14 / 2), 14);
    expect(fit.rSquared).toBeCloseTo(1 - 3 / 14 / 78, 14);
    // se(b) = √(s² / Σx²) with s² = RSS/2.
    expect(fit.standardErrors[0]).toBeCloseTo(Math.sqrt(3 / 14 / 2 / 14), 14);
  });

  it('returns undefined for linearly dependent columns or too few rows', () => {
    const x1 = [1, 2, 3, 4, 5, 6];
    expect(leastSquares([x1, x1.map((v) => 2 * v)], [1, 3, 2, 5, 4, 6])).toBeUndefined();
    expect(leastSquares([x1, x1.map((v) => v + 1)], [1, 3, 2, 5, 4, 6], { intercept: false })).toBeDefined();
    expect(leastSquares([[1, 2, 3], [3, 1, 2]], [1, 2, 3])).toBeUndefined();
  });

  it('throws a sentence for mismatched lengths or nothing to fit', () => {
    expect(() => leastSquares([[1, 2, 3]], [1, 2])).toThrow(/same length/);
    expect(() => leastSquares([], [1, 2, 3], { intercept: false })).toThrow(/at least one/);
  });
});

describe('polynomialFit', () => {
  it('recovers an exact quadratic', () => {
    const x = [-2, -1, 0, 1, 2, 3, 4];
    const fit = polynomialFit(x, x.map((v) => 1 - 2 * v + 0.5 * v * v), 2)!;
    [1, -2, 0.5].forEach((b, j) => expect(fit.coefficients[j]).toBeCloseTo(b, 13));
    expect(fit.residualSd).toBeLessThan(1e-13);
  });

  it('fits the mean with degree 0, with standard error s/√n', () => {
    const y = [3, 5, 4, 8, 10];
    const fit = polynomialFit([0, 0, 0, 0, 0], y, 0)!;
    expect(fit.coefficients[0]).toBe(mean(y));
    expect(fit.standardErrors[0]).toBeCloseTo(standardDeviation(y)! / Math.sqrt(5), 14);
  });

  it('needs more distinct x than coefficients and a whole-number degree', () => {
    expect(polynomialFit([1, 1, 2, 2, 2], [1, 2, 3, 4, 5], 2)).toBeUndefined();
    expect(() => polynomialFit([1, 2, 3], [1, 2, 3], 1.5)).toThrow(/whole-number degree/);
    expect(() => polynomialFit([1, 2, 3], [1, 2, 3], -1)).toThrow(/whole-number degree/);
  });
});
