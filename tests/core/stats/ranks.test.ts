import { describe, expect, it } from 'vitest';
import { midranksOfFinite, rank, rankWithTies } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/** Oracle: the definition of the average rank, by counting: #{x_j < x_i} + (#{x_j = x_i} + 1)/2. */
function bruteForceRanks(values: number[]): number[] {
  const finite = values.filter(Number.isFinite);
  return values.map((v) => {
    if (!Number.isFinite(v)) return NaN;
    let below = 0;
    let equal = 0;
    for (const w of finite) {
      if (w < v) below++;
      else if (w === v) equal++;
    }
    return below + (equal + 1) / 2;
  });
}

describe('rank', () => {
  it('gives tied values the mean of the ranks they span', () => {
    // Kendall's average-rank convention: [10, 20, 20, 30] -> [1, 2.5, 2.5, 4].
    expect(Array.from(rank([10, 20, 20, 30]))).toEqual([1, 2.5, 2.5, 4]);
    expect(Array.from(rank([3, 1, 3, 3]))).toEqual([3, 1, 3, 3]);
  });

  it('keeps input order and marks non-finite entries NaN without ranking them', () => {
    expect(Array.from(rank([30, NaN, 10, null, 20]))).toEqual([3, NaN, 1, NaN, 2]);
  });

  it('returns an empty array for empty input', () => {
    expect(rank([]).length).toBe(0);
  });

  it('matches the counting definition on random data with many ties, small and large', () => {
    const random = seeded(11);
    // 700 values take the comparison path, 4000 the radix path of the ordering.
    for (const n of [700, 4000]) {
      const values = Array.from({ length: n }, () => Math.floor(random() * 40) - 20 + (random() < 0.5 ? 0.25 : 0));
      values[5] = NaN;
      values[6] = -0;
      values[7] = 0;
      expect(Array.from(rank(values))).toEqual(bruteForceRanks(values));
    }
  });
});

describe('rankWithTies', () => {
  it('reports the tie groups and Σ(t³ - t)', () => {
    const r = rankWithTies([5, 1, 5, 2, 2, 5, NaN, 9]);
    // Worked by hand: groups {2, 2} (t = 2) and {5, 5, 5} (t = 3): (8 - 2) + (27 - 3) = 30.
    expect(r.n).toBe(7);
    expect(r.tieSizes).toEqual([2, 3]);
    expect(r.tieTerm).toBe(30);
    expect(Array.from(r.ranks)).toEqual([5, 1, 5, 2.5, 2.5, 5, NaN, 7]);
  });

  it('reports no ties for distinct values', () => {
    const r = rankWithTies([0.3, 0.1, 0.2]);
    expect(r.tieSizes).toEqual([]);
    expect(r.tieTerm).toBe(0);
  });

  it('counts tie groups the same way as a tally of equal values', () => {
    const random = seeded(12);
    const values = Array.from({ length: 2000 }, () => Math.floor(random() * 300));
    const tally = new Map<number, number>();
    for (const v of values) tally.set(v, (tally.get(v) ?? 0) + 1);
    let expected = 0;
    for (const t of tally.values()) expected += t ** 3 - t;
    expect(rankWithTies(values).tieTerm).toBe(expected);
    expect(midranksOfFinite(Float64Array.from(values)).tieTerm).toBe(expected);
  });
});

describe('midranksOfFinite', () => {
  it('ranks an all-finite array in place order', () => {
    const r = midranksOfFinite(new Float64Array([2, 7, 2, 1, 2]));
    // By hand: 1→1, 2→(2+3+4)/3 = 3 (three times), 7→5.
    expect(Array.from(r.ranks)).toEqual([3, 5, 3, 1, 3]);
    expect(r.tieSizes).toEqual([3]);
  });
});
