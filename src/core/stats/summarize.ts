// One-pass-style summary of a column: location, spread and robust spread from a single copy.
import { isFiniteNumber, type NumericInput } from './finite';
import { mean } from './mean';
import { selectQuantilesInPlace } from './quantile';
import { IQR_PER_SIGMA } from './robustSigma';
import { variance } from './variance';

/** Location and spread of the finite values of one column. */
export interface SummaryStatistics {
  n: number;
  mean: number;
  /** Sample standard deviation (n - 1); NaN when n < 2. */
  sigma: number;
  median: number;
  /** Hyndman & Fan type 7 quartiles. */
  q1: number;
  q3: number;
  /** (Q3 - Q1) / 1.349, as `iqrSigma` (0 when n = 1). */
  robustSigma: number;
  min: number;
  max: number;
}

/**
 * Count, mean, sample standard deviation, type 7 quartiles and median, IQR-based robust sigma,
 * minimum and maximum of the finite values, computed together.
 *
 * Method: one Float64Array copy of the finite values (min and max taken while copying); mean
 * and sigma as `mean` (compensated, corrected) and `variance` (Chan, Golub & LeVeque 1983) on
 * that copy; then one Floyd–Rivest multi-selection places the order statistics that Q1, the
 * median and Q3 need (Hyndman & Fan 1996, type 7).
 *
 * Expected O(n) time; one copy of the finite values.
 *
 * @returns undefined when fewer than 1 finite value remains.
 */
export function summarize(values: NumericInput): SummaryStatistics | undefined {
  let n = 0;
  for (let i = 0; i < values.length; i++) if (isFiniteNumber(values[i])) n++;
  if (n === 0) return undefined;
  const copy = new Float64Array(n);
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0, k = 0; i < values.length; i++) {
    const v = values[i];
    if (!isFiniteNumber(v)) continue;
    copy[k++] = v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  // Mean and variance first: they read the copy in its original order, selection reorders it.
  const average = mean(copy) as number;
  const sigma = n < 2 ? NaN : Math.sqrt(variance(copy) as number);
  const [q1, median, q3] = selectQuantilesInPlace(copy, [0.25, 0.5, 0.75]);
  return { n, mean: average, sigma, median, q1, q3, robustSigma: (q3 - q1) / IQR_PER_SIGMA, min, max };
}
