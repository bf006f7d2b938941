// Die grid -> wafer coordinates. Every spatial method works in one frame: millimetres from the
// wafer centre, seen on the front side with the notch (or flat) at the bottom, +x to the right and
// +y up, angles counter-clockwise from +x (so 270 degrees is the notch side).

import { extentOf } from './dieGrid';

/** Side of the wafer, seen on its front with the dies drawn where xPositive and yPositive put them, where the notch or flat is. */
export type NotchSide = 'bottom' | 'top' | 'left' | 'right';

export interface WaferGeometry {
  /** Wafer diameter in mm: 150, 200 or 300 (SEMI M1); any positive value is accepted. */
  waferDiameterMm: number;
  /** Edge exclusion in mm; 3 mm is the nominal 300 mm quality-area exclusion (SEMI T7). */
  edgeExclusionMm: number;
  /** Die step (pitch) in mm along the grid's x and y. */
  dieWidthMm: number;
  dieHeightMm: number;
  /** Die-grid coordinate of the wafer centre; fractional when the centre falls between dies. */
  centreX: number;
  centreY: number;
  /** Which way growing die x and y point on the wafer front (STDF WCR POS_X, POS_Y). */
  xPositive: 'right' | 'left';
  yPositive: 'up' | 'down';
  /** Where the notch or flat sits in that view (STDF WCR WF_FLAT: U, D, L, R = top, bottom, left, right, from memory). */
  notch: NotchSide;
  notchKind: 'notch' | 'flat';
  /** Inner edges of rings 1.. as fractions of the usable radius, ascending (ring 0 starts at 0). */
  ringEdges: number[];
  /** Number of equal angular sectors; sector 0 starts at 0 degrees and runs counter-clockwise. */
  sectorCount: number;
  /** Exposure field (reticle shot) in dies and the die-grid coordinate where a shot begins. */
  shotX: number;
  shotY: number;
  shotOriginX: number;
  shotOriginY: number;
}

/** Geometry with the names of the fields that were inferred from the grid, not given. */
export interface ResolvedGeometry extends WaferGeometry {
  inferred: (keyof WaferGeometry)[];
}

/** Usable radius: half the diameter less the edge exclusion. */
export function usableRadiusMm(geometry: Pick<WaferGeometry, 'waferDiameterMm' | 'edgeExclusionMm'>): number {
  return geometry.waferDiameterMm / 2 - geometry.edgeExclusionMm;
}

const DEFAULTS = {
  waferDiameterMm: 300,
  // SEMI T7 text for 300 mm; the same 3 mm is used for 150 and 200 mm unless told otherwise (common practice).
  edgeExclusionMm: 3,
  xPositive: 'right',
  yPositive: 'up',
  notch: 'bottom',
  notchKind: 'notch',
  ringEdges: [0.2, 0.4, 0.6, 0.8],
  sectorCount: 8,
  shotX: 1,
  shotY: 1,
  shotOriginX: 0,
  shotOriginY: 0,
} as const;

/**
 * Fills in what the file did not say. The centre defaults to the middle of the grid's extent
 * (a round wafer's grid is symmetric about it); an unknown die pitch assumes the grid fills the
 * usable diameter: the widest row of k dies leaves on average half a pitch free at each end (the
 * outer die edge falls anywhere within one pitch of the usable edge), so pitch = d / (k + 1).
 *
 * @throws RangeError on an empty grid or a non-positive size.
 */
export function resolveGeometry(x: Int32Array, y: Int32Array, given: Partial<WaferGeometry> = {}): ResolvedGeometry {
  if (x.length === 0 || x.length !== y.length) throw new RangeError('resolveGeometry needs x and y of the same, non-zero length');
  const inferred: (keyof WaferGeometry)[] = [];
  const pick = <K extends keyof WaferGeometry>(key: K, fallback: () => WaferGeometry[K]): WaferGeometry[K] => {
    const value = given[key];
    if (value !== undefined) return value as WaferGeometry[K];
    inferred.push(key);
    return fallback();
  };
  const waferDiameterMm = pick('waferDiameterMm', () => DEFAULTS.waferDiameterMm);
  const edgeExclusionMm = pick('edgeExclusionMm', () => DEFAULTS.edgeExclusionMm);
  const usableDiameter = 2 * usableRadiusMm({ waferDiameterMm, edgeExclusionMm });
  if (!(waferDiameterMm > 0) || !(usableDiameter > 0)) throw new RangeError('wafer diameter and edge exclusion leave no usable area');
  const ex = extentOf(x);
  const ey = extentOf(y);
  const geometry: WaferGeometry = {
    waferDiameterMm,
    edgeExclusionMm,
    dieWidthMm: pick('dieWidthMm', () => usableDiameter / (ex.max - ex.min + 2)),
    dieHeightMm: pick('dieHeightMm', () => usableDiameter / (ey.max - ey.min + 2)),
    centreX: pick('centreX', () => (ex.min + ex.max) / 2),
    centreY: pick('centreY', () => (ey.min + ey.max) / 2),
    xPositive: pick('xPositive', () => DEFAULTS.xPositive),
    yPositive: pick('yPositive', () => DEFAULTS.yPositive),
    notch: pick('notch', () => DEFAULTS.notch),
    notchKind: pick('notchKind', () => DEFAULTS.notchKind),
    ringEdges: pick('ringEdges', () => [...DEFAULTS.ringEdges]),
    sectorCount: pick('sectorCount', () => DEFAULTS.sectorCount),
    shotX: pick('shotX', () => DEFAULTS.shotX),
    shotY: pick('shotY', () => DEFAULTS.shotY),
    shotOriginX: pick('shotOriginX', () => DEFAULTS.shotOriginX),
    shotOriginY: pick('shotOriginY', () => DEFAULTS.shotOriginY),
  };
  if (!(geometry.dieWidthMm > 0) || !(geometry.dieHeightMm > 0)) throw new RangeError('die width and height must be positive');
  for (const key of ['sectorCount', 'shotX', 'shotY'] as const) {
    if (!Number.isInteger(geometry[key]) || geometry[key] < 1) throw new RangeError(`${key} must be a positive integer`);
  }
  for (let i = 1; i < geometry.ringEdges.length; i++) {
    if (!(geometry.ringEdges[i] > geometry.ringEdges[i - 1])) throw new RangeError('ringEdges must be ascending');
  }
  return { ...geometry, inferred };
}

/** Per-die positions, one entry per die in input order. */
export interface DiePositions {
  geometry: ResolvedGeometry;
  usableRadiusMm: number;
  /** Die centre in mm from the wafer centre, notch-down frame. */
  xMm: Float64Array;
  yMm: Float64Array;
  radiusMm: Float64Array;
  /** radiusMm / usable radius (above 1 for a die past the edge exclusion). */
  radiusFraction: Float64Array;
  /** Degrees counter-clockwise from +x, 0 <= angle < 360; the notch is at 270. */
  angleDeg: Float64Array;
  /** 1 when a neighbouring die position (x or y one step away) would not fit inside the usable radius. */
  edge: Uint8Array;
}

/** Per-die positions and zones, one entry per die in input order. */
export interface DiePlacement extends DiePositions {
  /** Ring 0..ringEdges.length by radius fraction; sector 0..sectorCount-1 by angle. */
  ring: Int32Array;
  sector: Int32Array;
  /** Quadrant 0..3: upper right, upper left, lower left, lower right (counter-clockwise). */
  quadrant: Int32Array;
  /** Exposure field the die belongs to (row-major over the shots present) and its place in it. */
  shotIndex: Int32Array;
  shotColumn: Int32Array;
  shotRow: Int32Array;
}

const DEGREE = Math.PI / 180;

/** Rotation (degrees counter-clockwise) that brings the notch from its side to the bottom. */
function notchRotationDeg(notch: NotchSide): number {
  switch (notch) {
    case 'bottom': return 0;
    case 'top': return 180;
    case 'left': return 90; // 180 -> 270
    case 'right': return -90; // 0 -> 270
  }
}

/** Arrays positionDies may write into instead of allocating: a caller labelling many wafers reuses them. */
export type PositionBuffers = Pick<DiePositions, 'xMm' | 'yMm' | 'radiusMm' | 'radiusFraction' | 'angleDeg' | 'edge'>;

/** Buffers of at least `n` entries, grown from `previous` only when it is too short. */
export function positionBuffers(n: number, previous?: PositionBuffers): PositionBuffers {
  if (previous && previous.edge.length >= n) return previous;
  return {
    xMm: new Float64Array(n), yMm: new Float64Array(n), radiusMm: new Float64Array(n),
    radiusFraction: new Float64Array(n), angleDeg: new Float64Array(n), edge: new Uint8Array(n),
  };
}

/**
 * Positions every die of the grid on the wafer: mm, radius, angle, edge flag. O(n). With
 * `buffers`, the results are views into them (valid until the buffers are written again).
 */
export function positionDies(x: Int32Array, y: Int32Array, given: Partial<WaferGeometry> | ResolvedGeometry = {}, buffers?: PositionBuffers): DiePositions {
  const geometry = 'inferred' in given ? (given as ResolvedGeometry) : resolveGeometry(x, y, given);
  const n = x.length;
  const radius = usableRadiusMm(geometry);
  const w = geometry.dieWidthMm;
  const h = geometry.dieHeightMm;
  const sx = geometry.xPositive === 'right' ? 1 : -1;
  const sy = geometry.yPositive === 'up' ? 1 : -1;
  const turn = notchRotationDeg(geometry.notch) * DEGREE;
  const cos = Math.round(Math.cos(turn));
  const sin = Math.round(Math.sin(turn));
  const halfDiagonalSquared = (w / 2) ** 2 + (h / 2) ** 2;
  const halfDiagonal = Math.sqrt(halfDiagonalSquared);
  const maxPitch = Math.max(w, h);
  const fits = (cx: number, cy: number) => {
    // The corner farthest from the centre decides whether the whole die square is inside.
    const fx = Math.abs(cx) + w / 2;
    const fy = Math.abs(cy) + h / 2;
    return fx * fx + fy * fy <= radius * radius + 1e-9 * halfDiagonalSquared;
  };
  const target = positionBuffers(n, buffers);
  const xMm = target.xMm.subarray(0, n);
  const yMm = target.yMm.subarray(0, n);
  const radiusMm = target.radiusMm.subarray(0, n);
  const radiusFraction = target.radiusFraction.subarray(0, n);
  const angleDeg = target.angleDeg.subarray(0, n);
  const edge = target.edge.subarray(0, n);
  const { centreX, centreY } = geometry;
  for (let i = 0; i < n; i++) {
    // Grid frame (mm, axes as drawn in the file's picture), then turned so the notch is at the bottom.
    const gx = (x[i] - centreX) * w;
    const gy = (y[i] - centreY) * h;
    const u = sx * gx;
    const v = sy * gy;
    const px = cos * u - sin * v;
    const py = sin * u + cos * v;
    xMm[i] = px;
    yMm[i] = py;
    const r = Math.sqrt(px * px + py * py);
    radiusMm[i] = r;
    radiusFraction[i] = r / radius;
    // The centre die has no direction; call it 0 rather than let a negative zero make it 180.
    let angle = r === 0 ? 0 : Math.atan2(py, px) / DEGREE;
    if (angle < 0) angle += 360;
    if (angle >= 360) angle -= 360;
    angleDeg[i] = angle;
    // Edge die: it does not fit itself, or one of its four grid neighbours would not. Far enough
    // inside, no neighbour can reach the edge, and the corner tests are skipped.
    const surelyInside = r + halfDiagonal + maxPitch < radius;
    edge[i] = surelyInside || (fits(gx, gy) && fits(gx + w, gy) && fits(gx - w, gy) && fits(gx, gy + h) && fits(gx, gy - h)) ? 0 : 1;
  }
  return { geometry, usableRadiusMm: radius, xMm, yMm, radiusMm, radiusFraction, angleDeg, edge };
}

/** Places every die of the grid on the wafer: positions, then ring, sector, quadrant and shot. O(n). */
export function placeDies(x: Int32Array, y: Int32Array, given: Partial<WaferGeometry> | ResolvedGeometry = {}): DiePlacement {
  const positions = positionDies(x, y, given);
  const { geometry, radiusFraction, angleDeg } = positions;
  const n = x.length;
  const ring = new Int32Array(n);
  const sector = new Int32Array(n);
  const quadrant = new Int32Array(n);
  const shotColumn = new Int32Array(n);
  const shotRow = new Int32Array(n);
  const shotIndex = new Int32Array(n);
  const shotGridX = new Int32Array(n);
  const shotGridY = new Int32Array(n);
  const { sectorCount, shotX, shotY, shotOriginX, shotOriginY } = geometry;
  const edges = Float64Array.from(geometry.ringEdges);
  const sectorWidth = 360 / sectorCount;
  let minShotX = Infinity;
  let maxShotX = -Infinity;
  let minShotY = Infinity;
  for (let i = 0; i < n; i++) {
    const fraction = radiusFraction[i];
    let k = 0;
    while (k < edges.length && fraction >= edges[k]) k++;
    ring[i] = k;
    const s = Math.floor(angleDeg[i] / sectorWidth);
    sector[i] = s < sectorCount ? s : sectorCount - 1;
    const q = Math.floor(angleDeg[i] / 90);
    quadrant[i] = q < 4 ? q : 3;
    // Non-negative remainder, so that die -1 falls in the last shot column, not in column -1.
    const dx = x[i] - shotOriginX;
    const dy = y[i] - shotOriginY;
    const column = dx % shotX;
    const row = dy % shotY;
    shotColumn[i] = column < 0 ? column + shotX : column;
    shotRow[i] = row < 0 ? row + shotY : row;
    const fx = (dx - shotColumn[i]) / shotX;
    const fy = (dy - shotRow[i]) / shotY;
    shotGridX[i] = fx;
    shotGridY[i] = fy;
    if (fx < minShotX) minShotX = fx;
    if (fx > maxShotX) maxShotX = fx;
    if (fy < minShotY) minShotY = fy;
  }
  const shotColumns = maxShotX - minShotX + 1;
  for (let i = 0; i < n; i++) shotIndex[i] = (shotGridY[i] - minShotY) * shotColumns + (shotGridX[i] - minShotX);
  return { ...positions, ring, sector, quadrant, shotIndex, shotColumn, shotRow };
}

/**
 * Gross dies per wafer by the classic approximation DPW = pi d^2 / (4 S) - pi d / sqrt(2 S), with
 * d the usable diameter and S the die area (DOMAIN.md; Hennessy & Patterson's textbook formula).
 */
export function grossDiesPerWafer(geometry: Pick<WaferGeometry, 'waferDiameterMm' | 'edgeExclusionMm' | 'dieWidthMm' | 'dieHeightMm'>): number {
  const d = 2 * usableRadiusMm(geometry);
  const s = geometry.dieWidthMm * geometry.dieHeightMm;
  return (Math.PI * d * d) / (4 * s) - (Math.PI * d) / Math.sqrt(2 * s);
}

export interface GrossDieCheck {
  /** Dies in the grid. */
  dies: number;
  /** The approximation's count for this wafer and die size. */
  expected: number;
  /** dies / expected: near 1 for a full grid, well below for a partial map. */
  ratio: number;
  /** True when the grid holds at least 95 % of the approximation: a full wafer map. */
  full: boolean;
}

/** Compares the grid's die count with the gross-die-per-wafer approximation. */
export function grossDieCheck(dies: number, geometry: Pick<WaferGeometry, 'waferDiameterMm' | 'edgeExclusionMm' | 'dieWidthMm' | 'dieHeightMm'>): GrossDieCheck {
  const expected = grossDiesPerWafer(geometry);
  const ratio = dies / expected;
  return { dies, expected, ratio, full: ratio >= 0.95 };
}
