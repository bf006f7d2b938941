// Clusters of flagged dies: 8-neighbour connected components (DOMAIN.md), measured by their
// centroid, reach and principal axes, so a blob, an arc and a straight line can be told apart.

import { buildDieGrid, type DieGrid } from './dieGrid';
import type { DiePositions } from './geometry';

export interface Cluster {
  /** 0.. in order of decreasing size. */
  id: number;
  size: number;
  /** Die indices (into the input arrays), ascending. */
  dies: Int32Array;
  /** Centroid in mm, notch-down wafer frame, and its radius fraction and angle. */
  centroidXMm: number;
  centroidYMm: number;
  centroidRadiusFraction: number;
  centroidAngleDeg: number;
  /** Largest distance from the centroid to a member die's centre, mm. */
  radiusMm: number;
  /**
   * Principal axes: standard deviations along the major and minor axis of the member dies, each
   * die counted as a filled rectangle (its own variance w^2/12, h^2/12 added), and the major
   * axis direction in degrees 0..180.
   */
  majorSigmaMm: number;
  minorSigmaMm: number;
  majorAxisDeg: number;
  /** majorSigma / minorSigma: 1 for a round blob, large for a line. */
  elongation: number;
  /** Length and width of the uniform bar with the same axes: sqrt(12) sigma. */
  lengthMm: number;
  widthMm: number;
  /** Scatter of the die centres about the best straight line and about the best circle round the wafer centre, mm. */
  lineResidualMm: number;
  arcResidualMm: number;
  /** Radius fractions of the innermost and outermost member die. */
  innerRadiusFraction: number;
  outerRadiusFraction: number;
  /** Whether the cluster reads as a straight line (scratch-like); see `isLine`. */
  line: boolean;
}

export interface ClusterOptions {
  /** Components smaller than this are not reported (default 1: every component). */
  minSize?: number;
}

export interface ClusterResult {
  clusters: Cluster[];
  /** Component number per die (-1 when not flagged), before the size filter; ids are not cluster ids. */
  component: Int32Array;
  grid: DieGrid;
}

const SQRT12 = Math.sqrt(12);

/**
 * A straight line: long (at least 4 die pitches) and thin (at most 4 pitches wide, at least 4
 * times longer than wide), and straighter than a circle arc round the wafer centre, which is
 * what separates a scratch from a thin edge ring segment.
 */
export function isLine(c: Pick<Cluster, 'size' | 'lengthMm' | 'widthMm' | 'lineResidualMm' | 'arcResidualMm'>, pitchMm: number): boolean {
  return c.size >= 4 && c.lengthMm >= 4 * pitchMm && c.widthMm <= 4 * pitchMm && c.lengthMm >= 4 * c.widthMm
    && c.lineResidualMm < c.arcResidualMm;
}

/**
 * Connected components of the flagged dies, 8-neighbour on the die grid (two dies touch when
 * their x and y differ by at most 1), largest first. O(n).
 */
export function findClusters(flagged: Uint8Array, x: Int32Array, y: Int32Array, placement: DiePositions, options: ClusterOptions = {}, grid = buildDieGrid(x, y)): ClusterResult {
  const n = x.length;
  if (flagged.length !== n) throw new RangeError('flagged must have one entry per die');
  const minSize = options.minSize ?? 1;
  const component = new Int32Array(n).fill(-1);
  // Breadth-first search with one queue for the whole map: each die enters it once, and each
  // component's members lie side by side in it.
  const queue = new Int32Array(n);
  const members: Int32Array[] = [];
  let components = 0;
  let tail = 0;
  const { cell, width, height, minX, minY } = grid;
  for (let start = 0; start < n; start++) {
    if (!flagged[start] || component[start] !== -1) continue;
    const id = components++;
    const first = tail;
    queue[tail++] = start;
    component[start] = id;
    for (let head = first; head < tail; head++) {
      const die = queue[head];
      const gx = x[die] - minX;
      const gy = y[die] - minY;
      for (let dy = -1; dy <= 1; dy++) {
        const ny = gy + dy;
        if (ny < 0 || ny >= height) continue;
        for (let dx = -1; dx <= 1; dx++) {
          const nx = gx + dx;
          if (nx < 0 || nx >= width) continue;
          const other = cell[nx + ny * width];
          if (other >= 0 && flagged[other] && component[other] === -1) {
            component[other] = id;
            queue[tail++] = other;
          }
        }
      }
    }
    if (tail - first >= minSize) members.push(queue.slice(first, tail).sort());
  }
  members.sort((a, b) => b.length - a.length || a[0] - b[0]);
  const clusters = members.map((dies, id) => measureCluster(id, dies, placement));
  return { clusters, component, grid };
}

/** Centroid, reach, principal axes and line test of one set of dies. */
export function measureCluster(id: number, dies: Int32Array, placement: DiePositions): Cluster {
  const { xMm, yMm, radiusMm, radiusFraction } = placement;
  const { dieWidthMm: w, dieHeightMm: h } = placement.geometry;
  const size = dies.length;
  let sx = 0;
  let sy = 0;
  let sr = 0;
  let inner = Infinity;
  let outer = -Infinity;
  for (const d of dies) {
    sx += xMm[d];
    sy += yMm[d];
    sr += radiusMm[d];
    if (radiusFraction[d] < inner) inner = radiusFraction[d];
    if (radiusFraction[d] > outer) outer = radiusFraction[d];
  }
  const cx = sx / size;
  const cy = sy / size;
  const meanR = sr / size;
  let cxx = 0;
  let cyy = 0;
  let cxy = 0;
  let crr = 0;
  let reach = 0;
  for (const d of dies) {
    const dx = xMm[d] - cx;
    const dy = yMm[d] - cy;
    cxx += dx * dx;
    cyy += dy * dy;
    cxy += dx * dy;
    crr += (radiusMm[d] - meanR) ** 2;
    const distance = Math.hypot(dx, dy);
    if (distance > reach) reach = distance;
  }
  cxx /= size;
  cyy /= size;
  cxy /= size;
  // Eigenvalues of the 2 x 2 covariance of the die centres (closed form); the minor one is the
  // mean squared distance from the best straight line (total least squares, Pearson 1901).
  const half = (cxx + cyy) / 2;
  const root = Math.sqrt(((cxx - cyy) / 2) ** 2 + cxy * cxy);
  const majorCentres = half + root;
  const minorCentres = Math.max(0, half - root);
  const axis = 0.5 * Math.atan2(2 * cxy, cxx - cyy);
  // Each die is a filled w x h rectangle: its own spread along a direction t is (w^2 cos^2 t + h^2 sin^2 t)/12.
  const c = Math.cos(axis);
  const s = Math.sin(axis);
  const majorOwn = (w * w * c * c + h * h * s * s) / 12;
  const minorOwn = (w * w * s * s + h * h * c * c) / 12;
  const majorSigmaMm = Math.sqrt(majorCentres + majorOwn);
  const minorSigmaMm = Math.sqrt(minorCentres + minorOwn);
  let majorAxisDeg = (axis * 180) / Math.PI;
  if (majorAxisDeg < 0) majorAxisDeg += 180;
  const centroidRadius = Math.hypot(cx, cy);
  let centroidAngleDeg = (Math.atan2(cy, cx) * 180) / Math.PI;
  if (centroidAngleDeg < 0) centroidAngleDeg += 360;
  const partial = {
    size,
    lengthMm: SQRT12 * majorSigmaMm,
    widthMm: SQRT12 * minorSigmaMm,
    lineResidualMm: Math.sqrt(minorCentres),
    arcResidualMm: Math.sqrt(crr / size),
  };
  return {
    id,
    dies,
    centroidXMm: cx,
    centroidYMm: cy,
    centroidRadiusFraction: centroidRadius / placement.usableRadiusMm,
    centroidAngleDeg,
    radiusMm: reach,
    majorSigmaMm,
    minorSigmaMm,
    majorAxisDeg,
    elongation: majorSigmaMm / minorSigmaMm,
    innerRadiusFraction: inner,
    outerRadiusFraction: outer,
    ...partial,
    line: isLine(partial, Math.sqrt(w * h)),
  };
}
