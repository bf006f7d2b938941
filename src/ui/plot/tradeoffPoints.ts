// Points of the Ion-Ioff trade-off plot: x = log10 |Ioff| (A), y = |Ion| in uA, one group per
// probe site, each point remembering its die so a brushed box maps back to dies.

import type { WaferFrame } from '../../core/frame';

export interface SiteGroup {
  site: number;
  /** [x, y] pairs for ECharts. */
  points: number[][];
  dies: number[];
}

export interface TradeoffPoints {
  groups: SiteGroup[];
  /** All plotted points, for box selection. */
  x: Float64Array;
  y: Float64Array;
  die: Int32Array;
  xMin: number;
  xMax: number;
}

export const MICRO = 1e6;

export function tradeoffPoints(frame: WaferFrame, ion: string, ioff: string): TradeoffPoints {
  const ionValues = frame.values[ion];
  const ioffValues = frame.values[ioff];
  const n = frame.x.length;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const die = new Int32Array(n);
  const bySite = new Map<number, SiteGroup>();
  let count = 0;
  let xMin = Infinity;
  let xMax = -Infinity;
  if (ionValues && ioffValues) {
    for (let i = 0; i < n; i++) {
      const off = Math.abs(ioffValues[i]);
      const on = Math.abs(ionValues[i]);
      if (!(off > 0) || !Number.isFinite(off) || !Number.isFinite(on)) continue;
      const px = Math.log10(off);
      const py = on * MICRO;
      x[count] = px; y[count] = py; die[count] = i; count++;
      if (px < xMin) xMin = px;
      if (px > xMax) xMax = px;
      const site = frame.site[i];
      let group = bySite.get(site);
      if (!group) { group = { site, points: [], dies: [] }; bySite.set(site, group); }
      group.points.push([px, py]);
      group.dies.push(i);
    }
  }
  const groups = [...bySite.values()].sort((a, b) => a.site - b.site);
  return { groups, x: x.slice(0, count), y: y.slice(0, count), die: die.slice(0, count), xMin, xMax };
}

/** Dies whose points fall in the box [x0, x1] x [y0, y1] (ends in any order, inclusive). */
export function diesInBox(points: TradeoffPoints, x0: number, x1: number, y0: number, y1: number): number[] {
  const xLow = Math.min(x0, x1), xHigh = Math.max(x0, x1);
  const yLow = Math.min(y0, y1), yHigh = Math.max(y0, y1);
  const found: number[] = [];
  for (let k = 0; k < points.die.length; k++) {
    const px = points.x[k], py = points.y[k];
    if (px >= xLow && px <= xHigh && py >= yLow && py <= yHigh) found.push(points.die[k]);
  }
  return found;
}

/** Points of the given dies (those that are plotted), for the highlight series. */
export function pointsOfDies(points: TradeoffPoints, dies: ReadonlySet<number>): number[][] {
  const out: number[][] = [];
  if (!dies.size) return out;
  for (let k = 0; k < points.die.length; k++) if (dies.has(points.die[k])) out.push([points.x[k], points.y[k]]);
  return out;
}

/**
 * Colour-blind-safe categorical colours for probe sites: the Okabe-Ito palette (M. Okabe and
 * K. Ito, "Color Universal Design", 2008), black left out because black marks the selection.
 */
export const SITE_COLOURS = ['#0072B2', '#E69F00', '#009E73', '#CC79A7', '#56B4E9', '#D55E00', '#F0E442'];
