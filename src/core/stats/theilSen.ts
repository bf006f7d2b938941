// Median of pairwise slopes: the classic robust line, 29 % breakdown.
import { requireSameLength } from './pearson';
import { completePairs, type NumericInput } from './finite';
import { selectQuantilesInPlace } from './quantile';
import type { RobustLine } from './repeatedMedianLine';

/**
 * Theil-Sen line (H. Theil, "A rank-invariant method of linear and polynomial regression
 * analysis", Indagationes Mathematicae 12, 1950; P. K. Sen, "Estimates of the regression
 * coefficient based on Kendall's tau", JASA 63(324), 1968, 1379-1389): slope = median of
 * (y_j - y_i)/(x_j - x_i) over all pairs i < j with x_i != x_j; intercept = median of
 * y_i - slope x_i. Medians are Hyndman & Fan type 7 (average of the middle two).
 *
 * O(n^2) time and memory for the pairwise slopes: for samples of a few hundred points.
 *
 * @returns undefined when fewer than 2 complete pairs remain or every x is equal.
 */
export function theilSenLine(x: NumericInput, y: NumericInput): RobustLine | undefined {
  requireSameLength(x, y, 'theilSenLine');
  const { xs, ys } = completePairs(x, y);
  const n = xs.length;
  if (n < 2) return undefined;
  const slopes = new Float64Array((n * (n - 1)) / 2);
  let k = 0;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const dx = xs[j] - xs[i];
      if (dx !== 0) slopes[k++] = (ys[j] - ys[i]) / dx;
    }
  }
  if (k === 0) return undefined;
  const slope = selectQuantilesInPlace(slopes.subarray(0, k), [0.5])[0];
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) residual[i] = ys[i] - slope * xs[i];
  const intercept = selectQuantilesInPlace(residual, [0.5])[0];
  return { slope, intercept, n };
}
