// Dense lookup from die-grid position to die index, so neighbour questions cost O(1).

export interface DieGrid {
  minX: number;
  minY: number;
  width: number;
  height: number;
  /** Die index at (x - minX) + (y - minY) * width, or -1 where the grid has no die. */
  cell: Int32Array;
}

/** The 8-neighbour offsets (king moves), the connectivity DOMAIN.md uses for clusters. */
export const NEIGHBOUR_OFFSETS: readonly (readonly [number, number])[] = [
  [-1, -1], [0, -1], [1, -1], [-1, 0], [1, 0], [-1, 1], [0, 1], [1, 1],
];

/** Builds the lookup; a position listed twice keeps its last die (a retest is written later). */
export function buildDieGrid(x: Int32Array, y: Int32Array): DieGrid {
  if (x.length === 0) return { minX: 0, minY: 0, width: 0, height: 0, cell: new Int32Array(0) };
  const ex = extentOf(x);
  const ey = extentOf(y);
  const width = ex.max - ex.min + 1;
  const height = ey.max - ey.min + 1;
  if (width * height > 50_000_000) throw new RangeError('die grid extent is too large for a wafer map');
  const cell = new Int32Array(width * height).fill(-1);
  fillCells(cell, x, y, ex.min, ey.min, width);
  return { minX: ex.min, minY: ey.min, width, height, cell };
}

/** Smallest and largest value of an integer column (Infinity / -Infinity when empty). */
export function extentOf(values: Int32Array): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max };
}

function fillCells(cell: Int32Array, x: Int32Array, y: Int32Array, minX: number, minY: number, width: number): void {
  for (let i = 0; i < x.length; i++) cell[x[i] - minX + (y[i] - minY) * width] = i;
}

/** Die index at grid position (gx, gy) relative to minX/minY, or -1 outside the grid. */
export function dieAt(grid: DieGrid, gx: number, gy: number): number {
  if (gx < 0 || gy < 0 || gx >= grid.width || gy >= grid.height) return -1;
  return grid.cell[gx + gy * grid.width];
}
