// Maps one parameter's die values to ramp colours. Currents (unit "A") are shown as log10 of
// their magnitude, because leakage spreads over decades; other units linearly. The range is the
// 2nd to 98th percentile of the wafer's values, so a few extreme dies do not wash out the rest;
// dies beyond it take the end colours.

import { isCurrentUnit } from '../../core/params';
import { selectQuantilesInPlace } from '../../core/stats';
import { RAMP_STEPS } from './colorRamp';

export interface ColourScale {
  /** True when the colours follow log10 |value|. */
  log: boolean;
  /** Range ends in the transformed space (log10 amperes for currents). */
  low: number;
  high: number;
  unit: string;
  /** Dies with a usable value. */
  valid: number;
}

export const RANGE_LOW_PERCENTILE = 0.02;
export const RANGE_HIGH_PERCENTILE = 0.98;

/** The value the colours follow: log10 |v| for currents (NaN for 0), v otherwise. */
export function transformValue(value: number, log: boolean): number {
  if (!Number.isFinite(value)) return NaN;
  if (!log) return value;
  const magnitude = Math.abs(value);
  return magnitude > 0 ? Math.log10(magnitude) : NaN;
}

/** Back from the transformed space to a magnitude in base units (for legend labels). */
export function untransformValue(value: number, log: boolean): number {
  return log ? 10 ** value : value;
}

/** 'auto' = log for currents, linear otherwise; the map's log/linear switch forces one. */
export type ScaleMode = 'auto' | 'log' | 'linear';

export function colourScaleFor(values: Float64Array, unit: string, mode: ScaleMode = 'auto'): ColourScale {
  const log = mode === 'auto' ? isCurrentUnit(unit) : mode === 'log';
  const usable = new Float64Array(values.length);
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    const t = transformValue(values[i], log);
    if (t === t) usable[count++] = t;
  }
  // Selection instead of a full sort: the two type-7 percentiles are all the scale needs.
  const [q2, q98] = count > 0 ? selectQuantilesInPlace(usable.subarray(0, count), [RANGE_LOW_PERCENTILE, RANGE_HIGH_PERCENTILE]) : [NaN, NaN];
  let low = q2;
  let high = q98;
  if (count > 0 && !(high > low)) {
    // All values (nearly) equal: open the range a little so the ramp's middle is used.
    const pad = log ? 0.05 : Math.abs(low) * 0.01 || 1e-12;
    low -= pad;
    high += pad;
  }
  return { log, low, high, unit, valid: count };
}

/** Ramp step (0 .. RAMP_STEPS-1) of a raw value, or -1 when the value is missing. */
export function rampStepOf(value: number, scale: ColourScale): number {
  const t = transformValue(value, scale.log);
  if (t !== t) return -1;
  const f = (t - scale.low) / (scale.high - scale.low);
  const clamped = f < 0 ? 0 : f > 1 ? 1 : f;
  return Math.round(clamped * (RAMP_STEPS - 1));
}
