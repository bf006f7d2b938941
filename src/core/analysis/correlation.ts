// Ion-Ioff correlation of a set of dies: Pearson of |Ion| on log10|Ioff|, Spearman of the
// magnitudes, and the least-squares line through (log10|Ioff|, |Ion|).

import type { WaferFrame } from '../frame';
import { tradeoffPairs } from '../params';
import { linearFit, pearson, spearman } from '../stats';
import { log10Magnitudes, magnitudes } from './scales';
import type { Correlation } from './types';

export function tradeoffCorrelations(frame: Pick<WaferFrame, 'params' | 'values'>): Correlation[] {
  const out: Correlation[] = [];
  for (const pair of tradeoffPairs(frame.params.map((p) => p.name))) {
    const ion = magnitudes(frame.values[pair.ion], 'A');
    const ioffLog = log10Magnitudes(frame.values[pair.ioff]);
    const r = pearson(ioffLog, ion);
    const rho = spearman(ioffLog, ion);
    const fit = linearFit(ioffLog, ion);
    if (r === undefined || rho === undefined || fit === undefined) continue;
    out.push({ device: pair.device, ion: pair.ion, ioff: pair.ioff, n: fit.n, pearson: r, spearman: rho, slope: fit.slope, intercept: fit.intercept });
  }
  return out;
}
