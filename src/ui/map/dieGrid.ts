// The die grid of one wafer: the bounding box of die coordinates and an index from grid cell to
// die, so the die under the mouse is found in O(1) whatever the die count.

import { extentOf } from '../../core/spatial/dieGrid';

export interface DieGrid {
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
  /** Columns and rows of the bounding box. */
  columns: number;
  rows: number;
  /** Die index per cell (column + row * columns, row counted from minY), -1 for empty cells. */
  cellToDie: Int32Array;
  /** Cells that hold a die. Two dies on one cell count once (the later one is shown). */
  occupiedCells: number;
  /** Wafer centre in grid units (centre of the bounding box). */
  centreX: number;
  centreY: number;
  /** Radius in grid units of the smallest circle around the centre that holds every die cell. */
  radius: number;
}

/** Grids larger than this are refused: coordinates that far apart are not a die grid. */
export const MAX_GRID_CELLS = 16_000_000;

export function buildDieGrid(x: Int32Array, y: Int32Array): DieGrid {
  const n = x.length;
  const { min: minX, max: maxX } = extentOf(x);
  const { min: minY, max: maxY } = extentOf(y);
  if (n === 0) {
    return { minX: 0, maxX: -1, minY: 0, maxY: -1, columns: 0, rows: 0, cellToDie: new Int32Array(0),
      occupiedCells: 0, centreX: 0, centreY: 0, radius: 1 };
  }
  const columns = maxX - minX + 1;
  const rows = maxY - minY + 1;
  if (columns * rows > MAX_GRID_CELLS) {
    throw new Error(`The die coordinates span ${columns} x ${rows} cells, too many for a wafer map`);
  }
  const cellToDie = new Int32Array(columns * rows).fill(-1);
  let occupiedCells = 0;
  const centreX = (minX + maxX) / 2;
  const centreY = (minY + maxY) / 2;
  let radiusSquared = 0;
  for (let i = 0; i < n; i++) {
    const cell = (x[i] - minX) + (y[i] - minY) * columns;
    if (cellToDie[cell] < 0) occupiedCells++;
    cellToDie[cell] = i;
    // Far corner of the die's cell from the centre (cells are 1 x 1 around the die's coordinate).
    const dx = Math.abs(x[i] - centreX) + 0.5;
    const dy = Math.abs(y[i] - centreY) + 0.5;
    const d2 = dx * dx + dy * dy;
    if (d2 > radiusSquared) radiusSquared = d2;
  }
  return { minX, maxX, minY, maxY, columns, rows, cellToDie, occupiedCells, centreX, centreY,
    radius: Math.sqrt(radiusSquared) };
}

/** The die at integer grid coordinates, or -1. */
export function dieAtCell(grid: DieGrid, gridX: number, gridY: number): number {
  const column = gridX - grid.minX;
  const row = gridY - grid.minY;
  if (column < 0 || row < 0 || column >= grid.columns || row >= grid.rows) return -1;
  return grid.cellToDie[column + row * grid.columns];
}

/** Dies whose cells lie in the inclusive grid box, in cell order. */
export function diesInCellBox(grid: DieGrid, x0: number, x1: number, y0: number, y1: number): number[] {
  const found: number[] = [];
  const fromX = Math.max(grid.minX, Math.min(x0, x1));
  const toX = Math.min(grid.maxX, Math.max(x0, x1));
  const fromY = Math.max(grid.minY, Math.min(y0, y1));
  const toY = Math.min(grid.maxY, Math.max(y0, y1));
  for (let gy = fromY; gy <= toY; gy++) {
    for (let gx = fromX; gx <= toX; gx++) {
      const die = grid.cellToDie[(gx - grid.minX) + (gy - grid.minY) * grid.columns];
      if (die >= 0) found.push(die);
    }
  }
  return found;
}
