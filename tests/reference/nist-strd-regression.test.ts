// NIST StRD linear least squares: certified coefficients, their standard deviations, residual SD, R².
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { leastSquares, linearFit, polynomialFit, type LeastSquaresFit } from '../../src/core/stats';
import { HAS_REFERENCE, REFERENCE_DIR } from '../support/paths';

const referenceDir = REFERENCE_DIR;
const available = HAS_REFERENCE;
if (!available) console.warn(`NIST StRD tests skipped: reference folder ${referenceDir} not found.`);

/** Log relative error (McCullough 1998): the number of correct significant digits, capped at 16. */
function lre(estimate: number, certified: number): number {
  if (estimate === certified) return 16;
  return Math.min(16, -Math.log10(Math.abs(estimate - certified) / Math.abs(certified)));
}

interface RegressionDataset {
  estimates: number[];
  standardDeviations: number[];
  residualSd: number;
  rSquared: number;
  /** Data rows: y first, then the predictors (file order). */
  rows: number[][];
}

/**
 * Header lines "#  B0  <estimate>  <sd of estimate>", "#  Standard Deviation  <residual sd>",
 * "#  R-Squared  <r²>" (Fortran E notation); data lines "y x1 x2 …".
 */
function readDataset(name: string): RegressionDataset {
  const lines = readFileSync(path.join(referenceDir, `nist-strd-${name}.txt`), 'utf8').split(/\r?\n/);
  const estimates: number[] = [];
  const standardDeviations: number[] = [];
  for (const line of lines) {
    const m = /^#\s+B(\d+)\s+(\S+)\s+(\S+)\s*$/.exec(line);
    if (m) {
      estimates[Number(m[1])] = Number(m[2]);
      standardDeviations[Number(m[1])] = Number(m[3]);
    }
  }
  const single = (pattern: RegExp) => {
    const line = lines.find((l) => pattern.test(l));
    if (!line) throw new Error(`nist-strd-${name}.txt lacks ${pattern}`);
    return Number(pattern.exec(line)![1]);
  };
  const rows = lines.filter((l) => l.trim() !== '' && !l.startsWith('#')).map((l) => l.trim().split(/\s+/).map(Number));
  return {
    estimates,
    standardDeviations,
    residualSd: single(/^#\s+Standard Deviation\s+(\S+)\s*$/),
    rSquared: single(/^#\s+R-Squared\s+(\S+)\s*$/),
    rows,
  };
}

const report: string[] = [];

function checkAgainstCertified(name: string, fit: LeastSquaresFit, data: RegressionDataset, minimumDigits: number): void {
  expect(fit.coefficients).toHaveLength(data.estimates.length);
  // Source: NIST StRD certified regression statistics (file header), for every quantity.
  const coefficientDigits = fit.coefficients.map((b, j) => lre(b, data.estimates[j]));
  const errorDigits = fit.standardErrors.map((se, j) => lre(se, data.standardDeviations[j]));
  const residualDigits = lre(fit.residualSd, data.residualSd);
  const rSquaredDigits = lre(fit.rSquared, data.rSquared);
  for (const d of [...coefficientDigits, ...errorDigits, residualDigits, rSquaredDigits]) {
    expect(d).toBeGreaterThanOrEqual(minimumDigits);
  }
  const fmt = (ds: number[]) => ds.map((d) => d.toFixed(1)).join(' ');
  report.push(
    `  ${name.padEnd(8)} B ${fmt(coefficientDigits)} | sd(B) ${fmt(errorDigits)} | residual sd ${residualDigits.toFixed(1)} | R² ${rSquaredDigits.toFixed(1)}`,
  );
}

describe.skipIf(!available)('NIST StRD linear least squares (certified values in ../shared/reference)', () => {
  afterAll(() => console.info(`NIST StRD regression LRE (digits):\n${report.join('\n')}`));

  it('Norris (straight line): every certified statistic to at least 11 significant digits', () => {
    const data = readDataset('Norris');
    const x = data.rows.map((r) => r[1]);
    const y = data.rows.map((r) => r[0]);
    expect(data.rows).toHaveLength(36);
    const fit = leastSquares([x], y)!;
    checkAgainstCertified('Norris', fit, data, 11);
    const line = linearFit(x, y)!;
    expect(lre(line.slope, data.estimates[1])).toBeGreaterThanOrEqual(11);
    expect(lre(line.intercept, data.estimates[0])).toBeGreaterThanOrEqual(11);
  });

  it('Pontius (quadratic in x): every certified statistic to at least 11 significant digits', () => {
    const data = readDataset('Pontius');
    expect(data.rows).toHaveLength(40);
    const fit = polynomialFit(data.rows.map((r) => r[1]), data.rows.map((r) => r[0]), 2)!;
    checkAgainstCertified('Pontius', fit, data, 11);
  });

  it('Longley (six collinear predictors): every certified statistic to at least 12 significant digits', () => {
    const data = readDataset('Longley');
    expect(data.rows).toHaveLength(16);
    const columns = [1, 2, 3, 4, 5, 6].map((j) => data.rows.map((r) => r[j]));
    const fit = leastSquares(columns, data.rows.map((r) => r[0]))!;
    expect(fit.dof).toBe(9);
    checkAgainstCertified('Longley', fit, data, 12);
  });
});
