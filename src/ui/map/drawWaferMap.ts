// Canvas drawing of a wafer map. Dies go into a one-pixel-per-cell image that is scaled up with
// nearest-neighbour sampling in a single drawImage, so 70,000 dies cost one pass over a typed
// array instead of 70,000 canvas calls. Marks (selection, flags) go on a second canvas above, so
// changing the selection never redraws the dies.

import type { DieGrid } from './dieGrid';
import type { MapLayout } from './mapLayout';
import { cellCorner } from './mapLayout';
import type { ColourScale } from './colorScale';
import { rampStepOf } from './colorScale';

export interface MapTheme {
  background: string;
  waferFill: string;
  waferEdge: string;
  missing: [number, number, number];
  selection: string;
  selectionHalo: string;
  flag: string;
  flagHalo: string;
}

/** Reads the map colours from CSS variables on an element (see styles.css). */
export function readMapTheme(element: Element): MapTheme {
  const style = getComputedStyle(element);
  const read = (name: string, fallback: string) => style.getPropertyValue(name).trim() || fallback;
  return {
    background: read('--map-background', '#ffffff'),
    waferFill: read('--map-wafer-fill', '#eef1f5'),
    waferEdge: read('--map-wafer-edge', '#5b6473'),
    missing: parseRgb(read('--map-missing', '#b9bcc2')),
    selection: read('--map-selection', '#111111'),
    selectionHalo: read('--map-selection-halo', '#ffffff'),
    flag: read('--map-flag', '#e0218a'),
    flagHalo: read('--map-flag-halo', '#ffffff'),
  };
}

/** "#rgb", "#rrggbb" or "rgb(r, g, b)" to numbers; mid grey when unreadable. */
export function parseRgb(text: string): [number, number, number] {
  const hex = /^#([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(text.trim());
  if (hex) {
    const h = hex[1].length === 3 ? hex[1].replace(/./g, (c) => c + c) : hex[1];
    return [parseInt(h.slice(0, 2), 16), parseInt(h.slice(2, 4), 16), parseInt(h.slice(4, 6), 16)];
  }
  const rgb = /rgba?\(\s*(\d+)[\s,]+(\d+)[\s,]+(\d+)/i.exec(text);
  if (rgb) return [Number(rgb[1]), Number(rgb[2]), Number(rgb[3])];
  return [128, 128, 128];
}

/** Sizes a canvas's backing store to its CSS box times the device pixel ratio. */
export function prepareCanvas(canvas: HTMLCanvasElement, width: number, height: number): CanvasRenderingContext2D {
  const ratio = window.devicePixelRatio || 1;
  const pixelWidth = Math.max(1, Math.round(width * ratio));
  const pixelHeight = Math.max(1, Math.round(height * ratio));
  if (canvas.width !== pixelWidth) canvas.width = pixelWidth;
  if (canvas.height !== pixelHeight) canvas.height = pixelHeight;
  const context = canvas.getContext('2d');
  if (!context) throw new Error('This browser gives no 2D canvas');
  context.setTransform(ratio, 0, 0, ratio, 0, 0);
  context.clearRect(0, 0, width, height);
  return context;
}

let dieImageCanvas: HTMLCanvasElement | undefined;

/** Paints every occupied cell into an image of columns x rows pixels; returns cells painted. */
function paintDieImage(grid: DieGrid, values: Float64Array | undefined, scale: ColourScale | undefined,
  table: Uint8ClampedArray, theme: MapTheme, yUp: boolean): { image: HTMLCanvasElement; painted: number } {
  const image = dieImageCanvas ?? (dieImageCanvas = document.createElement('canvas'));
  image.width = Math.max(1, grid.columns);
  image.height = Math.max(1, grid.rows);
  const context = image.getContext('2d');
  if (!context) throw new Error('This browser gives no 2D canvas');
  const pixels = context.createImageData(image.width, image.height);
  const data = pixels.data;
  const [mr, mg, mb] = theme.missing;
  let painted = 0;
  for (let gridRow = 0; gridRow < grid.rows; gridRow++) {
    const screenRow = yUp ? grid.rows - 1 - gridRow : gridRow;
    for (let column = 0; column < grid.columns; column++) {
      const die = grid.cellToDie[column + gridRow * grid.columns];
      if (die < 0) continue;
      const at = (column + screenRow * grid.columns) * 4;
      const step = values && scale ? rampStepOf(values[die], scale) : -1;
      if (step < 0) {
        data[at] = mr; data[at + 1] = mg; data[at + 2] = mb;
      } else {
        data[at] = table[step * 4]; data[at + 1] = table[step * 4 + 1]; data[at + 2] = table[step * 4 + 2];
      }
      data[at + 3] = 255;
      painted++;
    }
  }
  context.putImageData(pixels, 0, 0);
  return { image, painted };
}

function waferPath(context: CanvasRenderingContext2D, layout: MapLayout): void {
  context.beginPath();
  context.arc(layout.centreX, layout.centreY, layout.radius, 0, Math.PI * 2);
}

/** Half-width of the notch V in CSS pixels. */
function notchSize(layout: MapLayout): number {
  return Math.max(5, layout.radius * 0.035);
}

export type NotchSide = 'down' | 'up' | 'left' | 'right';

/** Rotation that takes the bottom of the wafer to the notch side (canvas angles, clockwise). */
const NOTCH_ANGLE: Record<NotchSide, number> = { down: 0, left: Math.PI / 2, up: Math.PI, right: -Math.PI / 2 };

export interface BaseDrawing {
  /** Die cells actually painted. */
  painted: number;
  milliseconds: number;
}

/** Draws wafer disc, dies, cell gaps, outline and the notch at 6 o'clock. */
export function drawWaferBase(canvas: HTMLCanvasElement, width: number, height: number, layout: MapLayout,
  values: Float64Array | undefined, scale: ColourScale | undefined, table: Uint8ClampedArray,
  theme: MapTheme, notch: NotchSide = 'down'): BaseDrawing {
  const started = performance.now();
  const context = prepareCanvas(canvas, width, height);
  const { grid, cell } = layout;
  context.fillStyle = theme.background;
  context.fillRect(0, 0, width, height);
  waferPath(context, layout);
  context.fillStyle = theme.waferFill;
  context.fill();

  const { image, painted } = paintDieImage(grid, values, scale, table, theme, layout.yUp);
  context.imageSmoothingEnabled = false;
  context.drawImage(image, layout.left, layout.top, grid.columns * cell, grid.rows * cell);

  // Thin gaps between cells once cells are big enough to read them as separate dies.
  const ratio = window.devicePixelRatio || 1;
  if (cell * ratio >= 6) {
    context.save();
    waferPath(context, layout);
    context.clip();
    context.beginPath();
    for (let column = 0; column <= grid.columns; column++) {
      const x = layout.left + column * cell;
      context.moveTo(x, layout.top);
      context.lineTo(x, layout.top + grid.rows * cell);
    }
    for (let row = 0; row <= grid.rows; row++) {
      const y = layout.top + row * cell;
      context.moveTo(layout.left, y);
      context.lineTo(layout.left + grid.columns * cell, y);
    }
    context.strokeStyle = theme.waferFill;
    context.lineWidth = Math.max(1 / ratio, Math.min(2, cell * 0.08));
    context.stroke();
    context.restore();
  }

  waferPath(context, layout);
  context.strokeStyle = theme.waferEdge;
  context.lineWidth = 1.5;
  context.stroke();

  // Notch: a small V cut into the edge, drawn at the bottom of a frame turned to the notch side.
  const half = notchSize(layout);
  const bottom = layout.centreY + layout.radius;
  context.save();
  context.translate(layout.centreX, layout.centreY);
  context.rotate(NOTCH_ANGLE[notch]);
  context.translate(-layout.centreX, -layout.centreY);
  context.beginPath();
  context.moveTo(layout.centreX - half, bottom + 1);
  context.lineTo(layout.centreX, bottom - half * 1.2);
  context.lineTo(layout.centreX + half, bottom + 1);
  context.closePath();
  context.fillStyle = theme.background;
  context.fill();
  context.beginPath();
  context.moveTo(layout.centreX - half, bottom - 0.2);
  context.lineTo(layout.centreX, bottom - half * 1.2);
  context.lineTo(layout.centreX + half, bottom - 0.2);
  context.strokeStyle = theme.waferEdge;
  context.lineWidth = 1.5;
  context.stroke();
  context.restore();
  return { painted, milliseconds: performance.now() - started };
}

/** Cells at least this wide (CSS px) show a flagged die as a corner mark, smaller ones as a ring. */
export const CORNER_MARK_MIN_CELL = 7;

export type FlagMark = 'corner' | 'ring';

export function flagMarkFor(cell: number): FlagMark {
  return cell >= CORNER_MARK_MIN_CELL ? 'corner' : 'ring';
}

/**
 * Draws the marks: a flagged die gets a thin outline inside its cell and a triangle in the
 * top-right corner (the die's colour stays visible, even in a cluster of flagged dies) or, on
 * cells too small for that, a ring around the cell; selected dies get a thicker dark outline
 * around the cell.
 */
export function drawWaferMarks(canvas: HTMLCanvasElement, width: number, height: number, layout: MapLayout,
  x: Int32Array, y: Int32Array, selected: Iterable<number>, flagged: readonly number[], theme: MapTheme,
  options: MarkOptions = {}): void {
  const context = prepareCanvas(canvas, width, height);
  options.beforeFlags?.(context);
  const groups = options.flagGroups ?? [{ colour: theme.flag, dies: flagged }];
  for (const group of groups) drawFlagGroup(context, layout, x, y, group.dies, { ...theme, flag: group.colour });
  drawSelection(context, layout, x, y, selected, theme);
}

export interface MarkOptions {
  /** Flagged dies by colour (mechanism); without it every flagged die takes the theme's flag colour. */
  flagGroups?: { colour: string; dies: readonly number[] }[];
  /** Drawn first, under the flags and the selection (zone rings, reticle grid, probe sites). */
  beforeFlags?: (context: CanvasRenderingContext2D) => void;
}

function drawFlagGroup(context: CanvasRenderingContext2D, layout: MapLayout, x: Int32Array, y: Int32Array,
  flagged: readonly number[], theme: MapTheme): void {
  const cell = layout.cell;
  if (flagged.length) {
    const mark = flagMarkFor(cell);
    const side = Math.max(3, cell * 0.4);
    const ringRadius = Math.max(3.5, cell * 0.9);
    context.beginPath();
    for (const die of flagged) {
      if (die < 0 || die >= x.length) continue;
      const corner = cellCorner(layout, x[die], y[die]);
      if (mark === 'corner') {
        const right = corner.x + cell;
        context.moveTo(right - side, corner.y);
        context.lineTo(right, corner.y);
        context.lineTo(right, corner.y + side);
        context.closePath();
      } else {
        const cx = corner.x + cell / 2;
        const cy = corner.y + cell / 2;
        context.moveTo(cx + ringRadius, cy);
        context.arc(cx, cy, ringRadius, 0, Math.PI * 2);
      }
    }
    if (mark === 'corner') {
      context.fillStyle = theme.flag;
      context.fill();
      // And a thin outline just inside the cell, so a flagged cluster shows its edge.
      context.beginPath();
      for (const die of flagged) {
        if (die < 0 || die >= x.length) continue;
        const corner = cellCorner(layout, x[die], y[die]);
        context.rect(corner.x + 1, corner.y + 1, cell - 2, cell - 2);
      }
      context.strokeStyle = theme.flag;
      context.lineWidth = 0.8;
      context.stroke();
    } else {
      context.strokeStyle = theme.flagHalo;
      context.lineWidth = 3;
      context.stroke();
      context.strokeStyle = theme.flag;
      context.lineWidth = 1.5;
      context.stroke();
    }
  }
}

function drawSelection(context: CanvasRenderingContext2D, layout: MapLayout, x: Int32Array, y: Int32Array,
  selected: Iterable<number>, theme: MapTheme): void {
  const cell = layout.cell;
  // Outlines grow by a pixel on small cells so that a single selected die is still seen.
  const grow = cell < 6 ? 1.5 : 0;
  const path = new Path2D();
  let any = false;
  for (const die of selected) {
    if (die < 0 || die >= x.length) continue;
    const corner = cellCorner(layout, x[die], y[die]);
    path.rect(corner.x - grow, corner.y - grow, cell + 2 * grow, cell + 2 * grow);
    any = true;
  }
  if (any) {
    context.strokeStyle = theme.selectionHalo;
    context.lineWidth = 3;
    context.stroke(path);
    context.strokeStyle = theme.selection;
    context.lineWidth = 1.5;
    context.stroke(path);
  }
}
