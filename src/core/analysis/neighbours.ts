// Die neighbourhoods on the grid and the two spatial outlier methods built on them:
// nearest-neighbour residual (NNR: W. R. Daasch, K. Cota, J. McNames, R. Madge, "Neighbor
// selection for variance reduction in IDDQ and other parametric data", IEEE ITC 2001: residual =
// value - median of the die's neighbours, then robust limits on the residuals) and good die in a
// bad neighbourhood (GDBN: a passing die whose neighbours mostly fail, common practice).

import { selectQuantilesInPlace } from '../stats';
import { extentOf } from '../spatial/dieGrid';
import type { Buffers } from './buffers';
import { PAT_IQR_DIVISOR } from './robustScale';
import type { GdbnReason, NnrReason } from './types';

/** Neighbours of every die within `radius` grid steps (Chebyshev distance), as compressed rows. */
export interface Neighbourhood {
  start: Int32Array;
  list: Int32Array;
  /** For radius 1: each die's cell in a grid padded by one empty ring, row length paddedWidth,
   * so the 8 neighbours are fixed offsets (no list lookups on the hot path). */
  cell?: Int32Array;
  paddedWidth?: number;
  cells?: number;
}

export function neighbourhood(x: Int32Array, y: Int32Array, radius: number): Neighbourhood {
  const n = x.length;
  const r = Math.max(1, Math.floor(radius));
  const { min: minX, max: maxX } = extentOf(x);
  const { min: minY, max: maxY } = extentOf(y);
  const start = new Int32Array(n + 1);
  if (n === 0) return { start, list: new Int32Array(0) };
  const width = maxX - minX + 1;
  const height = maxY - minY + 1;
  const grid = new Int32Array(width * height).fill(-1);
  for (let i = 0; i < n; i++) grid[(y[i] - minY) * width + (x[i] - minX)] = i;
  const side = 2 * r + 1;
  const list = new Int32Array(n * (side * side - 1));
  let at = 0;
  for (let i = 0; i < n; i++) {
    start[i] = at;
    const gx = x[i] - minX;
    const gy = y[i] - minY;
    for (let dy = -r; dy <= r; dy++) {
      const yy = gy + dy;
      if (yy < 0 || yy >= height) continue;
      for (let dx = -r; dx <= r; dx++) {
        const xx = gx + dx;
        if ((dx === 0 && dy === 0) || xx < 0 || xx >= width) continue;
        const j = grid[yy * width + xx];
        if (j >= 0 && j !== i) list[at++] = j;
      }
    }
  }
  start[n] = at;
  if (r !== 1) return { start, list: list.subarray(0, at) };
  const paddedWidth = width + 2;
  const cell = new Int32Array(n);
  for (let i = 0; i < n; i++) cell[i] = (y[i] - minY + 1) * paddedWidth + (x[i] - minX + 1);
  return { start, list: list.subarray(0, at), cell, paddedWidth, cells: paddedWidth * (height + 2) };
}

/** Fewest finite neighbours a residual needs (a median of 1 or 2 values is no neighbourhood). */
const MIN_NEIGHBOURS = 3;

/**
 * NNR residuals of one analysis-scale column: value minus the median of its finite neighbours;
 * NaN where the die's value is missing or it has fewer than 3 finite neighbours.
 */
export function nnrResiduals(values: Float64Array, hood: Neighbourhood, buffers?: Buffers): { residual: Float64Array; count: Uint8Array } {
  const n = values.length;
  const residual = buffers ? buffers.f64('nnr.residual', n) : new Float64Array(n);
  const count = buffers ? buffers.u8('nnr.count', n).fill(0) : new Uint8Array(n);
  const scratch = new Float64Array(64);
  const { start, list, cell, paddedWidth } = hood;
  // Values laid on the padded grid (NaN where there is no die), for the fixed-offset fast path.
  let padded: Float64Array | undefined;
  if (cell && paddedWidth) {
    padded = (buffers ? buffers.f64('nnr.grid', hood.cells!) : new Float64Array(hood.cells!)).fill(NaN);
    for (let i = 0; i < n; i++) padded[cell[i]] = values[i];
  }
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (v !== v) { residual[i] = NaN; continue; }
    const s = start[i];
    // False when a neighbour is missing or off the wafer: then the general path counts the rest.
    if (padded && residualAround(padded, cell![i], paddedWidth!, values, residual, i)) { count[i] = 8; continue; }
    let m = 0;
    for (let k = s; k < start[i + 1] && m < 64; k++) {
      const w = values[list[k]];
      if (w !== w) continue;
      // Insertion into the sorted scratch: neighbourhoods are small (8 or 24).
      let j = m++;
      while (j > 0 && scratch[j - 1] > w) { scratch[j] = scratch[j - 1]; j--; }
      scratch[j] = w;
    }
    count[i] = m;
    if (m < MIN_NEIGHBOURS) { residual[i] = NaN; continue; }
    const h = (m - 1) * 0.5;
    const j = Math.floor(h);
    const med = h === j ? scratch[j] : scratch[j] + 0.5 * (scratch[j + 1] - scratch[j]);
    residual[i] = v - med;
  }
  return { residual, count };
}

/**
 * Median of the 8 cells around cell c of a padded grid with rows of w: the 4th and 5th smallest
 * of 8 without sorting all of them. Each half (the row above with the left cell, the right cell
 * with the row below) is sorted by a 5-comparator network (Knuth, TAOCP vol. 3, §5.3.4); for two
 * sorted quadruples a and b, the 4th smallest of the union is max_i min(a_i, b_{3-i}) and the
 * 5th is min_i max(a_i, b_{3-i}). Branch-free. Writes values[i] - median into residual[i] and
 * says so, or writes nothing when any of the 8 is NaN. (No double crosses the call, in or out: a
 * double argument or result is boxed on the heap, millions of times per lot.)
 */
function residualAround(padded: Float64Array, c: number, w: number, values: Float64Array, residual: Float64Array, i: number): boolean {
  let a0 = padded[c - w - 1], a1 = padded[c - w], a2 = padded[c - w + 1], a3 = padded[c - 1];
  let b0 = padded[c + 1], b1 = padded[c + w - 1], b2 = padded[c + w], b3 = padded[c + w + 1];
  let t: number;
  t = Math.min(a0, a1); a1 = Math.max(a0, a1); a0 = t;
  t = Math.min(a2, a3); a3 = Math.max(a2, a3); a2 = t;
  t = Math.min(a0, a2); a2 = Math.max(a0, a2); a0 = t;
  t = Math.min(a1, a3); a3 = Math.max(a1, a3); a1 = t;
  t = Math.min(a1, a2); a2 = Math.max(a1, a2); a1 = t;
  t = Math.min(b0, b1); b1 = Math.max(b0, b1); b0 = t;
  t = Math.min(b2, b3); b3 = Math.max(b2, b3); b2 = t;
  t = Math.min(b0, b2); b2 = Math.max(b0, b2); b0 = t;
  t = Math.min(b1, b3); b3 = Math.max(b1, b3); b1 = t;
  t = Math.min(b1, b2); b2 = Math.max(b1, b2); b1 = t;
  const lower = Math.max(Math.min(a0, b3), Math.min(a1, b2), Math.min(a2, b1), Math.min(a3, b0));
  const upper = Math.min(Math.max(a0, b3), Math.max(a1, b2), Math.max(a2, b1), Math.max(a3, b0));
  const median = lower + 0.5 * (upper - lower);
  if (median !== median) return false;
  residual[i] = values[i] - median;
  return true;
}

/** Dies whose NNR residual is beyond `limit` robust sigmas of the wafer's residuals. */
export function flagNnr(
  param: string,
  scale: 'log10' | 'linear',
  raw: Float64Array,
  residuals: { residual: Float64Array; count: Uint8Array },
  limit: number,
  emit: (die: number, reason: NnrReason) => void,
  buffers?: Buffers,
): void {
  const { residual, count } = residuals;
  let m = 0;
  for (let i = 0; i < residual.length; i++) if (Number.isFinite(residual[i])) m++;
  if (m < 10) return;
  const copy = buffers ? buffers.f64('nnr.copy', m) : new Float64Array(m);
  for (let i = 0, k = 0; i < residual.length; i++) if (Number.isFinite(residual[i])) copy[k++] = residual[i];
  const [q1, centre, q3] = selectQuantilesInPlace(copy, [0.25, 0.5, 0.75]);
  const sigma = (q3 - q1) / PAT_IQR_DIVISOR;
  if (!(sigma > 0)) return;
  const low = centre - limit * sigma;
  const high = centre + limit * sigma;
  for (let i = 0; i < residual.length; i++) {
    const r = residual[i];
    if (!(r < low || r > high)) continue;
    const score = (r - centre) / sigma;
    emit(i, { method: 'nnr', param, value: raw[i], score, limit, direction: score > 0 ? 'high' : 'low', scale, residual: r, neighbours: count[i] });
  }
}

/**
 * GDBN: every unflagged die with at least `minNeighbours` neighbours of which at least `fraction`
 * are flagged. `strongest` gives the die's largest robust z (parameter, value, z) for the reason.
 */
export function flagGdbn(
  flagged: Uint8Array,
  hood: Neighbourhood,
  fraction: number,
  minNeighbours: number,
  strongest: (die: number) => { param: string; value: number; score: number; scale: 'log10' | 'linear' },
  limit: number,
  emit: (die: number, reason: GdbnReason) => void,
): void {
  const { start, list } = hood;
  for (let i = 0; i < flagged.length; i++) {
    if (flagged[i]) continue;
    const total = start[i + 1] - start[i];
    if (total < minNeighbours) continue;
    let bad = 0;
    for (let k = start[i]; k < start[i + 1]; k++) bad += flagged[list[k]];
    if (bad < fraction * total) continue;
    const s = strongest(i);
    emit(i, { method: 'gdbn', param: s.param, value: s.value, score: s.score, limit, direction: s.score >= 0 ? 'high' : 'low', scale: s.scale, badNeighbours: bad, neighbours: total });
  }
}
