// Ion-Ioff correlation of a group of dies from ranks computed once per group: Pearson of |Ion|
// on log10|Ioff|, Spearman as the Pearson correlation of the mid-ranks (Spearman 1904; with ties
// this is the tie-corrected rho of src/core/stats/spearman), and the least-squares line
// |Ion| = a + b log10|Ioff| from centred sums (two-pass, so large offsets lose no digits).

import { spearman } from '../stats';
import type { Correlation } from './types';

/** One wafer's share of a group: columns over its dies, and which dies belong (null = all). */
export interface PairSegment {
  logIoff: Float64Array;
  ion: Float64Array;
  /** Mid-ranks within the group (NaN where the value is missing). */
  rankIoff: Float32Array;
  rankIon: Float32Array;
  dies: Uint32Array | null;
}

export function pairCorrelation(device: 'n' | 'p', ion: string, ioff: string, segments: PairSegment[]): Correlation | undefined {
  // First pass: counts and means; second: centred sums (two-pass, Chan, Golub & LeVeque 1983).
  let n = 0, ranked = 0, ionFinite = 0, ioffRanked = 0;
  let sx = 0, sy = 0, srx = 0, sry = 0;
  for (const seg of segments) {
    const { logIoff, ion: ionRaw, rankIoff, rankIon, dies } = seg;
    const count = dies ? dies.length : ionRaw.length;
    for (let k = 0; k < count; k++) {
      const i = dies ? dies[k] : k;
      const x = logIoff[i];
      const y = ionRaw[i];
      const rx = rankIoff[i];
      const ry = rankIon[i];
      if (Number.isFinite(y)) ionFinite++;
      if (rx === rx) ioffRanked++;
      if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
      n++;
      sx += x;
      sy += Math.abs(y);
      if (rx === rx && ry === ry) { ranked++; srx += rx; sry += ry; }
    }
  }
  if (n < 3) return undefined;
  const mx = sx / n, my = sy / n, mrx = srx / n, mry = sry / n;
  let sxx = 0, syy = 0, sxy = 0, rxx = 0, ryy = 0, rxy = 0;
  for (const seg of segments) {
    const { logIoff, ion: ionRaw, rankIoff, rankIon, dies } = seg;
    const count = dies ? dies.length : ionRaw.length;
    for (let k = 0; k < count; k++) {
      const i = dies ? dies[k] : k;
      const x = logIoff[i];
      const y = ionRaw[i];
      if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
      const dx = x - mx;
      const dy = Math.abs(y) - my;
      sxx += dx * dx; syy += dy * dy; sxy += dx * dy;
      const a = rankIoff[i] - mrx;
      const b = rankIon[i] - mry;
      rxx += a * a; ryy += b * b; rxy += a * b;
    }
  }
  let rho: number;
  // The group's ranks count exactly the complete pairs only when nothing is missing on one side.
  if (ranked === n && ionFinite === n && ioffRanked === n) {
    rho = rxy / Math.sqrt(rxx * ryy);
  } else {
    const xs: number[] = [];
    const ys: number[] = [];
    for (const seg of segments) {
      const count = seg.dies ? seg.dies.length : seg.ion.length;
      for (let k = 0; k < count; k++) {
        const i = seg.dies ? seg.dies[k] : k;
        xs.push(seg.logIoff[i]);
        ys.push(Math.abs(seg.ion[i]));
      }
    }
    rho = spearman(xs, ys) ?? NaN;
  }
  const slope = sxy / sxx;
  return { device, ion, ioff, n, pearson: sxy / Math.sqrt(sxx * syy), spearman: rho, slope, intercept: my - slope * mx };
}
