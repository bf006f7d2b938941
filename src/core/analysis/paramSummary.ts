// Statistics of one parameter over a set of dies: on magnitudes (amperes) for currents, plus the
// same on log10, and on the value itself otherwise.

import type { ParamInfo } from '../frame';
import { isCurrentUnit } from '../params';
import { summarize } from '../stats';
import { log10Magnitudes, magnitudes } from './scales';
import type { ParamSummary } from './types';

export function paramSummary(values: Float64Array, param: ParamInfo): ParamSummary | undefined {
  const base = summarize(magnitudes(values, param.unit));
  if (!base) return undefined;
  const out: ParamSummary = { unit: param.unit, ...base };
  if (isCurrentUnit(param.unit)) {
    const logs = summarize(log10Magnitudes(values));
    if (logs) out.log10 = logs;
  }
  return out;
}
