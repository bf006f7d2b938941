// Radial profile of one parameter on one wafer: dies binned by distance from the die-grid centre
// (equal-width rings of the largest radius) with the median and quartiles (Hyndman-Fan type 7,
// core/stats) of each ring, on the map's colour scale (log10 |I| for currents).

import { quantileSorted } from '../../core/stats';
import { extentOf } from '../../core/spatial/dieGrid';
import { transformValue } from '../map/colorScale';

export interface RadialBin {
  /** Outer radius of the ring as a fraction of the largest die radius. */
  outer: number;
  n: number;
  q1: number;
  median: number;
  q3: number;
}

export function radialProfile(x: Int32Array, y: Int32Array, values: Float64Array, log: boolean, bins = 10): RadialBin[] {
  const n = x.length;
  if (!n) return [];
  const { min: minX, max: maxX } = extentOf(x);
  const { min: minY, max: maxY } = extentOf(y);
  const cx = (minX + maxX) / 2, cy = (minY + maxY) / 2;
  const radius = new Float64Array(n);
  let rMax = 0;
  for (let i = 0; i < n; i++) { radius[i] = Math.hypot(x[i] - cx, y[i] - cy); if (radius[i] > rMax) rMax = radius[i]; }
  const groups: number[][] = Array.from({ length: bins }, () => []);
  for (let i = 0; i < n; i++) {
    const t = transformValue(values[i], log);
    if (t !== t) continue;
    const k = rMax > 0 ? Math.min(bins - 1, Math.floor((radius[i] / rMax) * bins)) : 0;
    groups[k].push(t);
  }
  return groups.map((g, k) => {
    const sorted = Float64Array.from(g).sort();
    return {
      outer: (k + 1) / bins,
      n: g.length,
      q1: quantileSorted(sorted, 0.25) ?? NaN,
      median: quantileSorted(sorted, 0.5) ?? NaN,
      q3: quantileSorted(sorted, 0.75) ?? NaN,
    };
  });
}
