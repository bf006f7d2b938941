// Spearman's rank correlation of complete pairs.
import { isFiniteNumber, type NumericInput } from './finite';
import { pearson, requireSameLength } from './pearson';
import { midranksOfFinite } from './ranks';

/**
 * Spearman's rank correlation ρ: Pearson's r of the average ranks of x and y, taken over the
 * pairs where both values are finite (C. Spearman, "The proof and measurement of association
 * between two things", American Journal of Psychology 15(1), 1904, 72–101). Average ranks make
 * it exact with ties, unlike the 1 - 6Σd²/(n(n²-1)) shortcut.
 *
 * O(n) radix ordering per variable; copies of the complete pairs and their ranks.
 *
 * @throws RangeError when x and y differ in length.
 * @returns undefined when fewer than 3 complete pairs remain; NaN when x or y is constant.
 * @example spearman([1, 2, 3, 4], [1, 4, 9, 16]) // => 1
 */
export function spearman(x: NumericInput, y: NumericInput): number | undefined {
  requireSameLength(x, y, 'spearman');
  let n = 0;
  for (let i = 0; i < x.length; i++) if (isFiniteNumber(x[i]) && isFiniteNumber(y[i])) n++;
  if (n < 3) return undefined;
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < x.length; i++) {
    const a = x[i];
    const b = y[i];
    if (isFiniteNumber(a) && isFiniteNumber(b)) {
      xs[k] = a;
      ys[k] = b;
      k++;
    }
  }
  return pearson(midranksOfFinite(xs).ranks, midranksOfFinite(ys).ranks);
}
