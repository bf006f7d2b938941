// Normal-consistent robust estimates of sigma: from the interquartile range and from the MAD.
import { finiteValues, type NumericInput } from './finite';
import { selectQuantilesInPlace } from './quantile';

/**
 * IQR of a normal distribution in units of sigma, 2 Φ⁻¹(3/4) = 1.3489795…, rounded as AEC-Q001
 * and most PAT practice do (AEC-Q001 Rev-D itself writes 1.35).
 */
export const IQR_PER_SIGMA = 1.349;

/**
 * Consistency constant b = 1 / Φ⁻¹(3/4) = 1.482602218505602 that makes b·MAD estimate sigma for
 * normal data (P. J. Rousseeuw and C. Croux, "Alternatives to the median absolute deviation",
 * JASA 88(424), 1993, 1273–1283; the default `constant` of R's mad()).
 */
export const MAD_TO_SIGMA = 1.482602218505602;

/**
 * Robust sigma from the interquartile range: (Q3 - Q1) / 1.349 with Hyndman & Fan type 7
 * quartiles, the quartile rule this project uses for AEC-Q001 style robust sigma.
 *
 * Expected O(n) time (selection); one copy of the finite values.
 *
 * @returns undefined when fewer than 2 finite values remain.
 * @example iqrSigma([1, 2, 3, 4, 5]) // => 2 / 1.349
 */
export function iqrSigma(values: NumericInput): number | undefined {
  const copy = finiteValues(values);
  if (copy.length < 2) return undefined;
  const [q1, q3] = selectQuantilesInPlace(copy, [0.25, 0.75]);
  return (q3 - q1) / IQR_PER_SIGMA;
}

/**
 * Median absolute deviation, MAD = median |x - median(x)|, unscaled (F. R. Hampel, "The influence
 * curve and its role in robust estimation", JASA 69(346), 1974, 383–393). Medians are type 7.
 *
 * Expected O(n) time; one copy of the finite values, reused for the deviations.
 *
 * @returns undefined when fewer than 1 finite value remains.
 * @example medianAbsoluteDeviation([1, 1, 2, 2, 4, 6, 9]) // => 1
 */
export function medianAbsoluteDeviation(values: NumericInput): number | undefined {
  const copy = finiteValues(values);
  if (copy.length === 0) return undefined;
  return madOfCopy(copy);
}

/**
 * Robust sigma from the MAD: 1.482602218505602 · MAD, consistent for normal data
 * (see MAD_TO_SIGMA).
 *
 * Expected O(n) time; one copy of the finite values.
 *
 * @returns undefined when fewer than 2 finite values remain.
 */
export function madSigma(values: NumericInput): number | undefined {
  const copy = finiteValues(values);
  if (copy.length < 2) return undefined;
  return MAD_TO_SIGMA * madOfCopy(copy);
}

function madOfCopy(copy: Float64Array): number {
  const center = selectQuantilesInPlace(copy, [0.5])[0];
  for (let i = 0; i < copy.length; i++) copy[i] = Math.abs(copy[i] - center);
  return selectQuantilesInPlace(copy, [0.5])[0];
}
