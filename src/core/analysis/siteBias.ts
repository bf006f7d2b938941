// Probe-site bias on one wafer: each site's dies against the other sites' dies, per parameter.
// Reported only when the difference is both significant (Mann-Whitney p below a floor) and large
// enough to matter (relative median shift above a floor); see README "Probe-site bias rule".

import type { WaferFrame } from '../frame';
import { mannWhitney, median } from '../stats';
import { indicesBySite } from './groupStats';
import { magnitudes, pick } from './scales';
import type { AnalysisSettings, SiteBias } from './types';

export function siteBias(frame: Pick<WaferFrame, 'params' | 'values' | 'site'>, settings: Pick<AnalysisSettings, 'siteBiasMaxP' | 'siteBiasMinShift'>): SiteBias[] {
  const bySite = indicesBySite(frame.site);
  if (bySite.size < 2) return [];
  const out: SiteBias[] = [];
  for (const param of frame.params) {
    const values = magnitudes(frame.values[param.name], param.unit);
    for (const [site, indices] of bySite) {
      const inSite = new Uint8Array(values.length);
      for (const i of indices) inSite[i] = 1;
      const others: number[] = [];
      for (let i = 0; i < values.length; i++) if (!inSite[i] && frame.site[i] >= 0) others.push(i);
      const a = pick(values, indices);
      const b = pick(values, others);
      const test = mannWhitney(a, b);
      const mSite = median(a);
      const mOthers = median(b);
      if (!test || mSite === undefined || mOthers === undefined || mOthers === 0) continue;
      const shift = (mSite - mOthers) / mOthers;
      if (test.p < settings.siteBiasMaxP && Math.abs(shift) >= settings.siteBiasMinShift) {
        out.push({ param: param.name, site, shift, p: test.p, nSite: test.n1, nOthers: test.n2, medianSite: mSite, medianOthers: mOthers });
      }
    }
  }
  return out;
}
