// Do flagged dies sit next to each other more than chance would put them? The join-count
// statistic (P. A. P. Moran, "The interpretation of statistical maps", J. R. Stat. Soc. B 10, 1948;
// A. D. Cliff and J. K. Ord, "Spatial Autocorrelation", 1973) on the 8-neighbour die grid.

import type { DieGrid } from './dieGrid';

export interface JoinCount {
  /** Pairs of neighbouring dies present on the grid. */
  joins: number;
  /** Of those, pairs where both dies are flagged. */
  flaggedJoins: number;
  /** Expected flagged pairs if the same number of flagged dies were placed at random (non-free sampling). */
  expected: number;
  /** Standard deviation of that count under the same model. */
  sd: number;
  /** (flaggedJoins - expected) / sd: near 0 for a random scatter, large for clumps, negative for a lattice. */
  z: number;
}

/**
 * Flagged-flagged join count and its z-score under non-free sampling: the k flagged dies of n
 * placed at random, every placement equally likely (Cliff & Ord's randomisation hypothesis). With
 * J joins, d_i neighbours of die i and pi_m = k(k-1)..(k-m+1) / (n(n-1)..(n-m+1)), the chance that
 * m given dies are all flagged: E = J pi_2 and
 * Var = J pi_2 + sum_i d_i (d_i - 1) pi_3 + (J^2 - J - sum_i d_i (d_i - 1)) pi_4 - (J pi_2)^2
 * [derived by counting pairs of joins that are equal, share one die, or share none; it equals
 * Cliff & Ord's BB variance with S0 = 2J, S1 = 4J, S2 = 4 sum d_i^2]. O(n).
 */
export function joinCount(flagged: Uint8Array, x: Int32Array, y: Int32Array, grid: DieGrid, joins: GridJoins = gridJoins(x, y, grid)): JoinCount {
  const n = x.length;
  const flaggedJoins = countFlaggedJoins(flagged, x, y, grid);
  const k = countFlagged(flagged);
  const pi2 = n < 2 ? 0 : (k * (k - 1)) / (n * (n - 1));
  const pi3 = n < 3 ? 0 : (pi2 * (k - 2)) / (n - 2);
  const pi4 = n < 4 ? 0 : (pi3 * (k - 3)) / (n - 3);
  const { joins: j, sharedPairs } = joins;
  const expected = j * pi2;
  const variance = j * pi2 + sharedPairs * pi3 + (j * j - j - sharedPairs) * pi4 - expected * expected;
  const sd = Math.sqrt(Math.max(0, variance));
  const z = sd > 0 ? (flaggedJoins - expected) / sd : 0;
  return { joins: j, flaggedJoins, expected, sd, z };
}

/** The part of the statistic that depends on the grid only. */
export interface GridJoins {
  /** Neighbouring pairs of dies. */
  joins: number;
  /** Ordered pairs of joins sharing a die: sum of d_i (d_i - 1). */
  sharedPairs: number;
}

// The loops live in small functions of their own: V8 then optimises each whole, rather than
// compiling a long loop mid-run and falling back when it reaches the code after it.

/** Joins of the grid, each found once from its lower-left end (right, up-left, up, up-right), and the shared pairs. */
export function gridJoins(x: Int32Array, y: Int32Array, grid: DieGrid): GridJoins {
  const { cell, width, height, minX, minY } = grid;
  const degree = new Uint8Array(x.length); // at most 8 neighbours
  let joins = 0;
  for (let i = 0; i < x.length; i++) {
    const gx = x[i] - minX;
    const gy = y[i] - minY;
    if (cell[gx + gy * width] !== i) continue; // a repeated position: the grid keeps the later die
    const row = gy * width;
    const upRow = gy + 1 < height ? row + width : -1;
    if (gx + 1 < width) {
      const other = cell[row + gx + 1];
      if (other >= 0) { joins++; degree[i]++; degree[other]++; }
    }
    if (upRow >= 0) {
      for (let dx = -1; dx <= 1; dx++) {
        const nx = gx + dx;
        if (nx < 0 || nx >= width) continue;
        const other = cell[upRow + nx];
        if (other >= 0) { joins++; degree[i]++; degree[other]++; }
      }
    }
  }
  let sharedPairs = 0;
  for (let i = 0; i < degree.length; i++) sharedPairs += degree[i] * (degree[i] - 1);
  return { joins, sharedPairs };
}

/** Joins whose two dies are both flagged, found from the lower-left end as in gridJoins. */
function countFlaggedJoins(flagged: Uint8Array, x: Int32Array, y: Int32Array, grid: DieGrid): number {
  const { cell, width, height, minX, minY } = grid;
  let count = 0;
  for (let i = 0; i < x.length; i++) {
    if (!flagged[i]) continue;
    const gx = x[i] - minX;
    const gy = y[i] - minY;
    if (cell[gx + gy * width] !== i) continue;
    const row = gy * width;
    if (gx + 1 < width) {
      const other = cell[row + gx + 1];
      if (other >= 0 && flagged[other]) count++;
    }
    if (gy + 1 < height) {
      const upRow = row + width;
      for (let dx = -1; dx <= 1; dx++) {
        const nx = gx + dx;
        if (nx < 0 || nx >= width) continue;
        const other = cell[upRow + nx];
        if (other >= 0 && flagged[other]) count++;
      }
    }
  }
  return count;
}

/** Number of flagged dies (non-zero entries). */
export function countFlagged(flagged: Uint8Array): number {
  let total = 0;
  for (let i = 0; i < flagged.length; i++) if (flagged[i]) total++;
  return total;
}
