// The scale each parameter is analysed on: currents as log10 of their magnitude (leakage is
// log-normal, and testers report PMOS currents negative), everything else on the value itself.

import type { ParamInfo } from '../frame';
import { isCurrentUnit } from '../params';

/** |v| for currents, v otherwise; NaN stays NaN. */
export function magnitudes(values: Float64Array, unit: string): Float64Array {
  if (!isCurrentUnit(unit)) return values;
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = Math.abs(values[i]);
  return out;
}

/** log10|v| for currents (zero or missing -> NaN, which every statistic skips). */
export function log10Magnitudes(values: Float64Array): Float64Array {
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const a = Math.abs(values[i]);
    out[i] = a > 0 ? Math.log10(a) : NaN;
  }
  return out;
}

/** The values outlier statistics run on for this parameter. */
export function analysisScale(values: Float64Array, param: ParamInfo): { values: Float64Array; scale: 'log10' | 'linear' } {
  return isCurrentUnit(param.unit)
    ? { values: log10Magnitudes(values), scale: 'log10' }
    : { values, scale: 'linear' };
}

/** Picks the entries at the given indices. */
export function pick(values: Float64Array, indices: Int32Array | number[]): Float64Array {
  const out = new Float64Array(indices.length);
  for (let i = 0; i < indices.length; i++) out[i] = values[indices[i]];
  return out;
}
