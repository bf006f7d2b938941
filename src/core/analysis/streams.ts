// Helpers on ascending value streams: per-site split and mid-ranks, shared by wafers and lots.

import type { Buffers } from './buffers';
import { sortedSummary, type Moments } from './sortedSummary';
import type { ParamSummary } from './types';

export interface SiteStream {
  /** The site's values, ascending (magnitudes for currents). */
  sorted: Float64Array;
  /** Positions of those values in the parent stream. */
  position: Uint32Array;
  /** The site's analysis-scale values (log10 for currents, without zeros), ascending. */
  scaled: Float64Array | undefined;
}

/**
 * Splits an ascending stream by site (sites < 0 left out) into ascending per-site streams,
 * O(n): a stable pass keeps each site's values in order, so nothing is sorted again.
 * `slots` gives each entry's index into `sites` (-1 for an unknown site), as siteSlots makes.
 */
export function splitBySite(
  sorted: Float64Array, slots: { sites: number[]; slot: Int32Array }, zeros: number, scaled: Float64Array | undefined,
  buffers?: Buffers, key = 'split',
): Map<number, SiteStream> {
  const { sites, slot } = slots;
  const all = new Int32Array(sites.length);
  const positive = new Int32Array(sites.length);
  for (let k = 0; k < sorted.length; k++) {
    const s = slot[k];
    if (s < 0) continue;
    all[s]++;
    if (k >= zeros) positive[s]++;
  }
  // One buffer per column, each site a contiguous part of it (counting sort by site).
  const total = sorted.length;
  const sortedAll = buffers ? buffers.f64(`${key}.sorted`, total) : new Float64Array(total);
  const positionAll = buffers ? buffers.u32(`${key}.position`, total) : new Uint32Array(total);
  const scaledAll = scaled ? (buffers ? buffers.f64(`${key}.scaled`, total) : new Float64Array(total)) : undefined;
  const at = new Int32Array(sites.length);
  const scaledAt = new Int32Array(sites.length);
  for (let s = 1; s < sites.length; s++) { at[s] = at[s - 1] + all[s - 1]; scaledAt[s] = scaledAt[s - 1] + positive[s - 1]; }
  const streams: SiteStream[] = sites.map((_, s) => ({
    sorted: sortedAll.subarray(at[s], at[s] + all[s]),
    position: positionAll.subarray(at[s], at[s] + all[s]),
    scaled: scaledAll ? scaledAll.subarray(scaledAt[s], scaledAt[s] + positive[s]) : undefined,
  }));
  for (let k = 0; k < total; k++) {
    const s = slot[k];
    if (s < 0) continue;
    const j = at[s]++;
    sortedAll[j] = sorted[k];
    positionAll[j] = k;
    if (scaledAll && k >= zeros) scaledAll[scaledAt[s]++] = scaled![k - zeros];
  }
  const out = new Map<number, SiteStream>();
  sites.forEach((site, s) => { if (all[s] > 0) out.set(site, streams[s]); });
  return out;
}

/** ParamSummary of a stream: magnitudes (or values) and, for currents, log10. */
export function streamSummary(
  unit: string, sorted: Float64Array, scaled: Float64Array | undefined, given?: { values?: Moments; log10?: Moments },
): ParamSummary | undefined {
  const base = sortedSummary(sorted, 0, sorted.length, given?.values);
  if (!base) return undefined;
  const out: ParamSummary = { unit, ...base };
  if (scaled) {
    const logs = sortedSummary(scaled, 0, scaled.length, given?.log10);
    if (logs) out.log10 = logs;
  }
  return out;
}

/**
 * Writes the 1-based mid-rank of every entry of an ascending stream into target[index[k]]
 * (ties share the mean of the ranks they span), or target[outer[index[k]]] when `outer` is given.
 */
export function scatterMidranks(sorted: Float64Array, index: Uint32Array, target: Float32Array, outer?: Uint32Array): void {
  const n = sorted.length;
  let k = 0;
  while (k < n) {
    let end = k + 1;
    const v = sorted[k];
    while (end < n && sorted[end] === v) end++;
    const rank = (k + 1 + end) / 2;
    if (outer) for (let j = k; j < end; j++) target[outer[index[j]]] = rank;
    else for (let j = k; j < end; j++) target[index[j]] = rank;
    k = end;
  }
}

/**
 * Mid-ranks of a lot stream (or of a part of it: `position` gives each entry's index in the
 * merged stream) into per-wafer targets indexed by die. In two passes that each touch memory in
 * order: first into each wafer's stream order (`byPosition`, one scratch array per wafer, every
 * wafer's positions rising), then per wafer through its `order` (die of each stream position)
 * into the target; writing straight to the dies would jump between all the wafers' arrays.
 */
export function scatterLotMidranks(
  sorted: Float64Array, merged: { wafer: Uint16Array; position: Uint32Array }, orders: Uint32Array[], targets: Float32Array[],
  byPosition: Float32Array[], position?: Uint32Array,
): void {
  for (const b of byPosition) b.fill(NaN);
  writeByPosition(sorted, merged.wafer, merged.position, byPosition, position);
  for (let w = 0; w < targets.length; w++) scatterByOrder(byPosition[w], orders[w], targets[w]);
}

function writeByPosition(sorted: Float64Array, wafer: Uint16Array, waferPosition: Uint32Array, byPosition: Float32Array[], position?: Uint32Array): void {
  const n = sorted.length;
  let k = 0;
  while (k < n) {
    let end = k + 1;
    const v = sorted[k];
    while (end < n && sorted[end] === v) end++;
    const rank = (k + 1 + end) / 2;
    for (let j = k; j < end; j++) {
      const at = position ? position[j] : j;
      byPosition[wafer[at]][waferPosition[at]] = rank;
    }
    k = end;
  }
}

/** target[order[j]] = values[j] where values[j] is a number (NaN entries are left alone). */
function scatterByOrder(values: Float32Array, order: Uint32Array, target: Float32Array): void {
  for (let j = 0; j < values.length; j++) {
    const v = values[j];
    if (v === v) target[order[j]] = v;
  }
}
