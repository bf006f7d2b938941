// Where the wafer sits on the canvas: one square cell per die, the wafer circle centred and as
// large as the canvas allows. All positions are CSS pixels relative to the canvas's top-left.

import type { DieGrid } from './dieGrid';

export interface MapLayout {
  /** Cell edge in CSS pixels. */
  cell: number;
  /** Canvas position of the top-left corner of the grid's bounding box. */
  left: number;
  top: number;
  /** True when +y points up on screen (the default); false when it points down. */
  yUp: boolean;
  /** Wafer circle centre and radius in CSS pixels. */
  centreX: number;
  centreY: number;
  radius: number;
  grid: DieGrid;
}

/** Fraction of the shorter canvas side left free around the wafer (room for the notch). */
const MARGIN = 0.05;

export function layoutMap(grid: DieGrid, width: number, height: number, yUp = true): MapLayout {
  const side = Math.max(1, Math.min(width, height)) * (1 - 2 * MARGIN);
  const cell = side / (2 * Math.max(grid.radius, 0.5));
  const centreX = width / 2;
  const centreY = height / 2;
  // The grid's centre (in grid units) lands on the canvas centre.
  const left = centreX - (grid.centreX - grid.minX + 0.5) * cell;
  const top = yUp
    ? centreY - (grid.maxY - grid.centreY + 0.5) * cell
    : centreY - (grid.centreY - grid.minY + 0.5) * cell;
  return { cell, left, top, yUp, centreX, centreY, radius: grid.radius * cell, grid };
}

/** Row of a grid y on screen, 0 at the top of the bounding box. */
export function screenRowOf(layout: MapLayout, gridY: number): number {
  return layout.yUp ? layout.grid.maxY - gridY : gridY - layout.grid.minY;
}

/** Top-left corner of a die's cell on the canvas. */
export function cellCorner(layout: MapLayout, gridX: number, gridY: number): { x: number; y: number } {
  return {
    x: layout.left + (gridX - layout.grid.minX) * layout.cell,
    y: layout.top + screenRowOf(layout, gridY) * layout.cell,
  };
}

/** Integer grid coordinates of the cell under a canvas point (may be outside the grid). */
export function cellAtPoint(layout: MapLayout, px: number, py: number): { x: number; y: number } {
  const column = Math.floor((px - layout.left) / layout.cell);
  const row = Math.floor((py - layout.top) / layout.cell);
  return {
    x: layout.grid.minX + column,
    y: layout.yUp ? layout.grid.maxY - row : layout.grid.minY + row,
  };
}

/**
 * Affine map from die coordinates to the canvas point at the die's cell centre, as
 * [ax, bx, ay, by]: px = ax + bx * x, py = ay + by * y. Published on the canvas for automation.
 */
export function dieCentreTransform(layout: MapLayout): [number, number, number, number] {
  const ax = layout.left + (0.5 - layout.grid.minX) * layout.cell;
  const ay = layout.yUp
    ? layout.top + (layout.grid.maxY + 0.5) * layout.cell
    : layout.top + (0.5 - layout.grid.minY) * layout.cell;
  return [ax, layout.cell, ay, layout.yUp ? -layout.cell : layout.cell];
}

/** Zoom and pan of the map view: screen = centre + (unzoomed - centre) * zoom + pan. */
export interface MapView {
  zoom: number;
  panX: number;
  panY: number;
}

export const IDENTITY_VIEW: MapView = { zoom: 1, panX: 0, panY: 0 };
export const MIN_ZOOM = 1;
export const MAX_ZOOM = 40;

/** The layout seen through a zoom and pan about the canvas centre (width/2, height/2). */
export function viewedLayout(base: MapLayout, view: MapView, width: number, height: number): MapLayout {
  if (view.zoom === 1 && view.panX === 0 && view.panY === 0) return base;
  const cx = width / 2, cy = height / 2;
  const sx = (v: number) => cx + (v - cx) * view.zoom + view.panX;
  const sy = (v: number) => cy + (v - cy) * view.zoom + view.panY;
  return {
    ...base,
    cell: base.cell * view.zoom,
    left: sx(base.left),
    top: sy(base.top),
    centreX: sx(base.centreX),
    centreY: sy(base.centreY),
    radius: base.radius * view.zoom,
  };
}

/** New view after zooming by `factor` while keeping the screen point (px, py) where it is. */
export function zoomAbout(view: MapView, factor: number, px: number, py: number, width: number, height: number): MapView {
  const zoom = Math.min(MAX_ZOOM, Math.max(MIN_ZOOM, view.zoom * factor));
  if (zoom === MIN_ZOOM) return { ...IDENTITY_VIEW };
  const cx = width / 2, cy = height / 2;
  // The unzoomed point under the cursor, then the pan that puts it back under the cursor.
  const bx = cx + (px - cx - view.panX) / view.zoom;
  const by = cy + (py - cy - view.panY) / view.zoom;
  return { zoom, panX: px - cx - (bx - cx) * zoom, panY: py - cy - (by - cy) * zoom };
}
