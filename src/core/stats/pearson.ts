// Pearson product-moment correlation of complete pairs.
import { isFiniteNumber, type NumericInput } from './finite';

/**
 * Pearson's product-moment correlation r = Sxy / √(Sxx Syy) over the pairs where both x[i] and
 * y[i] are finite (K. Pearson, "Mathematical contributions to the theory of evolution. III.
 * Regression, heredity, and panmixia", Phil. Trans. R. Soc. A 187, 1896, 253–318).
 *
 * Method: two passes with centred sums and the Chan–Golub–LeVeque (1983) correction of each
 * sum for the rounding left in the means, so a large common offset costs no digits.
 *
 * O(n) time (two passes), no allocation.
 *
 * @throws RangeError when x and y differ in length.
 * @returns undefined when fewer than 3 complete pairs remain; NaN when x or y is constant over
 *   the complete pairs (correlation undefined); otherwise a value clamped to [-1, 1].
 * @example pearson([1, 2, 3, 4], [2, 4, 5, 9]) // => 11 / √130 = 0.9647638212377322
 */
export function pearson(x: NumericInput, y: NumericInput): number | undefined {
  requireSameLength(x, y, 'pearson');
  let n = 0;
  let sumX = 0;
  let sumY = 0;
  for (let i = 0; i < x.length; i++) {
    const a = x[i];
    const b = y[i];
    if (!isFiniteNumber(a) || !isFiniteNumber(b)) continue;
    n++;
    sumX += a;
    sumY += b;
  }
  if (n < 3) return undefined;
  const meanX = sumX / n;
  const meanY = sumY / n;
  let dx = 0;
  let dy = 0;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < x.length; i++) {
    const a = x[i];
    const b = y[i];
    if (!isFiniteNumber(a) || !isFiniteNumber(b)) continue;
    const u = a - meanX;
    const v = b - meanY;
    dx += u;
    dy += v;
    sxx += u * u;
    syy += v * v;
    sxy += u * v;
  }
  sxx -= (dx * dx) / n;
  syy -= (dy * dy) / n;
  sxy -= (dx * dy) / n;
  if (!(sxx > 0) || !(syy > 0)) return NaN;
  const r = sxy / Math.sqrt(sxx) / Math.sqrt(syy);
  return Math.max(-1, Math.min(1, r));
}

/** Shared by the two-sample functions: paired inputs must line up element for element. */
export function requireSameLength(x: ArrayLike<unknown>, y: ArrayLike<unknown>, caller: string): void {
  if (x.length !== y.length) {
    throw new RangeError(`${caller} requires x and y of the same length, but got ${x.length} and ${y.length}.`);
  }
}
