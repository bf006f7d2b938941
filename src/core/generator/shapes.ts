// Where a planted excursion sits on the wafer. The kinds follow the spatial-signature vocabulary of
// the literature (Wu, Jang & Chen, IEEE TSM 28(1), 2015: center, edge-ring, edge-loc, loc, scratch,
// random) plus one probe site. Radii are fractions of the usable radius; angles are degrees
// counter-clockwise from +x (90 = top, 270 = the notch side); a die belongs by its centre.

import type { DieLayout } from './layout';
import type { Random } from './random';

export type ExcursionShape =
  /** Dies within radiusFraction * R of the wafer centre. */
  | { kind: 'center'; radiusFraction: number }
  /** Dies at or beyond innerFraction * R. */
  | { kind: 'edge-ring'; innerFraction: number }
  /** Part of the edge ring: beyond innerFraction * R and within spanDeg centred on angleDeg. */
  | { kind: 'edge-loc'; innerFraction: number; angleDeg: number; spanDeg: number }
  /** A round blob centred at (xMm, yMm). */
  | { kind: 'loc'; xMm: number; yMm: number; radiusMm: number }
  /** A straight line segment centred on (xMm, yMm), lengthMm long, widthMm wide: every die it touches. */
  | { kind: 'scratch'; xMm: number; yMm: number; angleDeg: number; lengthMm: number; widthMm: number }
  /** count dies picked at random, none twice. */
  | { kind: 'random'; count: number }
  /** Every die of one probe site. */
  | { kind: 'site'; site: number };

export type ShapeKind = ExcursionShape['kind'];

const DEGREE = Math.PI / 180;

/** Smallest absolute difference between two angles, in degrees (0..180). */
function angleDistanceDeg(a: number, b: number): number {
  const d = (((a - b) % 360) + 360) % 360;
  return d > 180 ? 360 - d : d;
}

function pointToSegmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const lengthSquared = dx * dx + dy * dy;
  const t = lengthSquared === 0 ? 0 : Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / lengthSquared));
  return Math.hypot(px - ax - t * dx, py - ay - t * dy);
}

function pointToRectangleDistance(px: number, py: number, x0: number, y0: number, x1: number, y1: number): number {
  return Math.hypot(Math.max(x0 - px, 0, px - x1), Math.max(y0 - py, 0, py - y1));
}

/** True when segment a-b crosses the rectangle (Liang-Barsky clipping, 1984). */
function segmentCrossesRectangle(ax: number, ay: number, bx: number, by: number, x0: number, y0: number, x1: number, y1: number): boolean {
  let t0 = 0;
  let t1 = 1;
  const dx = bx - ax;
  const dy = by - ay;
  const edges: [number, number][] = [[-dx, ax - x0], [dx, x1 - ax], [-dy, ay - y0], [dy, y1 - ay]];
  for (const [p, q] of edges) {
    if (p === 0) {
      if (q < 0) return false;
    } else {
      const t = q / p;
      if (p < 0) t0 = Math.max(t0, t);
      else t1 = Math.min(t1, t);
      if (t0 > t1) return false;
    }
  }
  return true;
}

/** Shortest distance between segment a-b and an axis-aligned rectangle; 0 when they meet. */
export function segmentToRectangleDistance(
  ax: number, ay: number, bx: number, by: number, x0: number, y0: number, x1: number, y1: number,
): number {
  if (segmentCrossesRectangle(ax, ay, bx, by, x0, y0, x1, y1)) return 0;
  // Apart, the closest pair has an endpoint of the segment or a corner of the rectangle in it.
  return Math.min(
    pointToRectangleDistance(ax, ay, x0, y0, x1, y1),
    pointToRectangleDistance(bx, by, x0, y0, x1, y1),
    pointToSegmentDistance(x0, y0, ax, ay, bx, by),
    pointToSegmentDistance(x0, y1, ax, ay, bx, by),
    pointToSegmentDistance(x1, y0, ax, ay, bx, by),
    pointToSegmentDistance(x1, y1, ax, ay, bx, by),
  );
}

/** Indices (into the layout's die arrays) of the dies the shape covers, in layout order. */
export function selectDies(shape: ExcursionShape, layout: DieLayout, random: Random): number[] {
  const count = layout.x.length;
  const radius = layout.usableRadiusMm;
  const selected: number[] = [];
  const keepIf = (test: (cx: number, cy: number, i: number) => boolean) => {
    for (let i = 0; i < count; i++) if (test(layout.centreXMm[i], layout.centreYMm[i], i)) selected.push(i);
  };
  switch (shape.kind) {
    case 'center': {
      const limit = shape.radiusFraction * radius;
      keepIf((cx, cy) => Math.hypot(cx, cy) <= limit);
      break;
    }
    case 'edge-ring': {
      const limit = shape.innerFraction * radius;
      keepIf((cx, cy) => Math.hypot(cx, cy) >= limit);
      break;
    }
    case 'edge-loc': {
      const limit = shape.innerFraction * radius;
      const halfSpan = shape.spanDeg / 2;
      keepIf((cx, cy) =>
        Math.hypot(cx, cy) >= limit && angleDistanceDeg(Math.atan2(cy, cx) / DEGREE, shape.angleDeg) <= halfSpan);
      break;
    }
    case 'loc':
      keepIf((cx, cy) => Math.hypot(cx - shape.xMm, cy - shape.yMm) <= shape.radiusMm);
      break;
    case 'scratch': {
      const angle = shape.angleDeg * DEGREE;
      const halfLength = shape.lengthMm / 2;
      const ax = shape.xMm - halfLength * Math.cos(angle);
      const ay = shape.yMm - halfLength * Math.sin(angle);
      const bx = shape.xMm + halfLength * Math.cos(angle);
      const by = shape.yMm + halfLength * Math.sin(angle);
      const halfW = layout.dieWidthMm / 2;
      const halfH = layout.dieHeightMm / 2;
      // A scratch damages every die it touches, so test the die's square, not just its centre.
      keepIf((cx, cy) =>
        segmentToRectangleDistance(ax, ay, bx, by, cx - halfW, cy - halfH, cx + halfW, cy + halfH) <= shape.widthMm / 2);
      break;
    }
    case 'random': {
      if (!Number.isInteger(shape.count) || shape.count < 0 || shape.count > count) {
        throw new RangeError(`random excursion needs a die count between 0 and ${count}`);
      }
      // Partial Fisher-Yates shuffle (Durstenfeld 1964): the first `count` entries are a uniform
      // sample without replacement.
      const order = Int32Array.from({ length: count }, (_, i) => i);
      for (let i = 0; i < shape.count; i++) {
        const j = random.int(i, count - 1);
        const swap = order[i];
        order[i] = order[j];
        order[j] = swap;
      }
      selected.push(...Array.from(order.subarray(0, shape.count)).sort((a, b) => a - b));
      break;
    }
    case 'site':
      keepIf((_cx, _cy, i) => layout.site[i] === shape.site);
      break;
    default: {
      const unknown: never = shape;
      throw new RangeError(`unknown excursion shape ${(unknown as { kind: string }).kind}`);
    }
  }
  return selected;
}
