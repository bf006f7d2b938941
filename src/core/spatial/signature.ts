// One spatial signature per wafer from its flagged dies, in the vocabulary of Wu, Jang & Chen
// (IEEE Trans. Semiconductor Manufacturing 28(1), 2015): center, donut, edge-loc, edge-ring, loc,
// near-full, random, scratch, none. Deterministic rules on a handful of features an engineer can
// check on the map: how many dies are flagged, whether they clump (join count), where the clumps
// sit radially, how far round the wafer they reach, and whether the biggest clump is a line.

import { quantileSorted } from '../stats';
import { findClusters, type Cluster } from './clusters';
import type { WaferGeometry } from './geometry';
import { gridModel } from './gridModel';
import { countFlagged, joinCount, type JoinCount } from './joinCount';
import { findRepeatingPattern, type RepeatingPattern } from './repeatingPattern';
import { angularFeatures, centreAndEdgeDensity, edgeFlags, radialDensity, setAsideMembers } from './signatureFeatures';

export type SignatureLabel = 'center' | 'donut' | 'edge-loc' | 'edge-ring' | 'loc' | 'near-full' | 'random' | 'scratch' | 'none';

export const SIGNATURE_LABELS: readonly SignatureLabel[] = ['center', 'donut', 'edge-loc', 'edge-ring', 'loc', 'near-full', 'random', 'scratch', 'none'];

export interface LabelInput {
  x: Int32Array;
  y: Int32Array;
  /** 1 for a flagged die. */
  flagged: Uint8Array;
  /** Probe site per die (-1 or absent when unknown): lets a probe-site pattern be named as such. */
  site?: Int32Array;
  /** What is known of the wafer; the rest is inferred from the grid (see resolveGeometry). */
  geometry?: Partial<WaferGeometry>;
}

export interface SignatureEvidence {
  dies: number;
  flagged: number;
  /** Flags that follow one probe site or lattice class; they are set aside before the map is read. */
  repeating?: Omit<RepeatingPattern, 'members'> & { setAside: number };
  /** Flags left for the spatial reading, and their share of the dies. */
  analysedFlagged: number;
  analysedFraction: number;
  joinCount: JoinCount;
  /** Clusters smaller than this are treated as background scatter: 3 to 5 dies, or 0.1 % of the dies on a fine map. */
  minClusterSize: number;
  /** Dies in clusters of at least minClusterSize: the pattern the rules read. */
  clusterDies: number;
  /** Share of dies flagged in ten equal rings of radius fraction (0-0.1, ..., 0.9 and beyond), all analysed flags. */
  radialFlagDensity: number[];
  /** The same for cluster dies only. */
  radialClusterDensity: number[];
  /** Share of the dies within 0.15 of the usable radius that are cluster dies. */
  centreDensity: number;
  /** Share of the edge dies (outermost ring of the grid) that are cluster dies. */
  edgeDensity: number;
  /** All analysed flags: share of the edge dies flagged, of the other dies, and of the sectors whose edge dies are at least 30 % flagged. */
  edgeFlagRate: number;
  interiorFlagRate: number;
  edgeCoverage: number;
  /** Radius fractions of cluster dies: 10 %, 50 % and 90 % quantiles (type 7). */
  radiusQuantiles: { q10: number; q50: number; q90: number };
  /** In the radial band the clusters occupy, the share of angular sectors at least 30 % covered. */
  angularCoverage: number;
  sectorsUsed: number;
  /** Mean resultant length of the cluster dies' angles (0 spread round, 1 all at one angle). */
  angularConcentration: number;
  /** The largest straight-line cluster, if any: its fit, and `share` = its dies over all cluster dies. */
  line?: { cluster: number; lengthMm: number; widthMm: number; angleDeg: number; lineResidualMm: number; arcResidualMm: number; share: number; innerRadiusFraction: number };
  /** The rule that decided, in words. */
  rule: string;
}

export interface SignatureResult {
  label: SignatureLabel;
  /** 0.5 (on a threshold) to 0.99 (far from every threshold on the way). */
  confidence: number;
  evidence: SignatureEvidence;
  /** Clusters of at least minClusterSize analysed flags, largest first. */
  clusters: Cluster[];
}

/** Share of flagged dies at or above which a wafer is near-full. */
const NEAR_FULL_FRACTION = 0.7;
/** Join-count z below which flags are not clumped. */
const CLUMP_Z = 4;
/** Unclumped flags at or above this share of the dies are a random pattern; below, no pattern. */
const RANDOM_FRACTION = 0.06;
/** A line cluster decides scratch when it holds this share of the cluster dies and reaches inside this radius. */
const SCRATCH_SHARE = 0.4;
const SCRATCH_INNER_RADIUS = 0.7;
const CENTRE_RADIUS = 0.15;
const CENTRE_DENSITY = 0.4;
const RING_COVERAGE = 0.6;
const EDGE_DENSITY = 0.4;
const EDGE_REACH = 0.87;
/** Edge dies flagged at least this many times as often as the rest (with EDGE_DENSITY and RING_COVERAGE) make an edge ring. */
const EDGE_CONTRAST = 4;
/** A line holding this share of all analysed flags is a scratch even if the map as a whole does not clump. */
const LINE_OF_ALL_FLAGS = 0.5;

/** Confidence contributed by one threshold: 0.5 on it, rising linearly to 0.99 at `scale` away. */
function margin(value: number, threshold: number, scale: number): number {
  return Math.min(0.99, 0.5 + (0.5 * Math.abs(value - threshold)) / scale);
}

/**
 * Labels one wafer's spatial signature from its flagged dies.
 *
 * Steps: (1) flags concentrated on one probe site or lattice class are set aside (a test-hardware
 * signature, spatially none); (2) 70 % or more flagged is near-full; (3) two shapes that need not
 * clump on a coarse grid are read first: edge dies flagged all round (at least 40 % of them, four
 * times the rate inside, in 60 % of the sectors) is edge-ring, and one straight cluster holding
 * half of all flags and reaching inside 0.7 R is scratch; (4) flags that do not clump (join-count
 * z < 4) are random when they are 6 % of the dies or more, none otherwise; (5) clusters of at
 * least 3-5 dies (0.1 % of the dies on fine maps) are the pattern: a straight cluster holding 40 %
 * of it and reaching inside 0.7 R is a scratch; the centre covered is center; clusters reaching
 * round 60 % of the sectors of their band are edge-ring when they cover the edge dies, donut
 * otherwise; a partial arc reaching the edge (90 % radius quantile >= 0.87 R) is edge-loc;
 * anything else is loc. O(n).
 */
export function labelWafer(input: LabelInput): SignatureResult {
  const { x, y, flagged, site } = input;
  const n = x.length;
  if (y.length !== n || flagged.length !== n) throw new RangeError('labelWafer needs x, y and flagged of the same length');
  // What depends on the grid alone is computed once per grid and reused for the lot's next
  // wafers; nothing returned refers to it.
  const { positions: placement, grid, joins, residues } = gridModel(x, y, input.geometry ?? {});

  const total = countFlagged(flagged);
  const repeating = findRepeatingPattern(flagged, x, y, site, residues);
  let mask = flagged;
  let setAside = 0;
  if (repeating) {
    mask = new Uint8Array(n);
    setAside = setAsideMembers(flagged, repeating.members, mask);
  }
  const analysed = total - setAside;
  const p = n > 0 ? analysed / n : 0;
  const jc = joinCount(mask, x, y, grid, joins);
  // 3 dies on a coarse map (under 600 dies), 5 on a usual one, 0.1 % of the dies on a fine one.
  const minClusterSize = Math.max(3, Math.min(5, Math.ceil(n / 120)), Math.ceil(0.001 * n));
  const { clusters } = findClusters(mask, x, y, placement, { minSize: minClusterSize }, grid);

  const signal = new Uint8Array(n);
  let clusterDies = 0;
  for (const c of clusters) clusterDies += c.size;
  const signalRadii = new Float64Array(clusterDies);
  let filled = 0;
  for (const c of clusters) for (const d of c.dies) { signal[d] = 1; signalRadii[filled++] = placement.radiusFraction[d]; }
  signalRadii.sort();
  const q = (prob: number) => quantileSorted(signalRadii, prob) ?? 0;
  const radiusQuantiles = { q10: q(0.1), q50: q(0.5), q90: q(0.9) };

  const { centre: centreDensity, edge: edgeDensity } = centreAndEdgeDensity(signal, placement, CENTRE_RADIUS);
  const angular = angularFeatures(signal, placement, radiusQuantiles.q10, radiusQuantiles.q90);
  const edgeBand = edgeFlags(mask, placement);

  let line: SignatureEvidence['line'];
  for (const c of clusters) {
    if (!c.line) continue;
    line = {
      cluster: c.id, lengthMm: c.lengthMm, widthMm: c.widthMm, angleDeg: c.majorAxisDeg, lineResidualMm: c.lineResidualMm,
      arcResidualMm: c.arcResidualMm, share: c.size / signalRadii.length, innerRadiusFraction: c.innerRadiusFraction,
    };
    break;
  }

  const evidence: SignatureEvidence = {
    dies: n,
    flagged: total,
    ...(repeating ? { repeating: { ...withoutMembers(repeating), setAside } } : {}),
    analysedFlagged: analysed,
    analysedFraction: p,
    joinCount: jc,
    minClusterSize,
    clusterDies: signalRadii.length,
    radialFlagDensity: radialDensity(mask, placement),
    radialClusterDensity: radialDensity(signal, placement),
    centreDensity,
    edgeDensity,
    edgeFlagRate: edgeBand.rate,
    interiorFlagRate: edgeBand.interiorRate,
    edgeCoverage: edgeBand.coverage,
    radiusQuantiles,
    angularCoverage: angular.coverage,
    sectorsUsed: angular.sectors,
    angularConcentration: angular.concentration,
    ...(line ? { line } : {}),
    rule: '',
  };
  const decide = (label: SignatureLabel, confidence: number, rule: string): SignatureResult => {
    evidence.rule = rule;
    return { label, confidence, evidence, clusters };
  };
  const siteNote = repeating ? ` after setting aside ${setAside} flags that follow ${repeating.kind === 'probe-site' ? `probe site ${repeating.site}` : 'one lattice class'}` : '';

  if (analysed === 0) return decide('none', 0.99, `no flagged dies${siteNote}`);
  if (p >= NEAR_FULL_FRACTION) {
    return decide('near-full', margin(p, NEAR_FULL_FRACTION, 0.15), `${(100 * p).toFixed(1)} % of dies flagged (>= 70 %)${siteNote}`);
  }
  // Two shapes that need not clump on a coarse grid: a one-die ring of edge dies, and a line.
  if (edgeBand.rate >= EDGE_DENSITY && edgeBand.rate >= EDGE_CONTRAST * edgeBand.interiorRate && edgeBand.coverage >= RING_COVERAGE) {
    return decide('edge-ring', Math.min(margin(edgeBand.rate, EDGE_DENSITY, 0.3), margin(edgeBand.coverage, RING_COVERAGE, 0.25), margin(edgeBand.rate / Math.max(edgeBand.interiorRate, 1e-9), EDGE_CONTRAST, 4)),
      `${(100 * edgeBand.rate).toFixed(0)} % of the edge dies flagged against ${(100 * edgeBand.interiorRate).toFixed(1)} % inside, ${(100 * edgeBand.coverage).toFixed(0)} % of the way round${siteNote}`);
  }
  const lineOfAll = line ? clusters[line.cluster].size / analysed : 0;
  if (line && lineOfAll >= LINE_OF_ALL_FLAGS && line.innerRadiusFraction < SCRATCH_INNER_RADIUS) {
    return decide('scratch', Math.min(margin(lineOfAll, LINE_OF_ALL_FLAGS, 0.3), margin(line.innerRadiusFraction, SCRATCH_INNER_RADIUS, 0.3)),
      `a straight cluster ${line.lengthMm.toFixed(0)} mm long and ${line.widthMm.toFixed(1)} mm wide holds ${(100 * lineOfAll).toFixed(0)} % of all flagged dies${siteNote}`);
  }
  const sparse = p < RANDOM_FRACTION;
  if (jc.z < CLUMP_Z || clusters.length === 0) {
    const clumpMargin = clusters.length === 0 ? 0.99 : margin(jc.z, CLUMP_Z, 4);
    const rateMargin = margin(p, RANDOM_FRACTION, 0.04);
    const why = clusters.length === 0 ? `no cluster of ${minClusterSize} or more dies` : `flags do not clump (join-count z ${jc.z.toFixed(1)} < ${CLUMP_Z})`;
    return sparse
      ? decide('none', Math.min(clumpMargin, rateMargin), `${why}, and only ${(100 * p).toFixed(1)} % of dies flagged${siteNote}`)
      : decide('random', Math.min(clumpMargin, rateMargin), `${why}, spread over ${(100 * p).toFixed(1)} % of dies${siteNote}`);
  }
  const clumped = margin(jc.z, CLUMP_Z, 4);
  if (line && line.share >= SCRATCH_SHARE && line.innerRadiusFraction < SCRATCH_INNER_RADIUS) {
    return decide('scratch', Math.min(clumped, margin(line.share, SCRATCH_SHARE, 0.3), margin(line.innerRadiusFraction, SCRATCH_INNER_RADIUS, 0.3)),
      `a straight cluster ${line.lengthMm.toFixed(0)} mm long and ${line.widthMm.toFixed(1)} mm wide holds ${(100 * line.share).toFixed(0)} % of the clustered dies`);
  }
  if (centreDensity >= CENTRE_DENSITY) {
    return decide('center', Math.min(clumped, margin(centreDensity, CENTRE_DENSITY, 0.3)), `clusters cover ${(100 * centreDensity).toFixed(0)} % of the dies within 0.15 R of the centre`);
  }
  const coverageMargin = margin(angular.coverage, RING_COVERAGE, 0.25);
  if (angular.coverage >= RING_COVERAGE) {
    return edgeDensity >= EDGE_DENSITY
      ? decide('edge-ring', Math.min(clumped, coverageMargin, margin(edgeDensity, EDGE_DENSITY, 0.3)),
        `clusters go ${(100 * angular.coverage).toFixed(0)} % of the way round and cover ${(100 * edgeDensity).toFixed(0)} % of the edge dies`)
      : decide('donut', Math.min(clumped, coverageMargin, margin(edgeDensity, EDGE_DENSITY, 0.3), margin(centreDensity, CENTRE_DENSITY, 0.3)),
        `clusters go ${(100 * angular.coverage).toFixed(0)} % of the way round between ${radiusQuantiles.q10.toFixed(2)} R and ${radiusQuantiles.q90.toFixed(2)} R, missing the centre and the edge`);
  }
  const reach = margin(radiusQuantiles.q90, EDGE_REACH, 0.08);
  return radiusQuantiles.q90 >= EDGE_REACH
    ? decide('edge-loc', Math.min(clumped, coverageMargin, reach), `clusters reach the edge (90 % of them inside ${radiusQuantiles.q90.toFixed(2)} R) over ${(100 * angular.coverage).toFixed(0)} % of the way round`)
    : decide('loc', Math.min(clumped, coverageMargin, reach, margin(centreDensity, CENTRE_DENSITY, 0.3)), `a local cluster between ${radiusQuantiles.q10.toFixed(2)} R and ${radiusQuantiles.q90.toFixed(2)} R, off the centre and the edge`);
}

function withoutMembers(pattern: RepeatingPattern): Omit<RepeatingPattern, 'members'> {
  const { members: _members, ...rest } = pattern;
  return rest;
}
