import { describe, expect, it } from 'vitest';
import { grossDiesApproximation, layoutWafer, probeSite } from '../../../src/core/generator/layout';

describe('grossDiesApproximation', () => {
  it('gives the classic dies-per-wafer figures for a 300 mm wafer', () => {
    // DOMAIN.md [derived]: DPW = pi d^2/(4S) - pi d/sqrt(2S); 640.2 for 100 mm^2, 269.7 for 225 mm^2
    // (Hennessy & Patterson quote about 640 and 270, from memory).
    expect(grossDiesApproximation(300, 100)).toBeCloseTo(640.2, 1);
    expect(grossDiesApproximation(300, 225)).toBeCloseTo(269.7, 1);
  });
});

describe('layoutWafer', () => {
  const tenMm = layoutWafer({ dieWidthMm: 10, dieHeightMm: 10 });

  it('counts close to the dies-per-wafer approximation on the usable diameter', () => {
    // SEMI T7: 3 mm edge exclusion on 300 mm leaves a 294 mm usable diameter; the classic
    // approximation (DOMAIN.md) gives 613.6 dies of 100 mm^2 there. It is an approximation, so allow 3 %.
    const expected = grossDiesApproximation(294, 100);
    expect(Math.abs(tenMm.x.length - expected) / expected).toBeLessThan(0.03);
  });

  it('counts close to 640 dies of 10 x 10 mm with no edge exclusion', () => {
    // DOMAIN.md [derived]: 640.2 gross dies on a full 300 mm wafer.
    const full = layoutWafer({ dieWidthMm: 10, dieHeightMm: 10, edgeExclusionMm: 0 });
    expect(Math.abs(full.x.length - 640.2) / 640.2).toBeLessThan(0.03);
  });

  it('keeps the classic approximation within 3 % for the demo die size and a shifted grid', () => {
    for (const layout of [
      layoutWafer({ dieWidthMm: 6.5, dieHeightMm: 6.5 }),
      layoutWafer({ dieWidthMm: 6.5, dieHeightMm: 6.5, gridOffsetXMm: 3.25, gridOffsetYMm: 3.25 }),
    ]) {
      const expected = grossDiesApproximation(294, 6.5 * 6.5);
      expect(Math.abs(layout.x.length - expected) / expected).toBeLessThan(0.03);
    }
  });

  it('includes exactly the grid positions whose four corners are inside the usable radius', () => {
    // Brute-force geometry: test every corner of every candidate position against the circle.
    const layout = layoutWafer({ dieWidthMm: 7, dieHeightMm: 5, waferDiameterMm: 200, edgeExclusionMm: 2 });
    const radius = 98;
    const inside = new Set<string>();
    for (let x = -20; x <= 20; x++) {
      for (let y = -25; y <= 25; y++) {
        const corners = [[-1, -1], [-1, 1], [1, -1], [1, 1]].map(([sx, sy]) => [x * 7 + sx * 3.5, y * 5 + sy * 2.5]);
        if (corners.every(([cx, cy]) => cx * cx + cy * cy <= radius * radius)) inside.add(`${x},${y}`);
      }
    }
    const produced = new Set(Array.from(layout.x, (x, i) => `${x},${layout.y[i]}`));
    expect(produced.size).toBe(layout.x.length);
    expect([...produced].sort()).toEqual([...inside].sort());
    expect(layout.usableRadiusMm).toBe(98);
  });

  it('centres die (0, 0) on the wafer centre and gives centre coordinates in mm', () => {
    const i = Array.from(tenMm.x).findIndex((x, k) => x === 0 && tenMm.y[k] === 0);
    expect(i).toBeGreaterThanOrEqual(0);
    expect(tenMm.centreXMm[i]).toBe(0);
    expect(tenMm.centreYMm[i]).toBe(0);
    const j = Array.from(tenMm.x).findIndex((x, k) => x === 3 && tenMm.y[k] === -2);
    expect(tenMm.centreXMm[j]).toBe(30);
    expect(tenMm.centreYMm[j]).toBe(-20);
  });

  it('lists dies top row first, left to right', () => {
    for (let i = 1; i < tenMm.x.length; i++) {
      const sameRow = tenMm.y[i] === tenMm.y[i - 1];
      expect(sameRow ? tenMm.x[i] > tenMm.x[i - 1] : tenMm.y[i] < tenMm.y[i - 1]).toBe(true);
    }
  });

  it('numbers a 2 x 2 touchdown 1..4 by die position modulo the touchdown', () => {
    // Common practice: sites repeat with the touchdown; our numbering is left to right, then upward.
    expect(probeSite(0, 0, 2, 2)).toBe(1);
    expect(probeSite(1, 0, 2, 2)).toBe(2);
    expect(probeSite(0, 1, 2, 2)).toBe(3);
    expect(probeSite(1, 1, 2, 2)).toBe(4);
    expect(probeSite(-1, -1, 2, 2)).toBe(4);
    expect(probeSite(-2, 3, 2, 2)).toBe(3);
    const counts = [0, 0, 0, 0];
    tenMm.site.forEach((site) => counts[site - 1]++);
    for (const count of counts) expect(Math.abs(count - tenMm.x.length / 4)).toBeLessThan(0.05 * tenMm.x.length);
  });

  it('supports other touchdowns such as 4 x 1', () => {
    const layout = layoutWafer({ dieWidthMm: 10, dieHeightMm: 10, sitesX: 4, sitesY: 1 });
    expect(new Set(layout.site)).toEqual(new Set([1, 2, 3, 4]));
    layout.x.forEach((x, i) => expect(layout.site[i]).toBe(1 + (((x % 4) + 4) % 4)));
  });

  it('places each die in its exposure field by position modulo the shot size', () => {
    const layout = layoutWafer({ dieWidthMm: 10, dieHeightMm: 10 }); // default 4 x 3 shot
    layout.x.forEach((x, i) => {
      expect(layout.shotColumn[i]).toBe(((x % 4) + 4) % 4);
      expect(layout.shotRow[i]).toBe(((layout.y[i] % 3) + 3) % 3);
    });
    expect(Math.max(...layout.shotColumn)).toBe(3);
    expect(Math.max(...layout.shotRow)).toBe(2);
  });

  it('refuses impossible geometry', () => {
    expect(() => layoutWafer({ dieWidthMm: 0, dieHeightMm: 5 })).toThrow(/positive/);
    expect(() => layoutWafer({ dieWidthMm: 5, dieHeightMm: 5, edgeExclusionMm: 200 })).toThrow(/usable/);
    expect(() => layoutWafer({ dieWidthMm: 5, dieHeightMm: 5, sitesX: 0 })).toThrow(/sitesX/);
  });
});
