// Statistics of a group of dies (a wafer, or a whole lot): every parameter overall and per probe
// site, and the Ion-Ioff correlation overall and per site.

import type { WaferFrame } from '../frame';
import { tradeoffCorrelations } from './correlation';
import { paramSummary } from './paramSummary';
import { pick } from './scales';
import type { GroupStats, ParamSummary } from './types';

/** Die indices per probe site (sites < 0, i.e. unknown, are left out). */
export function indicesBySite(site: Int32Array): Map<number, Int32Array> {
  const counts = new Map<number, number>();
  for (let i = 0; i < site.length; i++) if (site[i] >= 0) counts.set(site[i], (counts.get(site[i]) ?? 0) + 1);
  const out = new Map<number, Int32Array>();
  const fill = new Map<number, number>();
  for (const [s, n] of [...counts].sort((a, b) => a[0] - b[0])) { out.set(s, new Int32Array(n)); fill.set(s, 0); }
  for (let i = 0; i < site.length; i++) {
    const s = site[i];
    if (s < 0) continue;
    const at = fill.get(s)!;
    out.get(s)![at] = i;
    fill.set(s, at + 1);
  }
  return out;
}

export function groupStats(frame: Pick<WaferFrame, 'params' | 'values' | 'site'>): GroupStats {
  const params: Record<string, ParamSummary> = {};
  for (const p of frame.params) {
    const s = paramSummary(frame.values[p.name], p);
    if (s) params[p.name] = s;
  }
  const sites: Record<string, Record<string, ParamSummary>> = {};
  const correlationBySite: GroupStats['correlationBySite'] = {};
  for (const [site, indices] of indicesBySite(frame.site)) {
    const values: Record<string, Float64Array> = {};
    const perSite: Record<string, ParamSummary> = {};
    for (const p of frame.params) {
      values[p.name] = pick(frame.values[p.name], indices);
      const s = paramSummary(values[p.name], p);
      if (s) perSite[p.name] = s;
    }
    sites[String(site)] = perSite;
    correlationBySite[String(site)] = tradeoffCorrelations({ params: frame.params, values });
  }
  return { dies: frame.site.length, params, sites, correlation: tradeoffCorrelations(frame), correlationBySite };
}
