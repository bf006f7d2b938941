// Order statistics without sorting: the engine under quantiles, medians and summaries.

/**
 * Rearranges `array[left..right]` in place so that `array[k]` holds the value it would have if
 * that range were sorted ascending, everything before it is <= it and everything after is >= it.
 *
 * Method: R. W. Floyd and R. L. Rivest, "Algorithm 489: The algorithm SELECT — for finding the
 * ith smallest of n elements", Communications of the ACM 18(3), 1975, p. 173. Large ranges are
 * first narrowed recursively around a sample so the final partition has few elements to move.
 *
 * Expected O(right - left) time, O(log n) stack, no allocation. The array must hold no NaN.
 */
export function selectInPlace(array: Float64Array, k: number, left = 0, right = array.length - 1): void {
  while (right > left) {
    if (right - left > 600) {
      // Sample-based narrowing (the published constants: 600, and a sample of n^(2/3)).
      const n = right - left + 1;
      const i = k - left + 1;
      const z = Math.log(n);
      const s = 0.5 * Math.exp((2 * z) / 3);
      const sd = 0.5 * Math.sqrt((z * s * (n - s)) / n) * (i - n / 2 < 0 ? -1 : 1);
      const newLeft = Math.max(left, Math.floor(k - (i * s) / n + sd));
      const newRight = Math.min(right, Math.floor(k + ((n - i) * s) / n + sd));
      selectInPlace(array, k, newLeft, newRight);
    }
    const pivot = array[k];
    let i = left;
    let j = right;
    swap(array, left, k);
    if (array[right] > pivot) swap(array, left, right);
    while (i < j) {
      swap(array, i, j);
      i++;
      j--;
      while (array[i] < pivot) i++;
      while (array[j] > pivot) j--;
    }
    if (array[left] === pivot) {
      swap(array, left, j);
    } else {
      j++;
      swap(array, j, right);
    }
    if (j <= k) left = j + 1;
    if (k <= j) right = j - 1;
  }
}

/**
 * Places several order statistics at once: afterwards `array[p]` is the value a full sort would
 * put there, for every p in `positions` (ascending, distinct, within the array).
 *
 * Method: select the middle requested position, then recurse into the two sides with their
 * subsets of positions, so k order statistics cost O(n log k) expected instead of O(n k).
 */
export function selectManyInPlace(array: Float64Array, positions: ArrayLike<number>): void {
  selectRange(array, positions, 0, positions.length - 1, 0, array.length - 1);
}

function selectRange(
  array: Float64Array,
  positions: ArrayLike<number>,
  first: number,
  last: number,
  left: number,
  right: number,
): void {
  if (first > last || left > right) return;
  const middle = (first + last) >> 1;
  const k = positions[middle];
  selectInPlace(array, k, left, right);
  selectRange(array, positions, first, middle - 1, left, k - 1);
  selectRange(array, positions, middle + 1, last, k + 1, right);
}

function swap(array: Float64Array, i: number, j: number): void {
  const t = array[i];
  array[i] = array[j];
  array[j] = t;
}
