// Probe-site bias: each site's dies against the other sites' dies, per parameter, on one sorted
// stream (a wafer's, or a whole lot's merged one), so no test sorts anything again.
// Reported only when the difference is both significant (Mann-Whitney p below a floor) and large
// enough to matter (relative median shift at least a floor); see README "Probe-site bias rule".
//
// Sites are tested in rounds: the site with the largest passing |shift| is reported and left out
// of the reference for the next round, until no site passes. Without this, one biased site drags
// the pooled median of "the others" and makes every healthy site look shifted the other way.
// The Kruskal-Wallis p across all sites is attached to every entry as the group-level evidence.

import type { WaferFrame } from '../frame';
import { chiSquareSurvival, normalSurvival } from '../stats';
import { sortColumn } from './sortedColumn';
import type { AnalysisSettings, SiteBias } from './types';

/** Sites present in a stream's labels (>= 0) ascending, each entry's index among them (-1 for an
 * unknown site) and, for ordinary site numbers, the dense table site -> index behind it (-1 for a
 * site not present). */
export function siteSlots(site: Int32Array, into?: Int32Array): { sites: number[]; slot: Int32Array; slotOfSite?: Int32Array } {
  let max = -1;
  for (let k = 0; k < site.length; k++) if (site[k] > max) max = site[k];
  const slot = into && into.length >= site.length ? into.subarray(0, site.length) : new Int32Array(site.length);
  if (max < 0) return { sites: [], slot: slot.fill(-1) };
  if (max > 1 << 20) {
    // Unusual site numbers: a Map instead of a dense table.
    const sites = [...new Set(Array.from(site).filter((s) => s >= 0))].sort((a, b) => a - b);
    const index = new Map(sites.map((s, i) => [s, i]));
    for (let k = 0; k < site.length; k++) slot[k] = site[k] >= 0 ? index.get(site[k])! : -1;
    return { sites, slot };
  }
  const table = new Int32Array(max + 1).fill(-1);
  for (let k = 0; k < site.length; k++) if (site[k] >= 0) table[site[k]] = 0;
  const sites: number[] = [];
  for (let s = 0; s <= max; s++) if (table[s] === 0) { table[s] = sites.length; sites.push(s); }
  for (let k = 0; k < site.length; k++) slot[k] = site[k] >= 0 ? table[site[k]] : -1;
  return { sites, slot, slotOfSite: table };
}

interface RankSums { sums: Float64Array; counts: Int32Array; total: number; tieTerm: number }

/** Mid-rank sums per slot over the entries whose slot is not excluded (ties averaged). */
function rankSums(sorted: Float64Array, slot: Int32Array, slots: number, excluded: Uint8Array): RankSums {
  const sums = new Float64Array(slots);
  const counts = new Int32Array(slots);
  let position = 0;
  let tieTerm = 0;
  let k = 0;
  const n = sorted.length;
  while (k < n) {
    const s = slot[k];
    if (s < 0 || excluded[s]) { k++; continue; }
    // Gather the tie group of pool entries equal to sorted[k].
    const v = sorted[k];
    let end = k + 1;
    let members = 1;
    while (end < n && sorted[end] === v) {
      const t = slot[end];
      if (t >= 0 && !excluded[t]) members++;
      end++;
    }
    const average = position + (members + 1) / 2;
    for (let j = k; j < end; j++) {
      const t = slot[j];
      if (t >= 0 && !excluded[t]) { sums[t] += average; counts[t]++; }
    }
    if (members > 1) tieTerm += members * members * members - members;
    position += members;
    k = end;
  }
  return { sums, counts, total: position, tieTerm };
}

/**
 * The k-th smallest (0-based) of the union of ascending arrays, without merging them: repeatedly
 * split on the middle of the largest remaining range and keep the side holding the k-th
 * (O(m^2 log^2 n) for m arrays, tiny for a handful of sites).
 */
export function kthOfSorted(arrays: Float64Array[], k: number): number {
  const lo = arrays.map(() => 0);
  const hi = arrays.map((a) => a.length);
  for (;;) {
    let pick = -1;
    for (let i = 0; i < arrays.length; i++) if (hi[i] > lo[i] && (pick < 0 || hi[i] - lo[i] > hi[pick] - lo[pick])) pick = i;
    if (pick < 0) return NaN;
    const pivot = arrays[pick][(lo[pick] + hi[pick]) >>> 1];
    let less = 0;
    let lessOrEqual = 0;
    const below = arrays.map((a, i) => bound(a, pivot, lo[i], hi[i], false));
    const upTo = arrays.map((a, i) => bound(a, pivot, lo[i], hi[i], true));
    for (let i = 0; i < arrays.length; i++) { less += below[i] - lo[i]; lessOrEqual += upTo[i] - lo[i]; }
    if (k < less) {
      for (let i = 0; i < arrays.length; i++) hi[i] = below[i];
    } else if (k < lessOrEqual) {
      return pivot;
    } else {
      k -= lessOrEqual;
      for (let i = 0; i < arrays.length; i++) lo[i] = upTo[i];
    }
  }
}

/** First index in a[lo..hi) with a[i] > v (orEqual) or a[i] >= v. */
function bound(a: Float64Array, v: number, lo: number, hi: number, orEqual: boolean): number {
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (orEqual ? a[mid] <= v : a[mid] < v) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** Type-7 median of the union of ascending arrays holding `count` values in all. */
function medianOfUnion(arrays: Float64Array[], count: number): number {
  const h = (count - 1) * 0.5;
  const j = Math.floor(h);
  const lower = kthOfSorted(arrays, j);
  if (h === j) return lower;
  return lower + (h - j) * (kthOfSorted(arrays, j + 1) - lower);
}

/** Each slot's values, ascending, from a stream and its slots. */
function perSlotArrays(sorted: Float64Array, slot: Int32Array, slots: number): Float64Array[] {
  const counts = new Int32Array(slots);
  for (let k = 0; k < slot.length; k++) if (slot[k] >= 0) counts[slot[k]]++;
  const out = Array.from(counts, (c) => new Float64Array(c));
  const at = new Int32Array(slots);
  for (let k = 0; k < slot.length; k++) { const s = slot[k]; if (s >= 0) out[s][at[s]++] = sorted[k]; }
  return out;
}

/**
 * Site bias of one parameter on an ascending stream of values (magnitudes for currents) with the
 * site label of each entry.
 */
export function siteBiasOfStream(
  param: string,
  sorted: Float64Array,
  site: Int32Array,
  settings: Pick<AnalysisSettings, 'siteBiasMaxP' | 'siteBiasMinShift'>,
  slots: { sites: number[]; slot: Int32Array } = siteSlots(site),
  /** Each slot's values ascending, when the caller has them already. */
  bySlot?: Float64Array[],
): SiteBias[] {
  const { sites, slot } = slots;
  const k = sites.length;
  if (k < 2) return [];
  const arrays = bySlot ?? perSlotArrays(sorted, slot, k);
  const excluded = new Uint8Array(k);
  const out: SiteBias[] = [];
  let kruskalWallisP = NaN;
  for (let round = 0; ; round++) {
    const { sums, counts, total, tieTerm } = rankSums(sorted, slot, k, excluded);
    if (round === 0) kruskalWallisP = kruskalWallisFromSums(sums, counts, total, tieTerm);
    let best: SiteBias | undefined;
    for (let s = 0; s < k; s++) {
      if (excluded[s]) continue;
      const n1 = counts[s];
      const n2 = total - n1;
      if (n1 < 2 || n2 < 2) continue;
      const mSite = medianOfUnion([arrays[s]], n1);
      const mOthers = medianOfUnion(arrays.filter((_, t) => t !== s && !excluded[t]), n2);
      if (mOthers === 0 || !Number.isFinite(mOthers)) continue;
      const shift = (mSite - mOthers) / mOthers;
      if (Math.abs(shift) < settings.siteBiasMinShift) continue;
      const test = mannWhitneyFromRankSum(sums[s], n1, n2, tieTerm);
      if (test.p < settings.siteBiasMaxP && (!best || Math.abs(shift) > Math.abs(best.shift))) {
        best = {
          param, site: sites[s], shift, p: test.p, nSite: n1, nOthers: n2, medianSite: mSite, medianOthers: mOthers,
          rankBiserial: test.rankBiserial, kruskalWallisP,
        };
      }
    }
    if (!best) break;
    out.push(best);
    excluded[sites.indexOf(best.site)] = 1;
  }
  return out;
}

/**
 * Mann-Whitney normal approximation from the first sample's rank sum in the pooled ranking, with
 * tie and continuity corrections, as src/core/stats/mannWhitney (R's wilcox.test, exact = FALSE).
 */
export function mannWhitneyFromRankSum(rankSum: number, n1: number, n2: number, tieTerm: number): { z: number; p: number; rankBiserial: number } {
  const total = n1 + n2;
  const u = rankSum - (n1 * (n1 + 1)) / 2;
  const product = n1 * n2;
  const variance = (product / 12) * (total + 1 - tieTerm / (total * (total - 1)));
  const rankBiserial = (2 * u) / product - 1;
  const shift = u - product / 2;
  if (!(variance > 0)) return { z: 0, p: 1, rankBiserial };
  const z = (Math.sign(shift) * Math.max(Math.abs(shift) - 0.5, 0)) / Math.sqrt(variance);
  return { z, p: Math.min(1, 2 * normalSurvival(Math.abs(z))), rankBiserial };
}

/** Kruskal-Wallis H test from rank sums, as src/core/stats/kruskalWallis. */
export function kruskalWallisFromSums(sums: Float64Array, counts: Int32Array, total: number, tieTerm: number): number {
  let used = 0;
  let between = 0;
  const centre = (total + 1) / 2;
  for (let s = 0; s < sums.length; s++) {
    if (counts[s] === 0) continue;
    used++;
    const d = sums[s] / counts[s] - centre;
    between += counts[s] * d * d;
  }
  if (used < 2) return NaN;
  const tieFactor = 1 - tieTerm / (total * total * total - total);
  if (!(tieFactor > 0)) return 1;
  const h = ((12 / (total * (total + 1))) * between) / tieFactor;
  return chiSquareSurvival(h, used - 1);
}

/** Site bias of every parameter of one frame (sorts each column once). */
export function siteBias(frame: Pick<WaferFrame, 'params' | 'values' | 'site'>, settings: Pick<AnalysisSettings, 'siteBiasMaxP' | 'siteBiasMinShift'>): SiteBias[] {
  const out: SiteBias[] = [];
  for (const param of frame.params) {
    const column = sortColumn(frame.values[param.name], param.unit, frame.site);
    out.push(...siteBiasOfStream(param.name, column.sorted, column.site, settings));
  }
  return out;
}
