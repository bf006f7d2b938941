// Arithmetic mean that stays accurate when the values share a large common offset (NIST NumAcc4).
import { isFiniteNumber, type NumericInput } from './finite';

/**
 * Sum of the finite values by Neumaier's improved Kahan–Babuška summation (A. Neumaier,
 * "Rundungsfehleranalyse einiger Verfahren zur Summation endlicher Summen", ZAMM 54, 1974,
 * 39–51). The running compensation captures the low-order bits every addition loses, so the
 * error does not grow with n, and unlike Kahan's original it survives terms larger than the sum.
 *
 * O(n) time, no allocation. Returns 0 for no finite values.
 */
export function compensatedSum(values: NumericInput): number {
  let sum = 0;
  let compensation = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!isFiniteNumber(v)) continue;
    const t = sum + v;
    compensation += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  return sum + compensation;
}

/**
 * Arithmetic mean of the finite values.
 *
 * Method: compensated (Neumaier) sum divided by n, then one corrective pass that adds the mean
 * of the residuals x_i - m (the "two-pass mean with correction"; see N. J. Higham, Accuracy and
 * Stability of Numerical Algorithms, 2nd ed., SIAM 2002, ch. 4). Reproduces the NIST StRD
 * NumAcc1-4 certified means to the last digit a double can hold. Should the plain sum overflow
 * (values near ±1.8e308), an incremental mean, which cannot overflow, is used instead.
 *
 * O(n) time (two passes), no allocation.
 *
 * @returns undefined when fewer than 1 finite value remains.
 * @example mean([1, 2, NaN, 3]) // => 2
 */
export function mean(values: NumericInput): number | undefined {
  let n = 0;
  let sum = 0;
  let compensation = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!isFiniteNumber(v)) continue;
    n++;
    const t = sum + v;
    compensation += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  if (n === 0) return undefined;
  let m = (sum + compensation) / n;
  if (!Number.isFinite(m)) m = incrementalMean(values);
  // The residuals are small, so their (plain) sum is accurate and removes the division's error.
  let residual = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (isFiniteNumber(v)) residual += v - m;
  }
  const corrected = m + residual / n;
  return Number.isFinite(corrected) ? corrected : m;
}

/** m_k = m_{k-1} + (x_k - m_{k-1}) / k: slower to converge in digits but never overflows. */
function incrementalMean(values: NumericInput): number {
  let m = 0;
  let k = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!isFiniteNumber(v)) continue;
    k++;
    m += v / k - m / k;
  }
  return m;
}
