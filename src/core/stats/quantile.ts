// Sample quantiles by linear interpolation between order statistics (Hyndman & Fan type 7).
import { finiteValues, type NumericInput } from './finite';
import { selectInPlace, selectManyInPlace } from './select';

/**
 * Quantile of already sorted values, Hyndman & Fan type 7: with h = (n - 1) p and j = ⌊h⌋,
 * Q(p) = x₍ⱼ₎ + (h - j)(x₍ⱼ₊₁₎ - x₍ⱼ₎) on 0-based order statistics (R. J. Hyndman and Y. Fan,
 * "Sample quantiles in statistical packages", The American Statistician 50(4), 1996, 361–365;
 * the default of R's quantile() and NumPy's percentile()).
 *
 * `sorted` must be ascending and hold only finite values (for example a sorted `finiteValues`
 * copy); it is not checked, so that repeated calls stay O(1).
 *
 * O(1) time.
 *
 * @throws RangeError when p is not a number between 0 and 1.
 * @returns undefined when `sorted` is empty (minimum 1 value).
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number | undefined {
  requireProbability(p, 'quantileSorted');
  if (sorted.length === 0) return undefined;
  return interpolateType7(sorted, sorted.length, p);
}

/**
 * Hyndman & Fan type 7 quantile of the finite values (see `quantileSorted` for the definition).
 *
 * Method: Floyd–Rivest selection on one Float64Array copy, not a full sort; the upper
 * neighbour needed for interpolation is the minimum of the part right of the selected element.
 *
 * Expected O(n) time; one copy of the finite values.
 *
 * @throws RangeError when p is not a number between 0 and 1.
 * @returns undefined when fewer than 1 finite value remains.
 * @example quantile([1, 2, 3, 4], 0.25) // => 1.75
 */
export function quantile(values: NumericInput, p: number): number | undefined {
  requireProbability(p, 'quantile');
  const copy = finiteValues(values);
  const n = copy.length;
  if (n === 0) return undefined;
  const h = (n - 1) * p;
  const j = Math.floor(h);
  selectInPlace(copy, j);
  const lower = copy[j];
  const fraction = h - j;
  if (fraction === 0) return lower;
  let upper = copy[j + 1];
  for (let i = j + 2; i < n; i++) if (copy[i] < upper) upper = copy[i];
  return lower + fraction * (upper - lower);
}

/**
 * Several Hyndman & Fan type 7 quantiles of the finite values from one copy: every order
 * statistic the probabilities need is placed by one multi-selection, O(n log k) expected.
 *
 * @param ps probabilities, any order; the result follows the same order.
 * @throws RangeError when any p is not a number between 0 and 1.
 * @returns undefined when fewer than 1 finite value remains.
 * @example quantiles([1, 2, 3, 4, 5], [0.25, 0.5, 0.75]) // => [2, 3, 4]
 */
export function quantiles(values: NumericInput, ps: ArrayLike<number>): number[] | undefined {
  for (let i = 0; i < ps.length; i++) requireProbability(ps[i], 'quantiles');
  const copy = finiteValues(values);
  if (copy.length === 0) return undefined;
  return selectQuantilesInPlace(copy, ps);
}

/**
 * Type 7 quantiles of `copy`, which must be non-empty, hold only finite values, and may be
 * reordered (it is partially sorted on return). The building block of median, robust sigma and
 * summarize, which each make their own single copy. Probabilities are not validated here.
 */
export function selectQuantilesInPlace(copy: Float64Array, ps: ArrayLike<number>): number[] {
  const n = copy.length;
  const positions: number[] = [];
  for (let i = 0; i < ps.length; i++) {
    const h = (n - 1) * ps[i];
    const j = Math.floor(h);
    positions.push(j);
    if (h > j) positions.push(j + 1);
  }
  positions.sort((a, b) => a - b);
  let distinct = 0;
  for (let i = 0; i < positions.length; i++) {
    if (i === 0 || positions[i] !== positions[distinct - 1]) positions[distinct++] = positions[i];
  }
  positions.length = distinct;
  selectManyInPlace(copy, positions);
  const out: number[] = [];
  for (let i = 0; i < ps.length; i++) out.push(interpolateType7(copy, n, ps[i]));
  return out;
}

function interpolateType7(ordered: ArrayLike<number>, n: number, p: number): number {
  const h = (n - 1) * p;
  const j = Math.floor(h);
  const lower = ordered[j];
  const fraction = h - j;
  if (fraction === 0) return lower;
  return lower + fraction * (ordered[j + 1] - lower);
}

function requireProbability(p: number, caller: string): void {
  if (!(p >= 0 && p <= 1)) {
    throw new RangeError(`${caller} requires probabilities between 0 and 1 inclusive, but got ${p}.`);
  }
}
