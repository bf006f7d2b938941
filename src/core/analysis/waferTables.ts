// Small per-wafer tables the analysis builds once and reuses.

import { siteSlots } from './siteBias';

/** True when two wafers have the same die grid (so their neighbourhoods are the same). */
export function sameGrid(x1: Int32Array, y1: Int32Array, x2: Int32Array, y2: Int32Array): boolean {
  if (x1 === x2 && y1 === y2) return true;
  if (x1.length !== x2.length) return false;
  for (let i = 0; i < x1.length; i++) if (x1[i] !== x2[i] || y1[i] !== y2[i]) return false;
  return true;
}

/** A record with its numeric-text keys (site numbers) in ascending order. */
export function sortKeys<T>(record: Record<string, T>): Record<string, T> {
  return Object.fromEntries(Object.entries(record).sort((a, b) => Number(a[0]) - Number(b[0])));
}

/** Die indices per probe site, sites ascending (unknown sites, < 0, left out). */
export function diesBySite(site: Int32Array): Map<number, Uint32Array> {
  // Site slots (siteSlots: a dense table for ordinary site numbers), then a counting sort.
  const { sites, slot } = siteSlots(site);
  const counts = new Int32Array(sites.length);
  for (let i = 0; i < slot.length; i++) if (slot[i] >= 0) counts[slot[i]]++;
  const lists = Array.from(counts, (n) => new Uint32Array(n));
  const at = new Int32Array(sites.length);
  for (let i = 0; i < slot.length; i++) {
    const s = slot[i];
    if (s >= 0) lists[s][at[s]++] = i;
  }
  return new Map(sites.map((s, k) => [s, lists[k]]));
}
