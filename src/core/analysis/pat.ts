// Part average testing per AEC-Q001 Rev-D ("Guidelines for Part Average Testing", Automotive
// Electronics Council, 2011): robust mean = median, robust sigma = (Q3 - Q1)/1.35, limits =
// robust mean +/- 6 robust sigma; dynamic limits from the passing parts of the wafer or lot,
// static limits from earlier lots; PAT limits never go past the specification limits.
// Currents are judged on log10|I| (leakage is log-normal, DOMAIN.md).

import { lowerBound, robustCentre, upperBound } from './sortedColumn';
import type { PatLimits, PatReason, SpecLimit, StaticReference } from './types';

/** A specification limit moved onto the analysis scale (log10 of the magnitude for currents). */
export function specOnScale(spec: SpecLimit | undefined, scale: 'log10' | 'linear'): { low: number; high: number } {
  const low = spec?.low;
  const high = spec?.high;
  const map = (v: number | undefined, fallback: number) =>
    v === undefined || !Number.isFinite(v) ? fallback : scale === 'log10' ? (v > 0 ? Math.log10(v) : -Infinity) : v;
  return { low: map(low, -Infinity), high: map(high, Infinity) };
}

function clip(centre: number, sigma: number, n: number, limit: number, spec: { low: number; high: number }, scale: 'log10' | 'linear'): PatLimits {
  const low = centre - limit * sigma;
  const high = centre + limit * sigma;
  return {
    scale, centre, robustSigma: sigma, n,
    low: Math.max(low, spec.low), high: Math.min(high, spec.high),
    clippedLow: spec.low > low, clippedHigh: spec.high < high,
  };
}

/**
 * Dynamic PAT limits from ascending analysis-scale values: the robust statistics of the passing
 * parts (those inside the specification limits, a contiguous range of the sorted values).
 * @returns undefined when no part passes or the robust sigma is 0 (no spread to judge by).
 */
export function dynamicPatLimits(scaled: Float64Array, scale: 'log10' | 'linear', limit: number, spec?: SpecLimit): PatLimits | undefined {
  const s = specOnScale(spec, scale);
  const from = Number.isFinite(s.low) ? lowerBound(scaled, s.low) : 0;
  const to = Number.isFinite(s.high) ? upperBound(scaled, s.high) : scaled.length;
  const robust = robustCentre(scaled, from, to);
  if (!robust || !(robust.sigma > 0)) return undefined;
  return clip(robust.centre, robust.sigma, robust.n, limit, s, scale);
}

/** Static PAT limits from an earlier-lots reference. */
export function staticPatLimits(reference: StaticReference, scale: 'log10' | 'linear', limit: number, spec?: SpecLimit): PatLimits | undefined {
  if (!(reference.robustSigma > 0)) return undefined;
  return clip(reference.centre, reference.robustSigma, reference.n, limit, specOnScale(spec, scale), scale);
}

/**
 * Every die outside the limits, found from both ends of the ascending values (O(flagged)).
 * `emit` receives the die index and the reason.
 */
export function flagOutside(
  method: PatReason['method'],
  param: string,
  scaled: Float64Array,
  scaledOrder: Uint32Array,
  raw: Float64Array,
  limits: PatLimits,
  limit: number,
  emit: (die: number, reason: PatReason) => void,
): void {
  const make = (k: number, direction: 'high' | 'low'): PatReason => ({
    method, param, value: raw[scaledOrder[k]], score: (scaled[k] - limits.centre) / limits.robustSigma, limit, direction,
    scale: limits.scale, low: limits.low, high: limits.high, clipped: direction === 'high' ? limits.clippedHigh : limits.clippedLow,
  });
  let k = 0;
  for (; k < scaled.length && scaled[k] < limits.low; k++) emit(scaledOrder[k], make(k, 'low'));
  for (let j = scaled.length - 1; j >= k && scaled[j] > limits.high; j--) emit(scaledOrder[j], make(j, 'high'));
}
