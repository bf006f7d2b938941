// Zone statistics of one parameter: by ring (radial profile), sector, quadrant and position within
// the exposure field. Each zone gets the same summary as everywhere else (summarize: n, mean,
// sigma, type 7 quartiles, median, robust sigma); a reticle-repeating offset shows as one shot
// position whose median sits away from the wafer's.

import { summarize, type SummaryStatistics } from '../stats';
import type { DiePlacement } from './geometry';

export interface ZoneSummary {
  /** Zone number (ring, sector, quadrant, or shot position column + shotX * row). */
  zone: number;
  /** Dies in the zone (all, including missing values). */
  dies: number;
  /** Statistics of the zone's finite values; undefined when it has none. */
  summary: SummaryStatistics | undefined;
  /** Zone median minus wafer median, in the parameter's unit (NaN when either is missing). */
  medianOffset: number;
}

export interface RingSummary extends ZoneSummary {
  /** Radius fractions bounding the ring: [from, to); the last ring runs to Infinity. */
  fromFraction: number;
  toFraction: number;
}

export interface SectorSummary extends ZoneSummary {
  fromDeg: number;
  toDeg: number;
}

export interface ShotPositionSummary extends ZoneSummary {
  shotColumn: number;
  shotRow: number;
}

export interface SpatialProfile {
  wafer: SummaryStatistics | undefined;
  rings: RingSummary[];
  sectors: SectorSummary[];
  quadrants: SectorSummary[];
  shotPositions: ShotPositionSummary[];
}

/**
 * Summaries of `values` grouped by `zone` (0..zoneCount-1; other numbers are skipped). One
 * gathering pass and one summarize per zone: O(n) expected.
 */
export function zoneSummaries(values: ArrayLike<number>, zone: Int32Array, zoneCount: number, waferMedian = NaN): ZoneSummary[] {
  if (values.length !== zone.length) throw new RangeError('values and zone must have one entry per die');
  const counts = new Int32Array(zoneCount);
  for (let i = 0; i < zone.length; i++) if (zone[i] >= 0 && zone[i] < zoneCount) counts[zone[i]]++;
  const buckets = Array.from(counts, (c) => new Float64Array(c));
  const fill = new Int32Array(zoneCount);
  for (let i = 0; i < zone.length; i++) {
    const k = zone[i];
    if (k >= 0 && k < zoneCount) buckets[k][fill[k]++] = values[i];
  }
  return buckets.map((bucket, k) => {
    const summary = summarize(bucket);
    return { zone: k, dies: counts[k], summary, medianOffset: summary ? summary.median - waferMedian : NaN };
  });
}

/** Radial profile, sector, quadrant and within-shot statistics of one parameter. */
export function spatialProfile(values: ArrayLike<number>, placement: DiePlacement): SpatialProfile {
  const { geometry } = placement;
  const wafer = summarize(values);
  const median = wafer ? wafer.median : NaN;
  const edges = geometry.ringEdges;
  const rings = zoneSummaries(values, placement.ring, edges.length + 1, median).map((z, k): RingSummary => ({
    ...z, fromFraction: k === 0 ? 0 : edges[k - 1], toFraction: k < edges.length ? edges[k] : Infinity,
  }));
  const width = 360 / geometry.sectorCount;
  const sectors = zoneSummaries(values, placement.sector, geometry.sectorCount, median).map((z, k): SectorSummary => ({
    ...z, fromDeg: k * width, toDeg: (k + 1) * width,
  }));
  const quadrants = zoneSummaries(values, placement.quadrant, 4, median).map((z, k): SectorSummary => ({
    ...z, fromDeg: k * 90, toDeg: (k + 1) * 90,
  }));
  const position = new Int32Array(values.length);
  for (let i = 0; i < position.length; i++) position[i] = placement.shotColumn[i] + geometry.shotX * placement.shotRow[i];
  const shotPositions = zoneSummaries(values, position, geometry.shotX * geometry.shotY, median).map((z, k): ShotPositionSummary => ({
    ...z, shotColumn: k % geometry.shotX, shotRow: Math.floor(k / geometry.shotX),
  }));
  return { wafer, rings, sectors, quadrants, shotPositions };
}

/** AEC-Q001 Rev-D's robust sigma constant: robust sigma = (Q3 - Q1) / 1.35, the project's one sigma for flags. */
const AEC_IQR_PER_SIGMA = 1.35;

/**
 * Flags for a deviation map: dies whose robust z, (value - median) / robust sigma with robust
 * sigma = (Q3 - Q1) / 1.35 (AEC-Q001 Rev-D; type 7 quartiles), exceeds `limit` in the chosen
 * direction. Lets the labeller read a parameter's map when no flags are at hand. Missing values
 * are not flagged.
 */
export function deviationFlags(values: ArrayLike<number>, limit = 3, direction: 'high' | 'low' | 'both' = 'both'): Uint8Array {
  const flags = new Uint8Array(values.length);
  const s = summarize(values);
  const sigma = s ? (s.q3 - s.q1) / AEC_IQR_PER_SIGMA : NaN;
  if (!s || !(sigma > 0)) return flags;
  for (let i = 0; i < values.length; i++) {
    const z = (values[i] - s.median) / sigma;
    if (!Number.isFinite(z)) continue;
    if ((direction !== 'low' && z > limit) || (direction !== 'high' && z < -limit)) flags[i] = 1;
  }
  return flags;
}
