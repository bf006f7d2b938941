// Probe-site bias on one wafer: each site's dies against the other sites' dies, per parameter.
// Reported only when the difference is both significant (Mann-Whitney p below a floor) and large
// enough to matter (relative median shift at least a floor); see README "Probe-site bias rule".
//
// Sites are tested in rounds: the site with the largest passing |shift| is reported and left out
// of the reference for the next round, until no site passes. Without this, one biased site drags
// the pooled median of "the others" and makes every healthy site look shifted the other way.

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
    const perSite = new Map<number, Float64Array>();
    for (const [site, indices] of bySite) perSite.set(site, pick(values, indices));
    const reported = new Set<number>();
    for (;;) {
      let best: SiteBias | undefined;
      for (const [site, inSite] of perSite) {
        if (reported.has(site)) continue;
        const reference = [...perSite].filter(([s]) => s !== site && !reported.has(s));
        if (reference.length === 0) continue;
        const others = concat(reference.map(([, v]) => v));
        const test = mannWhitney(inSite, others);
        const mSite = median(inSite);
        const mOthers = median(others);
        if (!test || mSite === undefined || mOthers === undefined || mOthers === 0) continue;
        const shift = (mSite - mOthers) / mOthers;
        if (test.p < settings.siteBiasMaxP && Math.abs(shift) >= settings.siteBiasMinShift && (!best || Math.abs(shift) > Math.abs(best.shift))) {
          best = { param: param.name, site, shift, p: test.p, nSite: test.n1, nOthers: test.n2, medianSite: mSite, medianOthers: mOthers };
        }
      }
      if (!best) break;
      out.push(best);
      reported.add(best.site);
    }
  }
  return out;
}

function concat(parts: Float64Array[]): Float64Array {
  const out = new Float64Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) { out.set(p, at); at += p.length; }
  return out;
}
