// Radial profile and density image of the plots, and the overview order. Oracles:
// simple-statistics' median (an independent implementation) for each ring's median; the
// counting definition of a 2-D histogram (every point in bounds lands in exactly one pixel);
// and the rule the overview states (the lot's excursion order when given, else by score).
import { describe, expect, it } from 'vitest';
import { median as ssMedian } from 'simple-statistics';
import { radialProfile } from '../../src/ui/plot/radialProfile';
import { densityCounts, densityPixels } from '../../src/ui/plot/density';
import { overviewOrder, excursionScore, signatureLabel } from '../../src/ui/analysisExtras';
import type { LotAnalysis, WaferAnalysis } from '../../src/core/analysis/types';

describe('radialProfile', () => {
  it('gives each ring the median of its dies (log10 of magnitudes for currents)', () => {
    const xs: number[] = [], ys: number[] = [], vs: number[] = [];
    for (let y = -10; y <= 10; y++) for (let x = -10; x <= 10; x++) {
      if (x * x + y * y > 100) continue;
      xs.push(x); ys.push(y); vs.push(1e-11 * (1 + Math.hypot(x, y)));
    }
    const x = Int32Array.from(xs), y = Int32Array.from(ys), v = Float64Array.from(vs);
    const bins = radialProfile(x, y, v, true, 4);
    const rMax = Math.max(...xs.map((a, i) => Math.hypot(a, ys[i])));
    for (const [k, bin] of bins.entries()) {
      const members = vs.filter((_, i) => Math.min(3, Math.floor((Math.hypot(xs[i], ys[i]) / rMax) * 4)) === k).map((a) => Math.log10(a));
      expect(bin.n).toBe(members.length);
      expect(bin.median).toBeCloseTo(ssMedian(members), 12);
    }
    // Leakage rising to the edge: the profile rises ring by ring.
    expect(bins[3].median).toBeGreaterThan(bins[0].median);
  });
});

describe('density image', () => {
  it('counts every point inside the bounds once and leaves out the skipped group', () => {
    const x = Float64Array.from([0.1, 0.1, 0.9, 0.5, 2.0, 0.5]);
    const y = Float64Array.from([0.1, 0.1, 0.9, 0.5, 0.5, 0.5]);
    const g = Int32Array.from([0, 0, 0, 0, 0, 7]);
    const { counts, max, points } = densityCounts(x, y, g, 7, { xMin: 0, xMax: 1, yMin: 0, yMax: 1 }, 2, 2);
    expect(points).toBe(4);
    expect(counts.reduce((a, b) => a + b, 0)).toBe(4);
    // Row 0 is the top (y near 1): (0.9, 0.9) top right; the two (0.1, 0.1) bottom left; (0.5, 0.5)
    // falls on the lower-right pixel (column 1, row 1) because pixel edges belong to the next pixel.
    expect([...counts]).toEqual([0, 1, 2, 1]);
    expect(max).toBe(2);
    const pixels = densityPixels(counts, max, [10, 20, 30]);
    expect(pixels[3]).toBe(0);
    expect(pixels[2 * 4 + 3]).toBeGreaterThan(pixels[1 * 4 + 3]);
  });
});

describe('overview order', () => {
  const wafer = (name: string, score?: number): WaferAnalysis => ({ lot: 'L', wafer: name, ...(score === undefined ? {} : { excursion: { score } }) } as unknown as WaferAnalysis);
  it('follows the lot\'s excursion order when the analysis gives one', () => {
    const analysis = { wafers: [], lots: [{ lot: 'L', waferOrder: ['03', '01'] }] } as unknown as LotAnalysis;
    expect(overviewOrder(['01', '02', '03'], analysis, 'L')).toEqual({ order: ['03', '01', '02'], byScore: true });
  });
  it('orders by score, highest first, when only scores are given, and keeps wafer order without them', () => {
    const scored = { wafers: [wafer('01', 1), wafer('02', 5), wafer('03', 2)], lots: [] } as unknown as LotAnalysis;
    expect(overviewOrder(['01', '02', '03'], scored, 'L').order).toEqual(['02', '03', '01']);
    const bare = { wafers: [wafer('01'), wafer('02')], lots: [] } as unknown as LotAnalysis;
    expect(overviewOrder(['01', '02'], bare, 'L')).toEqual({ order: ['01', '02'], byScore: false });
    expect(excursionScore(wafer('01'))).toBeNull();
  });
  it('reads a signature label given as text or as an object, and none when absent', () => {
    expect(signatureLabel({ signature: 'edge-ring' } as unknown as WaferAnalysis)).toBe('edge-ring');
    expect(signatureLabel({ signature: { label: 'center' } } as unknown as WaferAnalysis)).toBe('center');
    expect(signatureLabel(wafer('01'))).toBeNull();
  });
});
