import { describe, expect, it } from 'vitest';
import { repeatedMedianLine, theilSenLine } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/** Oracle: the median as every textbook defines it, on a full sort. */
function plainMedian(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

// Four points on y = 2x and one wild point (5, 100), worked by hand:
// Theil-Sen (Theil 1950; Sen 1968): the 10 pairwise slopes are six 2s and 24.5, 32, 47, 92;
// their median is 2, and the intercept median(y - 2x) = median(0, 0, 0, 0, 90) = 0.
// Repeated median (Siegel 1982): for the first four points the slopes to the others are
// {2, 2, 2, 24.5 | 32 | 47 | 92}, median 2; for the wild point {24.5, 32, 47, 92}, median 39.5;
// the median of (2, 2, 2, 2, 39.5) is 2.
const X = [1, 2, 3, 4, 5];
const Y = [2, 4, 6, 8, 100];

describe('theilSenLine', () => {
  it('ignores one wild point of five (hand-worked)', () => {
    expect(theilSenLine(X, Y)).toEqual({ slope: 2, intercept: 0, n: 5 });
  });

  it('equals the median of all pairwise slopes computed the long way on random data', () => {
    const random = seeded(11);
    const x = Array.from({ length: 40 }, () => random() * 10);
    const y = x.map((v) => 3 - 0.5 * v + random());
    const slopes: number[] = [];
    for (let i = 0; i < x.length; i++) for (let j = i + 1; j < x.length; j++) slopes.push((y[j] - y[i]) / (x[j] - x[i]));
    const slope = plainMedian(slopes);
    const fit = theilSenLine(x, y)!;
    expect(fit.slope).toBeCloseTo(slope, 12);
    expect(fit.intercept).toBeCloseTo(plainMedian(y.map((v, i) => v - slope * x[i])), 12);
  });

  it('skips pairs with equal x and says when there are too few points', () => {
    expect(theilSenLine([1, 1, 2], [0, 5, 2])!.slope).toBe(plainMedian([2, -3]));
    expect(theilSenLine([1], [1])).toBeUndefined();
    expect(theilSenLine([2, 2, 2], [1, 2, 3])).toBeUndefined();
  });
});

describe('repeatedMedianLine', () => {
  it('ignores one wild point of five (hand-worked)', () => {
    expect(repeatedMedianLine(X, Y)).toEqual({ slope: 2, intercept: 0, n: 5 });
  });

  it('equals nested medians computed the long way on random data', () => {
    const random = seeded(12);
    const x = Array.from({ length: 31 }, () => random() * 4);
    const y = x.map((v) => 1 + 2 * v + 0.3 * random());
    const outer = x.map((xi, i) => plainMedian(x.flatMap((xj, j) => (j === i ? [] : [(y[j] - y[i]) / (xj - xi)]))));
    const slope = plainMedian(outer);
    const fit = repeatedMedianLine(x, y)!;
    expect(fit.slope).toBeCloseTo(slope, 12);
    expect(fit.intercept).toBeCloseTo(plainMedian(y.map((v, i) => v - slope * x[i])), 12);
  });

  it('keeps the line of the majority when 40 % of the points are wild (50 % breakdown, Siegel 1982)', () => {
    const random = seeded(13);
    const x = Array.from({ length: 50 }, (_, i) => i);
    const y = x.map((v, i) => (i % 5 < 2 ? 500 + 100 * random() : 4 + 0.25 * v + 0.01 * (random() - 0.5)));
    const fit = repeatedMedianLine(x, y)!;
    expect(fit.slope).toBeCloseTo(0.25, 2);
    expect(fit.intercept).toBeCloseTo(4, 1);
  });

  it('uses only complete pairs (missing-data rule of src/core/stats)', () => {
    expect(repeatedMedianLine([1, 2, NaN, 3, 4], [1, 2, 5, 3, Infinity])).toEqual({ slope: 1, intercept: 0, n: 3 });
  });
});
