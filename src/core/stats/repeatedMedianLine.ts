// Robust straight line with a 50 % breakdown point: a minority of abnormal points cannot bend it.
import { requireSameLength } from './pearson';
import { completePairs, type NumericInput } from './finite';
import { selectQuantilesInPlace } from './quantile';

export interface RobustLine {
  slope: number;
  intercept: number;
  /** Complete (x, y) pairs used. */
  n: number;
}

/**
 * Repeated-median line (A. F. Siegel, "Robust regression using repeated medians", Biometrika
 * 69(1), 1982, 242-244): slope = med_i med_{j != i} (y_j - y_i)/(x_j - x_i), pairs with equal x
 * left out; intercept = med_i (y_i - slope x_i) (the simple intercept most implementations use,
 * not Siegel's nested one). Medians are Hyndman & Fan type 7 (average of the middle two).
 * Breakdown point 50 %: up to half the points may be arbitrary without carrying the line away.
 *
 * O(n^2) time and O(n) scratch: meant for samples of a few hundred points (callers subsample).
 *
 * @returns undefined when fewer than 3 complete pairs remain or every x is equal.
 */
export function repeatedMedianLine(x: NumericInput, y: NumericInput): RobustLine | undefined {
  requireSameLength(x, y, 'repeatedMedianLine');
  const { xs, ys } = completePairs(x, y);
  const n = xs.length;
  if (n < 3) return undefined;
  const inner = new Float64Array(n);
  const outer = new Float64Array(n);
  let rows = 0;
  for (let i = 0; i < n; i++) {
    let k = 0;
    for (let j = 0; j < n; j++) {
      const dx = xs[j] - xs[i];
      if (j !== i && dx !== 0) inner[k++] = (ys[j] - ys[i]) / dx;
    }
    if (k > 0) outer[rows++] = selectQuantilesInPlace(inner.subarray(0, k), [0.5])[0];
  }
  if (rows === 0) return undefined;
  const slope = selectQuantilesInPlace(outer.subarray(0, rows), [0.5])[0];
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) residual[i] = ys[i] - slope * xs[i];
  const intercept = selectQuantilesInPlace(residual, [0.5])[0];
  return { slope, intercept, n };
}
