// The lot view: wafers ordered by how far they sit from the rest of the lot, and probe sites off
// in the same direction on most wafers named as test-hardware suspects. Hand-worked inputs.
import { describe, expect, it } from 'vitest';
import { excursionScores, hardwareSuspects, type SiteBias } from '../../../src/core/analysis';

function bias(site: number, shift: number): SiteBias {
  return { param: 'Ioff_n', site, shift, p: 1e-9, nSite: 100, nOthers: 300, medianSite: 1, medianOthers: 1, rankBiserial: 0.5, kruskalWallisP: 1e-9 };
}

describe('excursionScores', () => {
  it('measures each wafer against the median of the other wafers in their robust sigmas', () => {
    // Medians -11.0, -11.1, -10.9, -10.0 (decades), each wafer's robust sigma 0.1.
    // Wafer 4: others' medians -11.0, -11.1, -10.9 -> median -11.0; shift (-10.0 + 11.0)/0.1 = +10.
    // Wafer 1: others -11.1, -10.9, -10.0 -> median -10.9; shift (-11.0 + 10.9)/0.1 = -1.
    const centres = new Map([['Ioff_n', [-11, -11.1, -10.9, -10].map((centre) => ({ centre, sigma: 0.1 }))]]);
    const scores = excursionScores(centres, [0, 0, 0.01, 0.2], undefined);
    expect(scores[3].score).toBeCloseTo(10, 10);
    expect(scores[3].shift).toBeCloseTo(10, 10);
    expect(scores[0].shift).toBeCloseTo(-1, 10);
    expect(scores[3].flaggedFraction).toBe(0.2);
    expect(scores[3].vsHistory).toBeUndefined();
  });

  it('also measures against earlier lots when the store has them', () => {
    // Earlier lots: median -11.2, robust sigma 0.2 -> wafer at -10.0 is (1.2)/0.2 = +6.
    const centres = new Map([['Ioff_n', [-11, -10].map((centre) => ({ centre, sigma: 0.1 }))]]);
    const scores = excursionScores(centres, [0, 0], { lots: 7, references: { Ioff_n: { centre: -11.2, robustSigma: 0.2, lots: 7, n: 1000 } } });
    expect(scores[1].vsHistory).toEqual({ score: expect.closeTo(6, 10), param: 'Ioff_n', shift: expect.closeTo(6, 10), lots: 7 });
  });
});

describe('hardwareSuspects', () => {
  it('names a site reported high on at least 60 % of the wafers, not one seen on a few', () => {
    // Site 3 high on 4 of 5 wafers (80 %); site 1 low on 2 of 5 (40 %).
    const perWafer = [[bias(3, 0.25)], [bias(3, 0.2), bias(1, -0.1)], [bias(3, 0.3)], [bias(1, -0.1)], [bias(3, 0.22)]];
    const suspects = hardwareSuspects(perWafer, 0.6);
    expect(suspects).toHaveLength(1);
    expect(suspects[0]).toMatchObject({ site: 3, param: 'Ioff_n', sign: 1, wafers: 4, of: 5 });
    // Median of 0.2, 0.22, 0.25, 0.3 = 0.235.
    expect(suspects[0].medianShift).toBeCloseTo(0.235, 12);
    expect(suspects[0].text).toMatch(/test hardware suspect/);
  });

  it('does not count a site that swings both ways as one direction', () => {
    const perWafer = [[bias(2, 0.2)], [bias(2, -0.2)], [bias(2, 0.2)], [bias(2, -0.2)]];
    expect(hardwareSuspects(perWafer, 0.6)).toEqual([]);
  });
});
