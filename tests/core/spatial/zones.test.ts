import { describe, expect, it } from 'vitest';
import * as ss from 'simple-statistics';
import { createRandom, layoutWafer } from '../../../src/core/generator';
import { deviationFlags, placeDies, spatialProfile, zoneSummaries } from '../../../src/core/spatial';

// Oracles: simple-statistics (npm reference library) for median, mean and sample standard
// deviation of each zone's values, gathered here by plain geometry; a hand-worked type 7 example.

const layout = layoutWafer({ dieWidthMm: 4, dieHeightMm: 4 });
const placement = placeDies(layout.x, layout.y, { dieWidthMm: 4, dieHeightMm: 4, centreX: 0, centreY: 0, shotX: 4, shotY: 3 });
const random = createRandom(21);
const base = Float64Array.from(layout.x, () => random.normal(0, 1));

describe('zoneSummaries', () => {
  it('gives each zone the summary of exactly its own values', () => {
    const zone = Int32Array.from(layout.x, (x) => ((x % 3) + 3) % 3);
    const zones = zoneSummaries(base, zone, 3, 0);
    for (const z of zones) {
      const own = Array.from(base).filter((_, i) => zone[i] === z.zone);
      expect(z.dies).toBe(own.length);
      expect(z.summary?.median).toBeCloseTo(ss.median(own), 12);
      expect(z.summary?.mean).toBeCloseTo(ss.mean(own), 12);
      expect(z.summary?.sigma).toBeCloseTo(ss.sampleStandardDeviation(own), 12);
    }
  });

  it('skips missing values and reports an empty zone as having no summary', () => {
    const values = Float64Array.of(1, NaN, 3, 5);
    const zones = zoneSummaries(values, Int32Array.of(0, 0, 0, 2), 3, 2);
    expect(zones[0].summary?.n).toBe(2);
    expect(zones[0].medianOffset).toBe(0);
    expect(zones[1].summary).toBeUndefined();
    expect(zones[1].medianOffset).toBeNaN();
    expect(zones[2].medianOffset).toBe(3);
  });
});

describe('spatialProfile', () => {
  it('shows a raised ring in the radial profile and nowhere else', () => {
    // Dies between 0.4 and 0.6 of the usable radius (ring 2 of the default edges) read 5 higher.
    const values = base.map((v, i) => (placement.radiusFraction[i] >= 0.4 && placement.radiusFraction[i] < 0.6 ? v + 5 : v));
    const profile = spatialProfile(values, placement);
    const ringTwo = Array.from(values).filter((_, i) => placement.radiusFraction[i] >= 0.4 && placement.radiusFraction[i] < 0.6);
    expect(profile.rings).toHaveLength(5);
    expect(profile.rings[2].summary?.median).toBeCloseTo(ss.median(ringTwo), 12);
    expect(profile.rings[2].fromFraction).toBe(0.4);
    expect(profile.rings[4].toFraction).toBe(Infinity);
    for (const ring of profile.rings) {
      if (ring.zone === 2) expect(ring.medianOffset).toBeGreaterThan(4);
      else expect(Math.abs(ring.medianOffset)).toBeLessThan(1);
    }
  });

  it('puts a right-hand-side shift in the quadrants and sectors right of the notch axis', () => {
    const values = base.map((v, i) => (placement.xMm[i] > 0 ? v + 3 : v));
    const profile = spatialProfile(values, placement);
    const [upperRight, upperLeft, lowerLeft, lowerRight] = profile.quadrants.map((q) => q.summary?.median ?? NaN);
    expect(upperRight - upperLeft).toBeGreaterThan(2.5);
    expect(lowerRight - lowerLeft).toBeGreaterThan(2.5);
    expect(profile.sectors).toHaveLength(8);
    expect(profile.sectors[0].summary!.median - profile.sectors[3].summary!.median).toBeGreaterThan(2.5);
  });

  it('finds a reticle-repeating offset at its position within the shot', () => {
    // Shot 4 x 3 dies; every die at column 1, row 2 of its field reads 2 higher (a mask defect signature).
    const values = base.map((v, i) => (placement.shotColumn[i] === 1 && placement.shotRow[i] === 2 ? v + 2 : v));
    const profile = spatialProfile(values, placement);
    expect(profile.shotPositions).toHaveLength(12);
    const worst = profile.shotPositions.reduce((a, b) => (Math.abs(b.medianOffset) > Math.abs(a.medianOffset) ? b : a));
    expect([worst.shotColumn, worst.shotRow]).toEqual([1, 2]);
    const own = Array.from(values).filter((_, i) => placement.shotColumn[i] === 1 && placement.shotRow[i] === 2);
    expect(worst.summary?.median).toBeCloseTo(ss.median(own), 12);
  });
});

describe('deviationFlags', () => {
  it('flags by robust z with type 7 quartiles and the AEC-Q001 robust sigma, in the chosen direction', () => {
    // 1..9 and 100: median 5.5, Q1 3.25, Q3 7.75 (type 7, worked by hand); AEC-Q001 Rev-D robust
    // sigma = IQR / 1.35 = 3.333; z(100) = 28.35, z(1) = -1.35, z(2) = -1.05.
    const values = Float64Array.of(1, 2, 3, 4, 5, 6, 7, 8, 9, 100, NaN);
    expect(Array.from(deviationFlags(values, 3))).toEqual([0, 0, 0, 0, 0, 0, 0, 0, 0, 1, 0]);
    expect(Array.from(deviationFlags(values, 3, 'low'))).toEqual(new Array(11).fill(0));
    expect(Array.from(deviationFlags(values, 1.3, 'low')).slice(0, 2)).toEqual([1, 0]);
    // |z(1)| is 1.35 with the AEC constant (1.349 with the normal-consistent one): over 1.3495, under 1.3505.
    expect(Array.from(deviationFlags(values, 1.3495, 'low')).slice(0, 2)).toEqual([1, 0]);
    expect(Array.from(deviationFlags(values, 1.3505, 'low')).slice(0, 2)).toEqual([0, 0]);
  });
});
