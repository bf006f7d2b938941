// Sample variance and standard deviation (denominator n - 1).
import { isFiniteNumber, type NumericInput } from './finite';
import { mean } from './mean';

/**
 * Sample variance s² = Σ(x - x̄)² / (n - 1) of the finite values.
 *
 * Method: the corrected two-pass algorithm of T. F. Chan, G. H. Golub and R. J. LeVeque,
 * "Algorithms for computing the sample variance: analysis and recommendations", The American
 * Statistician 37(3), 1983, 242–247: S = Σ(x - m)² - (Σ(x - m))² / n. The second term cancels
 * the first-order effect of any error left in the mean m (here already a compensated mean).
 *
 * O(n) time (three passes: two for the mean, one for the deviations), no allocation.
 *
 * @returns undefined when fewer than 2 finite values remain.
 * @example variance([1, 2, 3, 4]) // => 1.6666666666666667
 */
export function variance(values: NumericInput): number | undefined {
  const m = mean(values);
  if (m === undefined) return undefined;
  let n = 0;
  let sumDeviation = 0;
  let sumSquares = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!isFiniteNumber(v)) continue;
    const d = v - m;
    n++;
    sumDeviation += d;
    sumSquares += d * d;
  }
  if (n < 2) return undefined;
  const s = sumSquares - (sumDeviation * sumDeviation) / n;
  return Math.max(s, 0) / (n - 1);
}

/**
 * Sample standard deviation s = √variance (denominator n - 1), same method as `variance`.
 *
 * O(n) time, no allocation.
 *
 * @returns undefined when fewer than 2 finite values remain.
 * @example standardDeviation([2, 4, 4, 4, 5, 5, 7, 9]) // => 2.138089935299395
 */
export function standardDeviation(values: NumericInput): number | undefined {
  const v = variance(values);
  return v === undefined ? undefined : Math.sqrt(v);
}
