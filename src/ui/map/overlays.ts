// Guides drawn over the dies: zone rings, the reticle (shot) grid, probe-site marks and the axis
// directions. They go on the marks canvas, under flags and selection, so the dies never redraw.

import type { MapLayout } from './mapLayout';
import { cellCorner } from './mapLayout';

/** Ring edges as fractions of the wafer radius when the analysis names none (spatial's default). */
export const DEFAULT_RING_EDGES = [0.2, 0.4, 0.6, 0.8];

export interface OverlayOptions {
  rings: boolean;
  ringEdges: readonly number[];
  reticle: boolean;
  shotColumns: number;
  shotRows: number;
  shotOriginX: number;
  shotOriginY: number;
  sites: boolean;
  axes: boolean;
  /** Colour of rings and grid lines. */
  guide: string;
  text: string;
}

/** Okabe-Ito colours for probe sites (same as the trade-off plot). */
const SITE_COLOURS = ['#0072B2', '#E69F00', '#009E73', '#CC79A7', '#56B4E9', '#D55E00', '#F0E442'];

/** First grid line at or below `value` on a lattice of `step` through `origin`. */
export function latticeFloor(value: number, origin: number, step: number): number {
  return origin + Math.floor((value - origin) / step) * step;
}

export function drawOverlays(context: CanvasRenderingContext2D, layout: MapLayout, x: Int32Array, y: Int32Array,
  site: Int32Array, options: OverlayOptions): void {
  const { grid, cell } = layout;
  context.save();
  if (options.rings) {
    context.beginPath();
    for (const edge of options.ringEdges) {
      const r = layout.radius * edge;
      context.moveTo(layout.centreX + r, layout.centreY);
      context.arc(layout.centreX, layout.centreY, r, 0, Math.PI * 2);
    }
    // A light under-stroke keeps the dashed ring readable over dark and light dies alike.
    context.strokeStyle = 'rgba(255, 255, 255, 0.85)';
    context.lineWidth = 3;
    context.stroke();
    context.setLineDash([6, 4]);
    context.strokeStyle = '#111111';
    context.lineWidth = 1.4;
    context.stroke();
    context.setLineDash([]);
  }
  if (options.reticle && options.shotColumns >= 1 && options.shotRows >= 1) {
    // Shot boundaries fall on cell edges: a shot starting at die x0 begins at x0's left edge.
    context.save();
    context.beginPath();
    context.arc(layout.centreX, layout.centreY, layout.radius, 0, Math.PI * 2);
    context.clip();
    context.beginPath();
    const x0 = latticeFloor(grid.minX, options.shotOriginX, options.shotColumns);
    for (let gx = x0; gx <= grid.maxX + 1; gx += options.shotColumns) {
      const px = cellCorner(layout, gx, grid.minY).x;
      const top = cellCorner(layout, gx, layout.yUp ? grid.maxY : grid.minY).y;
      context.moveTo(px, top);
      context.lineTo(px, top + grid.rows * cell);
    }
    const y0 = latticeFloor(grid.minY, options.shotOriginY, options.shotRows);
    for (let gy = y0; gy <= grid.maxY + 1; gy += options.shotRows) {
      // The lower edge of row gy on screen is the top of the cell below it (y up) or its own top.
      const py = layout.yUp ? cellCorner(layout, gy, gy).y + cell : cellCorner(layout, gy, gy).y;
      context.moveTo(layout.left, py);
      context.lineTo(layout.left + grid.columns * cell, py);
    }
    context.strokeStyle = 'rgba(255, 255, 255, 0.8)';
    context.lineWidth = 2.5;
    context.stroke();
    context.strokeStyle = options.guide;
    context.lineWidth = 1;
    context.stroke();
    context.restore();
  }
  if (options.sites && site.length) {
    const sites = [...new Set(site)].filter((s) => s >= 0).sort((a, b) => a - b);
    const colourOf = new Map(sites.map((s, k) => [s, SITE_COLOURS[k % SITE_COLOURS.length]]));
    const showNumbers = cell >= 14;
    const r = Math.max(1.2, cell * 0.16);
    for (const s of sites) {
      context.beginPath();
      for (let i = 0; i < site.length; i++) {
        if (site[i] !== s) continue;
        const c = cellCorner(layout, x[i], y[i]);
        if (showNumbers) continue;
        context.moveTo(c.x + cell / 2 + r, c.y + cell / 2);
        context.arc(c.x + cell / 2, c.y + cell / 2, r, 0, Math.PI * 2);
      }
      context.fillStyle = colourOf.get(s) ?? '#000';
      context.fill();
    }
    if (showNumbers) {
      context.font = `${Math.round(Math.min(12, cell * 0.5))}px system-ui, sans-serif`;
      context.textAlign = 'center';
      context.textBaseline = 'middle';
      for (let i = 0; i < site.length; i++) {
        if (site[i] < 0) continue;
        const c = cellCorner(layout, x[i], y[i]);
        context.fillStyle = '#000';
        context.fillText(String(site[i]), c.x + cell / 2 + 0.6, c.y + cell / 2 + 0.6);
        context.fillStyle = '#fff';
        context.fillText(String(site[i]), c.x + cell / 2, c.y + cell / 2);
      }
    }
  }
  if (options.axes) {
    // +x and +y arrows in the top-left corner, whatever the zoom.
    const ox = 18, oy = 70, len = 26;
    const dy = layout.yUp ? -len : len;
    context.strokeStyle = options.text;
    context.fillStyle = options.text;
    context.lineWidth = 1.5;
    context.beginPath();
    context.moveTo(ox, oy); context.lineTo(ox + len, oy);
    context.moveTo(ox, oy); context.lineTo(ox, oy + dy);
    context.stroke();
    context.beginPath();
    context.moveTo(ox + len + 5, oy); context.lineTo(ox + len - 2, oy - 4); context.lineTo(ox + len - 2, oy + 4); context.closePath();
    const tip = oy + dy + (layout.yUp ? -5 : 5);
    const back = oy + dy + (layout.yUp ? 2 : -2);
    context.moveTo(ox, tip); context.lineTo(ox - 4, back); context.lineTo(ox + 4, back); context.closePath();
    context.fill();
    context.font = '11px system-ui, sans-serif';
    context.textAlign = 'left';
    context.textBaseline = 'middle';
    context.fillText('+x', ox + len + 8, oy);
    context.fillText('+y', ox + 6, oy + dy + (layout.yUp ? -2 : 2));
  }
  context.restore();
}
