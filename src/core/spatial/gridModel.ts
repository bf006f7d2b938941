// What labelling needs from a die grid alone, whatever is flagged: positions, the neighbour
// lookup, the join counts and the lattice residues. The wafers of a lot share one grid, so the
// last grid's model is kept and reused while the next wafer's x, y and geometry are the same.

import { buildDieGrid, type DieGrid } from './dieGrid';
import { positionBuffers, positionDies, type DiePositions, type WaferGeometry } from './geometry';
import { gridJoins, type GridJoins } from './joinCount';
import { residueClasses } from './repeatingPattern';

export interface GridModel {
  positions: DiePositions;
  grid: DieGrid;
  joins: GridJoins;
  /** x mod 12 + 12 (y mod 12) per die, for the lattice search. */
  residues: Uint8Array;
}

interface Cached { x: Int32Array; y: Int32Array; geometryKey: string; model: GridModel }

let last: Cached | undefined;

function sameGrid(cached: Cached, x: Int32Array, y: Int32Array, geometryKey: string): boolean {
  if (cached.geometryKey !== geometryKey || cached.x.length !== x.length) return false;
  const cx = cached.x;
  const cy = cached.y;
  for (let i = 0; i < x.length; i++) if (cx[i] !== x[i] || cy[i] !== y[i]) return false;
  return true;
}

/**
 * The model of this grid: the cached one when x, y and the given geometry match the last call's
 * (compared value by value, O(n)), else a new one, which replaces it and reuses its position
 * buffers. Callers must not keep the model's arrays past the next call.
 */
export function gridModel(x: Int32Array, y: Int32Array, given: Partial<WaferGeometry> = {}): GridModel {
  const geometryKey = JSON.stringify(given);
  if (last && sameGrid(last, x, y, geometryKey)) return last.model;
  const buffers = positionBuffers(x.length, last?.model.positions);
  last = undefined; // the buffers are being rewritten: the old model is gone either way
  const positions = positionDies(x, y, given, buffers);
  const grid = buildDieGrid(x, y);
  const model: GridModel = { positions, grid, joins: gridJoins(x, y, grid), residues: residueClasses(x, y, 12, 12) };
  last = { x: Int32Array.from(x), y: Int32Array.from(y), geometryKey, model };
  return model;
}
