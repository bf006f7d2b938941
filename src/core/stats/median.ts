// Median: the middle of the finite values, by selection.
import { finiteValues, type NumericInput } from './finite';
import { selectQuantilesInPlace } from './quantile';

/**
 * Median of the finite values: the middle order statistic for odd n, the average of the two
 * middle ones for even n, which is the Hyndman & Fan (1996) type 7 quantile at p = 1/2.
 *
 * Method: Floyd–Rivest selection on one Float64Array copy (no full sort).
 *
 * Expected O(n) time; one copy of the finite values.
 *
 * @returns undefined when fewer than 1 finite value remains.
 * @example median([3, 1, NaN, 4, 2]) // => 2.5
 */
export function median(values: NumericInput): number | undefined {
  const copy = finiteValues(values);
  if (copy.length === 0) return undefined;
  return selectQuantilesInPlace(copy, [0.5])[0];
}
