// A quicker sorting permutation for measured data: radix passes on the high 32 bits only.
import { ascendingOrder } from './sortOrder';

const LITTLE_ENDIAN = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1;
const RADIX_FROM = 2048;
/** Runs of equal high words longer than this are sorted with the built-in sort, not by insertion. */
const INSERTION_UP_TO = 24;

/**
 * Indices of `values` (no NaN) in ascending order of value, stable, like `ascendingOrder`.
 *
 * Method: least-significant-digit radix sort (D. E. Knuth, The Art of Computer Programming,
 * vol. 3, 2nd ed., 1998, §5.2.5) on only the high 32 bits of each IEEE-754 pattern (sign,
 * exponent and 20 mantissa bits, made order-preserving as in `ascendingOrder`): three passes of
 * 11, 11 and 10 bits instead of six. Entries that share their high word (values within about one
 * part in a million) form runs, which a final pass orders by the full value (insertion sort, or
 * the built-in comparison sort for long runs), keeping index order for ties.
 *
 * O(n) for measured data whose values rarely agree to six digits; never worse than
 * O(n log n) (long runs). O(n) scratch; a caller sorting many columns may pass `scratch` (at
 * least 3n entries, contents ignored) and `into` (n entries) to reuse memory; the result is
 * `into` when given and long enough, else a new array.
 */
export function ascendingOrderByHighWord(values: Float64Array, scratch?: Uint32Array, into?: Uint32Array): Uint32Array {
  const n = values.length;
  if (n < RADIX_FROM) {
    const order = ascendingOrder(values);
    if (!into || into.length < n) return order;
    into.set(order);
    return into.subarray(0, n);
  }
  const words = new Uint32Array(values.buffer, values.byteOffset, 2 * n);
  const hiAt = LITTLE_ENDIAN ? 1 : 0;
  const spare = scratch && scratch.length >= 3 * n ? scratch : new Uint32Array(3 * n);
  let keys = spare.subarray(0, n);
  let nextKeys = spare.subarray(n, 2 * n);
  const counts = new Uint32Array(3 * 2048);
  for (let i = 0; i < n; i++) {
    const h = words[2 * i + hiAt];
    const k = h & 0x80000000 ? ~h >>> 0 : (h | 0x80000000) >>> 0;
    keys[i] = k;
    counts[k & 2047]++;
    counts[2048 + ((k >>> 11) & 2047)]++;
    counts[4096 + (k >>> 22)]++;
  }
  // Each pass that runs swaps the order buffers; start in the one that ends as the result.
  let passes = 0;
  for (let d = 0; d < 3; d++) {
    let uniform = false;
    for (let b = 0; b < 2048; b++) if (counts[d * 2048 + b] === n) { uniform = true; break; }
    if (!uniform) passes++;
  }
  const result = into && into.length >= n ? into.subarray(0, n) : new Uint32Array(n);
  let order = passes % 2 === 0 ? result : spare.subarray(2 * n, 3 * n);
  let nextOrder = passes % 2 === 0 ? spare.subarray(2 * n, 3 * n) : result;
  for (let i = 0; i < n; i++) order[i] = i;
  for (let d = 0; d < 3; d++) {
    const base = d * 2048;
    const shift = 11 * d;
    const mask = d === 2 ? 1023 : 2047;
    let uniform = false;
    let start = 0;
    for (let b = 0; b < 2048; b++) {
      const c = counts[base + b];
      if (c === n) { uniform = true; break; }
      counts[base + b] = start;
      start += c;
    }
    if (uniform) continue;
    for (let i = 0; i < n; i++) {
      const k = keys[i];
      const at = counts[base + ((k >>> shift) & mask)]++;
      nextKeys[at] = k;
      nextOrder[at] = order[i];
    }
    [keys, nextKeys] = [nextKeys, keys];
    [order, nextOrder] = [nextOrder, order];
  }
  // Order each run of equal high words by the full value. Runs of one repeated value are already
  // in index order (the passes are stable); when long mixed runs hold much of the data (values
  // sharing six leading digits), the full 64-bit ordering is quicker.
  let long = 0;
  for (let i = 0; i < n; ) {
    let end = i + 1;
    while (end < n && keys[end] === keys[i]) end++;
    if (end - i > INSERTION_UP_TO && !allEqual(values, order, i, end)) long += end - i;
    i = end;
  }
  if (long > n / 8) return ascendingOrder(values);
  if (order !== result) throw new Error('ascendingOrderByHighWord: pass count mismatch');
  let i = 0;
  while (i < n) {
    let end = i + 1;
    while (end < n && keys[end] === keys[i]) end++;
    if (end - i > 1) {
      if (end - i <= INSERTION_UP_TO) {
        for (let a = i + 1; a < end; a++) {
          const idx = order[a];
          const v = values[idx];
          let b = a;
          while (b > i && (values[order[b - 1]] > v || (values[order[b - 1]] === v && order[b - 1] > idx))) { order[b] = order[b - 1]; b--; }
          order[b] = idx;
        }
      } else if (!allEqual(values, order, i, end)) {
        order.subarray(i, end).sort((a, b) => values[a] - values[b] || a - b);
      }
    }
    i = end;
  }
  return order;
}

function allEqual(values: Float64Array, order: Uint32Array, from: number, to: number): boolean {
  const v = values[order[from]];
  for (let k = from + 1; k < to; k++) if (values[order[k]] !== v) return false;
  return true;
}
