// The family's one missing-data rule, in one place: a value counts only when Number.isFinite(v).

/**
 * Input accepted by every statistic in src/core/stats: any array-like of numbers (Float64Array
 * columns mostly). null and undefined entries are allowed and, like NaN and ±Infinity, skipped.
 */
export type NumericInput = ArrayLike<number | null | undefined>;

/** True when `value` counts as data: a finite number (not NaN, ±Infinity, null or undefined). */
export function isFiniteNumber(value: unknown): value is number {
  return Number.isFinite(value);
}

/**
 * Number of values that count as data (finite numbers).
 *
 * O(n) time, no allocation.
 *
 * @example countFinite([1, NaN, 3, Infinity, null]) // => 2
 */
export function countFinite(values: NumericInput): number {
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    if (isFiniteNumber(values[i])) count++;
  }
  return count;
}

/**
 * A new Float64Array holding the finite values of `values`, in their original order. The input is
 * never modified, so selection algorithms can reorder the copy freely.
 *
 * O(n) time; one allocation of exactly countFinite(values) doubles.
 *
 * @example finiteValues([3, NaN, 1]) // => Float64Array [3, 1]
 */
export function finiteValues(values: NumericInput): Float64Array {
  const out = new Float64Array(countFinite(values));
  let k = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (isFiniteNumber(v)) out[k++] = v;
  }
  return out;
}

/**
 * The complete pairs of two paired inputs: the rows where both values count, in their original
 * order (the paired-data side of the missing-data rule). The caller checks the lengths match.
 *
 * O(n) time.
 */
export function completePairs(x: NumericInput, y: NumericInput): { xs: number[]; ys: number[] } {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < x.length; i++) {
    const a = x[i];
    const b = y[i];
    if (isFiniteNumber(a) && isFiniteNumber(b)) { xs.push(a); ys.push(b); }
  }
  return { xs, ys };
}
