// One parameter of one group of dies, sorted once: every order statistic, rank, per-site split and
// PAT tail of the analysis is read from this single ordering instead of sorting again per site,
// per test or per quantile. Missing values follow the stats rule (only finite values count).

import { ascendingOrderByHighWord } from '../stats';
import { isCurrentUnit } from '../params';
import type { Buffers } from './buffers';
import { PAT_IQR_DIVISOR } from './robustScale';

export interface SortedColumn {
  /** Finite magnitudes (|v| for currents, v otherwise), ascending. */
  sorted: Float64Array;
  /** Die index of each entry of `sorted` (into the group's columns). */
  order: Uint32Array;
  /** Probe site of each entry of `sorted`. */
  site: Int32Array;
  /** Analysis scale, ascending: log10 of sorted[zeros..] for currents, `sorted` otherwise. */
  scaled: Float64Array;
  /** Die index of each entry of `scaled`. */
  scaledOrder: Uint32Array;
  scale: 'log10' | 'linear';
  /** Entries with magnitude 0 (no logarithm); they sit at the front of `sorted`. */
  zeros: number;
}

/**
 * Sorts one column of a wafer: O(n) radix ordering of the finite magnitudes. With `buffers` and
 * a `key`, the column's own arrays live in memory kept under that key (one key per wafer serves
 * every parameter in turn, so a lot's columns are not allocated and collected parameter after
 * parameter); the column is then valid until the next sort under the same key.
 */
export function sortColumn(values: Float64Array, unit: string, siteOfDie: Int32Array, buffers?: Buffers, key?: string): SortedColumn {
  const own = buffers && key ? { buffers, key } : undefined;
  const current = isCurrentUnit(unit);
  let m = 0;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) m++;
  let compact: Float64Array;
  let index: Uint32Array | undefined;
  if (m === values.length) {
    // Nothing missing (the usual case): sort the column itself, or its magnitudes.
    if (current) {
      compact = buffers ? buffers.f64('sort.compact', m) : new Float64Array(m);
      for (let i = 0; i < m; i++) compact[i] = Math.abs(values[i]);
    } else {
      compact = values;
    }
  } else {
    compact = buffers ? buffers.f64('sort.compact', m) : new Float64Array(m);
    index = buffers ? buffers.u32('sort.index', m) : new Uint32Array(m);
    for (let i = 0, k = 0; i < values.length; i++) {
      const v = values[i];
      if (!Number.isFinite(v)) continue;
      compact[k] = current ? Math.abs(v) : v;
      index[k++] = i;
    }
  }
  const permutation = ascendingOrderByHighWord(compact, buffers?.u32('sort.radix', 3 * m), own?.buffers.u32(`${own.key}.permutation`, m));
  const sorted = own ? own.buffers.f64(`${own.key}.sorted`, m) : new Float64Array(m);
  const site = own ? new Int32Array(own.buffers.u32(`${own.key}.site`, m).buffer, 0, m) : new Int32Array(m);
  let order: Uint32Array;
  if (index) {
    order = own ? own.buffers.u32(`${own.key}.order`, m) : new Uint32Array(m);
    for (let k = 0; k < m; k++) {
      const j = permutation[k];
      sorted[k] = compact[j];
      order[k] = index[j];
      site[k] = siteOfDie[index[j]];
    }
  } else {
    order = permutation;
    for (let k = 0; k < m; k++) {
      const j = permutation[k];
      sorted[k] = compact[j];
      site[k] = siteOfDie[j];
    }
  }
  return withScale(sorted, order, site, current, own);
}

/** Completes a sorted stream (from a sort or a merge) with its analysis scale. */
export function withScale(sorted: Float64Array, order: Uint32Array, site: Int32Array, current: boolean, own?: { buffers: Buffers; key: string }): SortedColumn {
  if (!current) return { sorted, order, site, scaled: sorted, scaledOrder: order, scale: 'linear', zeros: 0 };
  let zeros = 0;
  while (zeros < sorted.length && sorted[zeros] === 0) zeros++;
  const scaled = own ? own.buffers.f64(`${own.key}.scaled`, sorted.length - zeros) : new Float64Array(sorted.length - zeros);
  for (let k = zeros; k < sorted.length; k++) scaled[k - zeros] = Math.log10(sorted[k]);
  return { sorted, order, site, scaled, scaledOrder: order.subarray(zeros), scale: 'log10', zeros };
}

/** Hyndman & Fan type 7 quantile of ascending finite values (n >= 1), as src/core/stats does. */
export function sortedQuantile(sorted: ArrayLike<number>, p: number, from = 0, to = sorted.length): number {
  const n = to - from;
  const h = (n - 1) * p;
  const j = Math.floor(h);
  const lower = sorted[from + j];
  const fraction = h - j;
  if (fraction === 0) return lower;
  return lower + fraction * (sorted[from + j + 1] - lower);
}

/** Median and PAT robust sigma ((Q3 - Q1)/1.35) of ascending values in [from, to). */
export function robustCentre(sorted: ArrayLike<number>, from = 0, to = sorted.length): { centre: number; sigma: number; n: number } | undefined {
  if (to - from < 1) return undefined;
  const q1 = sortedQuantile(sorted, 0.25, from, to);
  const q3 = sortedQuantile(sorted, 0.75, from, to);
  return { centre: sortedQuantile(sorted, 0.5, from, to), sigma: (q3 - q1) / PAT_IQR_DIVISOR, n: to - from };
}

/** First index in ascending `sorted` with value >= v (binary search). */
export function lowerBound(sorted: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < v) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** First index in ascending `sorted` with value > v. */
export function upperBound(sorted: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= v) lo = mid + 1; else hi = mid;
  }
  return lo;
}
