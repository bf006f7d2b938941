// Die grid of a round wafer, with each die's probe site and its place in the exposure field.
// Orientation: +x to the right and +y up as seen on the wafer's front with the notch at the bottom;
// die (0, 0) is centred on the wafer centre unless an offset moves the grid.

export interface LayoutOptions {
  /** Wafer diameter in mm (SEMI M1: 300.00 mm and 200 mm wafers). */
  waferDiameterMm?: number;
  /** Edge exclusion in mm; 3 mm is the nominal 300 mm quality-area exclusion (SEMI T7). */
  edgeExclusionMm?: number;
  dieWidthMm: number;
  dieHeightMm: number;
  /** Shift of the whole grid in mm: the centre of die (0, 0) sits here. */
  gridOffsetXMm?: number;
  gridOffsetYMm?: number;
  /** Multi-site touchdown: dies probed together, sitesX by sitesY (2 x 2 gives sites 1..4). */
  sitesX?: number;
  sitesY?: number;
  /** Exposure field (reticle shot) in dies, shotX by shotY. */
  shotX?: number;
  shotY?: number;
}

export interface DieLayout {
  waferDiameterMm: number;
  edgeExclusionMm: number;
  /** Radius every die must lie inside: diameter / 2 - edge exclusion. */
  usableRadiusMm: number;
  dieWidthMm: number;
  dieHeightMm: number;
  sitesX: number;
  sitesY: number;
  shotX: number;
  shotY: number;
  orientation: { xPositive: 'right'; yPositive: 'up'; notch: 'bottom' };
  /** Die grid coordinates, in probing order (top row first, left to right). */
  x: Int32Array;
  y: Int32Array;
  /** Die centre in mm from the wafer centre. */
  centreXMm: Float64Array;
  centreYMm: Float64Array;
  /** Probe site 1..sitesX*sitesY. */
  site: Int32Array;
  /** Position of the die inside its exposure field, 0..shotX-1 and 0..shotY-1. */
  shotColumn: Int32Array;
  shotRow: Int32Array;
}

export const LAYOUT_DEFAULTS = {
  waferDiameterMm: 300,
  edgeExclusionMm: 3,
  gridOffsetXMm: 0,
  gridOffsetYMm: 0,
  sitesX: 2,
  sitesY: 2,
  shotX: 4,
  shotY: 3,
} as const;

/** Non-negative remainder, so that die -1 falls in the last site/shot column, not in -1. */
export function positiveModulo(value: number, divisor: number): number {
  return ((value % divisor) + divisor) % divisor;
}

/**
 * Probe site of die (x, y) for a sitesX by sitesY touchdown: sites are numbered 1.. left to right,
 * then row by row upward, within each touchdown (common practice; real probe cards vary).
 */
export function probeSite(x: number, y: number, sitesX: number, sitesY: number): number {
  return 1 + positiveModulo(x, sitesX) + sitesX * positiveModulo(y, sitesY);
}

function positiveInteger(value: number, name: string): number {
  if (!Number.isInteger(value) || value < 1) throw new RangeError(`${name} must be a positive integer`);
  return value;
}

/** Lays out every die whose four corners lie inside the usable radius. */
export function layoutWafer(options: LayoutOptions): DieLayout {
  const o = { ...LAYOUT_DEFAULTS, ...options };
  if (!(o.dieWidthMm > 0) || !(o.dieHeightMm > 0)) throw new RangeError('die width and height must be positive');
  const sitesX = positiveInteger(o.sitesX, 'sitesX');
  const sitesY = positiveInteger(o.sitesY, 'sitesY');
  const shotX = positiveInteger(o.shotX, 'shotX');
  const shotY = positiveInteger(o.shotY, 'shotY');
  const usableRadiusMm = o.waferDiameterMm / 2 - o.edgeExclusionMm;
  if (!(usableRadiusMm > 0)) throw new RangeError('edge exclusion leaves no usable wafer area');

  const radiusSquared = usableRadiusMm * usableRadiusMm;
  const halfW = o.dieWidthMm / 2;
  const halfH = o.dieHeightMm / 2;
  const reachX = Math.ceil((usableRadiusMm + Math.abs(o.gridOffsetXMm)) / o.dieWidthMm) + 1;
  const reachY = Math.ceil((usableRadiusMm + Math.abs(o.gridOffsetYMm)) / o.dieHeightMm) + 1;

  const xs: number[] = [];
  const ys: number[] = [];
  const cxs: number[] = [];
  const cys: number[] = [];
  for (let y = reachY; y >= -reachY; y--) {
    const cy = o.gridOffsetYMm + y * o.dieHeightMm;
    const farY = Math.abs(cy) + halfH;
    for (let x = -reachX; x <= reachX; x++) {
      const cx = o.gridOffsetXMm + x * o.dieWidthMm;
      const farX = Math.abs(cx) + halfW;
      // The corner farthest from the centre decides: if it is inside, all four are.
      if (farX * farX + farY * farY <= radiusSquared) {
        xs.push(x);
        ys.push(y);
        cxs.push(cx);
        cys.push(cy);
      }
    }
  }

  const count = xs.length;
  const site = new Int32Array(count);
  const shotColumn = new Int32Array(count);
  const shotRow = new Int32Array(count);
  for (let i = 0; i < count; i++) {
    site[i] = probeSite(xs[i], ys[i], sitesX, sitesY);
    shotColumn[i] = positiveModulo(xs[i], shotX);
    shotRow[i] = positiveModulo(ys[i], shotY);
  }
  return {
    waferDiameterMm: o.waferDiameterMm,
    edgeExclusionMm: o.edgeExclusionMm,
    usableRadiusMm,
    dieWidthMm: o.dieWidthMm,
    dieHeightMm: o.dieHeightMm,
    sitesX,
    sitesY,
    shotX,
    shotY,
    orientation: { xPositive: 'right', yPositive: 'up', notch: 'bottom' },
    x: Int32Array.from(xs),
    y: Int32Array.from(ys),
    centreXMm: Float64Array.from(cxs),
    centreYMm: Float64Array.from(cys),
    site,
    shotColumn,
    shotRow,
  };
}

/**
 * Gross dies per wafer by the classic approximation DPW = pi d^2 / (4 S) - pi d / sqrt(2 S), with d
 * the (usable) diameter and S the die area (DOMAIN.md; Hennessy & Patterson's textbook formula).
 */
export function grossDiesApproximation(diameterMm: number, dieAreaMm2: number): number {
  return (Math.PI * diameterMm * diameterMm) / (4 * dieAreaMm2) - (Math.PI * diameterMm) / Math.sqrt(2 * dieAreaMm2);
}
