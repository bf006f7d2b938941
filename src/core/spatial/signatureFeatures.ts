// The measurements the signature rules read, each one pass over the dies. Each loop is a small
// function of its own: V8 then optimises it whole, rather than compiling a long loop mid-run and
// falling back when it reaches the code after it.

import type { DiePositions } from './geometry';

/** A sector counts as covered when at least this share of its dies is marked. */
export const SECTOR_COVERED = 0.3;
export const RADIAL_BINS = 10;

/** Share of dies marked in ten equal rings of radius fraction (the last takes everything beyond 0.9). */
export function radialDensity(mask: Uint8Array, placement: DiePositions): number[] {
  const dies = new Float64Array(RADIAL_BINS);
  const hits = new Float64Array(RADIAL_BINS);
  for (let i = 0; i < mask.length; i++) {
    const bin = Math.min(RADIAL_BINS - 1, Math.floor(placement.radiusFraction[i] * RADIAL_BINS));
    dies[bin]++;
    if (mask[i]) hits[bin]++;
  }
  return Array.from(dies, (d, k) => (d > 0 ? hits[k] / d : 0));
}

/** Share of the sectors holding dies whose marked share is at least SECTOR_COVERED (0 with none). */
function coveredShare(dies: Float64Array, hits: Float64Array): number {
  let used = 0;
  let covered = 0;
  for (let k = 0; k < dies.length; k++) {
    if (dies[k] === 0) continue;
    used++;
    if (hits[k] / dies[k] >= SECTOR_COVERED) covered++;
  }
  return used > 0 ? covered / used : 0;
}

export interface AngularFeatures { coverage: number; sectors: number; concentration: number }

/** In the radial band [low, high]: the share of angular sectors at least 30 % marked, and how concentrated the marked dies' angles are. */
export function angularFeatures(signal: Uint8Array, placement: DiePositions, low: number, high: number): AngularFeatures {
  const bandDies = countInBand(placement.radiusFraction, low, high);
  // About eight dies a sector, 8 to 24 sectors: enough dies for a density, enough sectors for a shape.
  const sectors = Math.max(8, Math.min(24, Math.floor(bandDies / 8)));
  const dies = new Float64Array(sectors);
  const hits = new Float64Array(sectors);
  countBySector(signal, placement, low, high, dies, hits);
  return { coverage: coveredShare(dies, hits), sectors, concentration: meanResultantLength(signal, placement.angleDeg) };
}

function countInBand(radiusFraction: Float64Array, low: number, high: number): number {
  let count = 0;
  for (let i = 0; i < radiusFraction.length; i++) if (radiusFraction[i] >= low && radiusFraction[i] <= high) count++;
  return count;
}

function countBySector(signal: Uint8Array, placement: DiePositions, low: number, high: number, dies: Float64Array, hits: Float64Array): void {
  const { radiusFraction, angleDeg } = placement;
  const sectors = dies.length;
  for (let i = 0; i < signal.length; i++) {
    if (radiusFraction[i] < low || radiusFraction[i] > high) continue;
    const k = Math.min(sectors - 1, Math.floor((angleDeg[i] / 360) * sectors));
    dies[k]++;
    if (signal[i]) hits[k]++;
  }
}

/** Mean resultant length of the angles of the marked dies (Mardia & Jupp, Directional Statistics, 2000). */
function meanResultantLength(mask: Uint8Array, angleDeg: Float64Array): number {
  let cs = 0;
  let sn = 0;
  let count = 0;
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    const a = (angleDeg[i] * Math.PI) / 180;
    cs += Math.cos(a);
    sn += Math.sin(a);
    count++;
  }
  return count > 0 ? Math.hypot(cs, sn) / count : 0;
}

/** Share of the dies inside `radius` and of the edge dies that are marked. */
export function centreAndEdgeDensity(mask: Uint8Array, placement: DiePositions, radius: number): { centre: number; edge: number } {
  const { radiusFraction, edge } = placement;
  let centreDies = 0;
  let centreHits = 0;
  let edgeDies = 0;
  let edgeHits = 0;
  for (let i = 0; i < mask.length; i++) {
    if (radiusFraction[i] < radius) { centreDies++; centreHits += mask[i]; }
    if (edge[i]) { edgeDies++; edgeHits += mask[i]; }
  }
  return { centre: centreDies > 0 ? centreHits / centreDies : 0, edge: edgeDies > 0 ? edgeHits / edgeDies : 0 };
}

/** Flag rate on the edge dies, on the others, and the share of angular sectors whose edge dies are at least 30 % flagged. */
export function edgeFlags(mask: Uint8Array, placement: DiePositions): { rate: number; interiorRate: number; coverage: number } {
  const { edge, angleDeg } = placement;
  let edgeDies = 0;
  for (let i = 0; i < edge.length; i++) edgeDies += edge[i];
  // About five edge dies a sector, 8 to 24 sectors.
  const sectors = Math.max(8, Math.min(24, Math.floor(edgeDies / 5)));
  const dies = new Float64Array(sectors);
  const hits = new Float64Array(sectors);
  let edgeHits = 0;
  let interiorHits = 0;
  for (let i = 0; i < mask.length; i++) {
    if (!edge[i]) { interiorHits += mask[i] ? 1 : 0; continue; }
    const k = Math.min(sectors - 1, Math.floor((angleDeg[i] / 360) * sectors));
    dies[k]++;
    if (mask[i]) { hits[k]++; edgeHits++; }
  }
  const interiorDies = mask.length - edgeDies;
  return {
    rate: edgeDies > 0 ? edgeHits / edgeDies : 0,
    interiorRate: interiorDies > 0 ? interiorHits / interiorDies : 0,
    coverage: coveredShare(dies, hits),
  };
}

/** Writes the flags outside the repeating pattern's members into `mask`; returns how many were set aside. */
export function setAsideMembers(flagged: Uint8Array, members: Uint8Array, mask: Uint8Array): number {
  let removed = 0;
  for (let i = 0; i < flagged.length; i++) {
    if (flagged[i] && members[i]) removed++;
    else mask[i] = flagged[i] ? 1 : 0;
  }
  return removed;
}
