// Points of the trade-off plot and box selection. Oracles: the definition of log10 (Math.log10,
// ECMA-262) for the x axis, 1 A = 1e6 uA for the y axis, and a brute-force scan of the frame for
// which dies lie in a box.
import { describe, expect, it } from 'vitest';
import type { WaferFrame } from '../../src/core/frame';
import { diesInBox, pointsOfDies, tradeoffPoints } from '../../src/ui/plot/tradeoffPoints';

function frame(): WaferFrame {
  const n = 200;
  const ioff = new Float64Array(n);
  const ion = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    ioff[i] = (i % 2 ? -1 : 1) * 10 ** (-11 + (i % 37) / 20);
    ion[i] = -(700 + (i % 53)) * 1e-6;
  }
  ioff[5] = NaN;
  ioff[6] = 0;
  ion[7] = NaN;
  return {
    lot: 'L', wafer: 'W',
    x: Int32Array.from({ length: n }, (_, i) => i % 20),
    y: Int32Array.from({ length: n }, (_, i) => Math.floor(i / 20)),
    site: Int32Array.from({ length: n }, (_, i) => (i % 4) + 1),
    params: [{ name: 'Ioff_p', unit: 'A' }, { name: 'Ion_p', unit: 'A' }],
    values: { Ioff_p: ioff, Ion_p: ion },
  };
}

describe('tradeoffPoints', () => {
  it('plots log10 |Ioff| against |Ion| in uA and leaves out dies without both values', () => {
    const f = frame();
    const points = tradeoffPoints(f, 'Ion_p', 'Ioff_p');
    expect(points.die.length).toBe(197);
    expect([...points.die]).not.toContain(5);
    expect([...points.die]).not.toContain(6);
    expect([...points.die]).not.toContain(7);
    for (let k = 0; k < points.die.length; k++) {
      const i = points.die[k];
      expect(points.x[k]).toBeCloseTo(Math.log10(Math.abs(f.values.Ioff_p[i])), 12);
      expect(points.y[k]).toBeCloseTo(Math.abs(f.values.Ion_p[i]) * 1e6, 9);
    }
  });

  it('groups points by probe site, every plotted die in exactly one group', () => {
    const points = tradeoffPoints(frame(), 'Ion_p', 'Ioff_p');
    expect(points.groups.map((g) => g.site)).toEqual([1, 2, 3, 4]);
    const all = points.groups.flatMap((g) => g.dies).sort((a, b) => a - b);
    expect(all).toEqual([...points.die].sort((a, b) => a - b));
  });

  it('selects in a box exactly the dies a brute-force scan finds', () => {
    const f = frame();
    const points = tradeoffPoints(f, 'Ion_p', 'Ioff_p');
    const [x0, x1, y0, y1] = [-10.4, -9.6, 710, 740];
    const expected: number[] = [];
    for (let i = 0; i < f.x.length; i++) {
      const off = Math.abs(f.values.Ioff_p[i]);
      const on = Math.abs(f.values.Ion_p[i]) * 1e6;
      if (!(off > 0) || !Number.isFinite(on)) continue;
      const lx = Math.log10(off);
      if (lx >= x0 && lx <= x1 && on >= y0 && on <= y1) expected.push(i);
    }
    expect(expected.length).toBeGreaterThan(5);
    expect(diesInBox(points, x1, x0, y1, y0).sort((a, b) => a - b)).toEqual(expected);
  });

  it('gives the highlight points of selected dies that are plotted', () => {
    const points = tradeoffPoints(frame(), 'Ion_p', 'Ioff_p');
    expect(pointsOfDies(points, new Set([0, 5, 10]))).toHaveLength(2);
    expect(pointsOfDies(points, new Set())).toEqual([]);
  });
});
