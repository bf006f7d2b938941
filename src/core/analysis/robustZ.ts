// First outlier method: robust z per wafer and parameter, z = (v - median) / robust sigma with
// robust sigma = (Q3 - Q1)/1.349, on log10|I| for currents and on the value otherwise. A die
// beyond |z| > limit is flagged with the parameter, its z and the direction.

import type { WaferFrame } from '../frame';
import { quantiles } from '../stats';
import { analysisScale } from './scales';
import type { Reason } from './types';

export function robustZReasons(frame: Pick<WaferFrame, 'params' | 'values'>, limit: number): Map<number, Reason[]> {
  const out = new Map<number, Reason[]>();
  for (const param of frame.params) {
    const raw = frame.values[param.name];
    const { values, scale } = analysisScale(raw, param);
    const q = quantiles(values, [0.25, 0.5, 0.75]);
    if (!q) continue;
    const [q1, med, q3] = q;
    const sigma = (q3 - q1) / 1.349;
    if (!(sigma > 0)) continue;
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (!Number.isFinite(v)) continue;
      const z = (v - med) / sigma;
      if (Math.abs(z) > limit) {
        const reason: Reason = { method: 'robust-z', param: param.name, value: raw[i], score: z, limit, direction: z > 0 ? 'high' : 'low', scale };
        const list = out.get(i);
        if (list) list.push(reason); else out.set(i, [reason]);
      }
    }
  }
  return out;
}
