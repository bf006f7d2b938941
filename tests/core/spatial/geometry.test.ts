import { describe, expect, it } from 'vitest';
import { layoutWafer } from '../../../src/core/generator';
import { grossDieCheck, grossDiesPerWafer, placeDies, resolveGeometry } from '../../../src/core/spatial';

// Oracles: the classic dies-per-wafer approximation (DOMAIN.md), SEMI M1/T7 dimensions, and plain
// plane geometry (hypot, atan2, circle areas) worked out here, die by die.

function dieIndex(x: Int32Array, y: Int32Array, gx: number, gy: number): number {
  return Array.from(x).findIndex((v, i) => v === gx && y[i] === gy);
}

describe('grossDiesPerWafer', () => {
  it('gives the textbook 640.2 and 269.7 dies for a 300 mm wafer with no exclusion', () => {
    // DOMAIN.md [derived]: DPW = pi d^2/(4S) - pi d/sqrt(2S); 640.2 for 100 mm^2, 269.7 for 225 mm^2.
    expect(grossDiesPerWafer({ waferDiameterMm: 300, edgeExclusionMm: 0, dieWidthMm: 10, dieHeightMm: 10 })).toBeCloseTo(640.2, 1);
    expect(grossDiesPerWafer({ waferDiameterMm: 300, edgeExclusionMm: 0, dieWidthMm: 15, dieHeightMm: 15 })).toBeCloseTo(269.7, 1);
  });

  it('matches full grids on 150, 200 and 300 mm wafers within 3 % and calls them full', () => {
    // The approximation on the usable diameter (SEMI T7: 3 mm exclusion) against dies laid out corner-inside.
    for (const waferDiameterMm of [150, 200, 300]) {
      for (const die of [2, 5, 8]) {
        const layout = layoutWafer({ waferDiameterMm, dieWidthMm: die, dieHeightMm: die, gridOffsetXMm: die / 2 });
        const geometry = resolveGeometry(layout.x, layout.y, { waferDiameterMm, dieWidthMm: die, dieHeightMm: die });
        const check = grossDieCheck(layout.x.length, geometry);
        expect(Math.abs(check.ratio - 1)).toBeLessThan(0.03);
        expect(check.full).toBe(true);
      }
    }
  });

  it('tells a partial map from a full one', () => {
    const check = grossDieCheck(300, { waferDiameterMm: 300, edgeExclusionMm: 3, dieWidthMm: 10, dieHeightMm: 10 });
    expect(check.full).toBe(false);
    expect(check.ratio).toBeCloseTo(300 / 613.6, 2); // 613.6 on the 294 mm usable diameter [derived]
  });
});

describe('resolveGeometry', () => {
  it('defaults to a 300 mm wafer with the 3 mm SEMI T7 exclusion and says what it inferred', () => {
    const layout = layoutWafer({ dieWidthMm: 10, dieHeightMm: 10 });
    const g = resolveGeometry(layout.x, layout.y);
    expect(g.waferDiameterMm).toBe(300);
    expect(g.edgeExclusionMm).toBe(3);
    expect(g.inferred).toContain('dieWidthMm');
    expect(g.inferred).toContain('centreX');
    expect(resolveGeometry(layout.x, layout.y, { dieWidthMm: 10 }).inferred).not.toContain('dieWidthMm');
  });

  it('finds the centre in the middle of the grid extent, wherever the origin is', () => {
    // A symmetric round grid (plain geometry): the centre is midway between the extreme columns and rows.
    const layout = layoutWafer({ dieWidthMm: 5, dieHeightMm: 5 });
    const shifted = resolveGeometry(layout.x.map((v) => v + 40), layout.y.map((v) => 7 - v));
    expect(shifted.centreX).toBeCloseTo(40, 9);
    expect(shifted.centreY).toBeCloseTo(7, 9);
  });

  it('assumes an unknown pitch spans the usable diameter, so a full grid gets about its true pitch', () => {
    // 294 mm usable diameter over the widest row of k dies plus half a free pitch at each end: 294/(k + 1) is within 3 % of the truth.
    const layout = layoutWafer({ dieWidthMm: 7, dieHeightMm: 5 });
    const g = resolveGeometry(layout.x, layout.y);
    expect(Math.abs(g.dieWidthMm / 7 - 1)).toBeLessThan(0.03);
    expect(Math.abs(g.dieHeightMm / 5 - 1)).toBeLessThan(0.03);
  });

  it('refuses an empty grid, a bad pitch and unordered ring edges', () => {
    expect(() => resolveGeometry(new Int32Array(0), new Int32Array(0))).toThrow(/non-zero/);
    expect(() => resolveGeometry(Int32Array.of(0), Int32Array.of(0), { dieWidthMm: -1 })).toThrow(/positive/);
    expect(() => resolveGeometry(Int32Array.of(0), Int32Array.of(0), { ringEdges: [0.5, 0.2] })).toThrow(/ascending/);
    expect(() => resolveGeometry(Int32Array.of(0), Int32Array.of(0), { shotX: 0 })).toThrow(/shotX/);
  });
});

describe('placeDies', () => {
  const layout = layoutWafer({ dieWidthMm: 10, dieHeightMm: 10 });
  const known = { dieWidthMm: 10, dieHeightMm: 10, centreX: 0, centreY: 0 };
  const i = dieIndex(layout.x, layout.y, 3, 4);

  it('puts die (3, 4) of a 10 mm grid 50 mm out at 53.13 degrees (a 3-4-5 triangle)', () => {
    const p = placeDies(layout.x, layout.y, known);
    expect(p.xMm[i]).toBeCloseTo(30, 9);
    expect(p.yMm[i]).toBeCloseTo(40, 9);
    expect(p.radiusMm[i]).toBeCloseTo(50, 9);
    expect(p.radiusFraction[i]).toBeCloseTo(50 / 147, 9);
    expect(p.angleDeg[i]).toBeCloseTo((Math.atan2(4, 3) * 180) / Math.PI, 9);
    expect(p.ring[i]).toBe(1); // 0.34 R lies in the 0.2-0.4 ring
    expect(p.sector[i]).toBe(1); // 45-90 degrees
    expect(p.quadrant[i]).toBe(0);
  });

  it('follows the axis directions and the notch side to one notch-down frame', () => {
    const a = (Math.atan2(4, 3) * 180) / Math.PI; // 53.13
    expect(placeDies(layout.x, layout.y, { ...known, xPositive: 'left' }).angleDeg[i]).toBeCloseTo(180 - a, 9);
    expect(placeDies(layout.x, layout.y, { ...known, yPositive: 'down' }).angleDeg[i]).toBeCloseTo(360 - a, 9);
    // Turning the notch from the top (or a side) to the bottom turns every die with it.
    expect(placeDies(layout.x, layout.y, { ...known, notch: 'top' }).angleDeg[i]).toBeCloseTo(a + 180, 9);
    expect(placeDies(layout.x, layout.y, { ...known, notch: 'left' }).angleDeg[i]).toBeCloseTo(a + 90, 9);
    expect(placeDies(layout.x, layout.y, { ...known, notch: 'right' }).angleDeg[i]).toBeCloseTo(a + 270, 9);
    const turned = placeDies(layout.x, layout.y, { ...known, notch: 'left' });
    expect(turned.radiusMm[i]).toBeCloseTo(50, 9);
  });

  it('puts about the area share of the dies in each ring', () => {
    // Circle areas: a ring from a to b holds (b^2 - a^2) of the usable disc; fine dies follow it closely.
    const fine = layoutWafer({ dieWidthMm: 1, dieHeightMm: 1 });
    const p = placeDies(fine.x, fine.y, { dieWidthMm: 1, dieHeightMm: 1 });
    const counts = [0, 0, 0, 0, 0];
    p.ring.forEach((r) => counts[r]++);
    const edges = [0, 0.2, 0.4, 0.6, 0.8, 1];
    counts.forEach((count, k) => {
      const share = edges[k + 1] ** 2 - edges[k] ** 2;
      expect(Math.abs(count / fine.x.length - share)).toBeLessThan(0.01);
    });
  });

  it('marks as edge dies exactly those missing a grid neighbour on a full layout', () => {
    // The generator keeps a die when its four corners are inside the usable radius, so a die with a
    // missing x or y neighbour is one whose neighbour would not fit.
    for (const [w, h, ox] of [[10, 10, 0], [6, 4, 2.5], [2, 2, 1]]) {
      const l = layoutWafer({ dieWidthMm: w, dieHeightMm: h, gridOffsetXMm: ox });
      const present = new Set(Array.from(l.x, (x, k) => `${x},${l.y[k]}`));
      const p = placeDies(l.x, l.y, { dieWidthMm: w, dieHeightMm: h, centreX: -ox / w, centreY: 0 });
      l.x.forEach((x, k) => {
        const y = l.y[k];
        const missing = [[1, 0], [-1, 0], [0, 1], [0, -1]].some(([dx, dy]) => !present.has(`${x + dx},${y + dy}`));
        expect(p.edge[k]).toBe(missing ? 1 : 0);
      });
    }
  });

  it('numbers shots and positions within them from the shot origin, negative dies included', () => {
    const p = placeDies(layout.x, layout.y, { ...known, shotX: 4, shotY: 3 });
    const at = (gx: number, gy: number) => dieIndex(layout.x, layout.y, gx, gy);
    // Die -1 is the last column of the shot to the left (positive remainder, common practice).
    expect(p.shotColumn[at(-1, 5)]).toBe(3);
    expect(p.shotRow[at(-1, 5)]).toBe(2);
    expect(p.shotIndex[at(0, 0)]).toBe(p.shotIndex[at(3, 2)]);
    expect(p.shotIndex[at(0, 0)]).not.toBe(p.shotIndex[at(4, 0)]);
    expect(p.shotIndex[at(0, 0)]).not.toBe(p.shotIndex[at(0, 3)]);
    const moved = placeDies(layout.x, layout.y, { ...known, shotX: 4, shotY: 3, shotOriginX: 1 });
    expect(moved.shotColumn[at(1, 0)]).toBe(0);
  });
});
