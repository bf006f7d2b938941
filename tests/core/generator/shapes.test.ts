import { describe, expect, it } from 'vitest';
import { layoutWafer } from '../../../src/core/generator/layout';
import { Random } from '../../../src/core/generator/random';
import { segmentToRectangleDistance, selectDies, type ExcursionShape } from '../../../src/core/generator/shapes';

// Shapes follow the signature vocabulary of Wu, Jang & Chen (IEEE TSM 28(1), 2015); each test checks
// the selection against plain geometry computed here, die by die, both ways (in and out).
const layout = layoutWafer({ dieWidthMm: 6.5, dieHeightMm: 6.5 });
const R = layout.usableRadiusMm;
const all = Array.from(layout.x, (_, i) => i);
const radiusOf = (i: number) => Math.hypot(layout.centreXMm[i], layout.centreYMm[i]);

function expectPartition(shape: ExcursionShape, inside: (i: number) => boolean) {
  const selected = new Set(selectDies(shape, layout, new Random(1)));
  expect(selected.size).toBeGreaterThan(0);
  for (const i of all) expect(selected.has(i)).toBe(inside(i));
}

describe('selectDies', () => {
  it('takes the dies within the centre radius', () => {
    expectPartition({ kind: 'center', radiusFraction: 0.3 }, (i) => radiusOf(i) <= 0.3 * R);
  });

  it('takes the dies beyond the inner radius of an edge ring', () => {
    expectPartition({ kind: 'edge-ring', innerFraction: 0.9 }, (i) => radiusOf(i) >= 0.9 * R);
  });

  it('takes an edge sector by angle, counter-clockwise from +x, across the 0/360 seam', () => {
    expectPartition({ kind: 'edge-loc', innerFraction: 0.8, angleDeg: 350, spanDeg: 60 }, (i) => {
      const angle = (Math.atan2(layout.centreYMm[i], layout.centreXMm[i]) * 180) / Math.PI; // -180..180
      return radiusOf(i) >= 0.8 * R && angle >= -40 && angle <= 20;
    });
  });

  it('takes a round blob around its centre', () => {
    expectPartition({ kind: 'loc', xMm: -50, yMm: 70, radiusMm: 25 },
      (i) => Math.hypot(layout.centreXMm[i] + 50, layout.centreYMm[i] - 70) <= 25);
  });

  it('takes every die a straight scratch touches, by the die square', () => {
    // A horizontal scratch through y = 10 spanning the whole wafer, 7 mm wide, touches a die square
    // (6.5 mm tall) exactly when its centre is within 3.25 + 3.5 mm of the line.
    expectPartition({ kind: 'scratch', xMm: 0, yMm: 10, angleDeg: 0, lengthMm: 400, widthMm: 7 },
      (i) => Math.abs(layout.centreYMm[i] - 10) <= 6.75);
  });

  it('crosses about L (|cos| + |sin|) / pitch + 1 dies with a thin diagonal scratch', () => {
    // Grid traversal (Amanatides & Woo, "A fast voxel traversal algorithm", Eurographics 1987): a
    // segment crosses one new cell per grid line passed, L|cos|/pitch + L|sin|/pitch lines in all.
    for (const angleDeg of [20, 35, 60, 125]) {
      const dies = selectDies({ kind: 'scratch', xMm: 1.1, yMm: -2.3, angleDeg, lengthMm: 150, widthMm: 0 }, layout, new Random(1));
      const a = (angleDeg * Math.PI) / 180;
      const expected = (150 * (Math.abs(Math.cos(a)) + Math.abs(Math.sin(a)))) / 6.5 + 1;
      expect(Math.abs(dies.length - expected)).toBeLessThanOrEqual(1.5);
    }
  });

  it('measures the distance between a segment and a die square', () => {
    // Plain geometry: a unit square [0,1]^2 and segments beside, across and at a corner.
    expect(segmentToRectangleDistance(-1, 0.5, 2, 0.5, 0, 0, 1, 1)).toBe(0);
    expect(segmentToRectangleDistance(-1, 3, 2, 3, 0, 0, 1, 1)).toBeCloseTo(2, 12);
    expect(segmentToRectangleDistance(2, 3, 3, 2, 0, 0, 1, 1)).toBeCloseTo(1.5 * Math.SQRT2, 12);
    expect(segmentToRectangleDistance(0.2, 0.2, 0.3, 0.3, 0, 0, 1, 1)).toBe(0);
  });

  it('takes the dies of one probe site', () => {
    expectPartition({ kind: 'site', site: 2 }, (i) => layout.site[i] === 2);
  });

  it('picks random dies without repeats, the same for the same stream', () => {
    const a = selectDies({ kind: 'random', count: 40 }, layout, new Random(5));
    const b = selectDies({ kind: 'random', count: 40 }, layout, new Random(5));
    const c = selectDies({ kind: 'random', count: 40 }, layout, new Random(6));
    expect(new Set(a).size).toBe(40);
    expect(a).toEqual(b);
    expect(a).not.toEqual(c);
    expect(() => selectDies({ kind: 'random', count: layout.x.length + 1 }, layout, new Random(5))).toThrow(/die count/);
  });

  it('spreads random dies over the whole wafer', () => {
    // Uniform sampling without replacement: about half the picks fall inside r^2 < R^2/2 when the
    // dies are uniform over the disc; 600 picks, binomial sd 12; allow 5 sd.
    const picks = selectDies({ kind: 'random', count: 600 }, layout, new Random(9));
    const inner = all.filter((i) => radiusOf(i) ** 2 < (R * R) / 2).length / all.length;
    const innerPicks = picks.filter((i) => radiusOf(i) ** 2 < (R * R) / 2).length;
    expect(Math.abs(innerPicks - inner * 600)).toBeLessThan(60);
  });
});
