// Average ranks with ties, the common ground of Spearman, Mann–Whitney and Kruskal–Wallis.
import { finiteValues, isFiniteNumber, type NumericInput } from './finite';
import { ascendingOrder } from './sortOrder';

/** Ranks of the finite values together with what rank tests need to correct for ties. */
export interface Ranking {
  /** 1-based average ranks in input order; NaN where the input value did not count as data. */
  ranks: Float64Array;
  /** Number of finite values ranked. */
  n: number;
  /** Size of every group of tied values (groups of 2 or more only), in ascending value order. */
  tieSizes: number[];
  /** Σ (t³ - t) over the tie groups: the tie-correction term of rank tests (0 without ties). */
  tieTerm: number;
}

/**
 * Average ("mid") ranks of the finite values: tied values all get the mean of the ranks they
 * span, so ranks of [10, 20, 20, 30] are [1, 2.5, 2.5, 4] (M. G. Kendall, Rank Correlation
 * Methods, 1948, ch. 3). Non-finite entries get NaN and take no rank.
 *
 * O(n) radix ordering plus one walk; one copy of the finite values plus the output.
 *
 * @returns a Float64Array of the input's length (empty for empty input).
 */
export function rank(values: NumericInput): Float64Array {
  return rankWithTies(values).ranks;
}

/**
 * Average ranks as `rank` computes them, plus the tie groups and Σ (t³ - t) used by tie
 * corrections.
 *
 * O(n) time (radix ordering).
 */
export function rankWithTies(values: NumericInput): Ranking {
  const copy = finiteValues(values);
  const ranked = midranksOfFinite(copy);
  const ranks = new Float64Array(values.length);
  for (let i = 0, k = 0; i < values.length; i++) ranks[i] = isFiniteNumber(values[i]) ? ranked.ranks[k++] : NaN;
  return { ranks, n: copy.length, tieSizes: ranked.tieSizes, tieTerm: ranked.tieTerm };
}

/**
 * Average ranks of `values`, which must all be finite, in the same positions, with the tie
 * groups. The shared engine of the rank statistics: callers that already hold a finite copy
 * (pooled samples, complete pairs) rank it without another copy.
 */
export function midranksOfFinite(values: Float64Array): { ranks: Float64Array; tieSizes: number[]; tieTerm: number } {
  const n = values.length;
  const order = ascendingOrder(values);
  const ranks = new Float64Array(n);
  const tieSizes: number[] = [];
  let tieTerm = 0;
  let start = 0;
  while (start < n) {
    const v = values[order[start]];
    let end = start + 1;
    while (end < n && values[order[end]] === v) end++;
    // Positions start+1 .. end (1-based) are tied; each gets their mean.
    const average = (start + 1 + end) / 2;
    for (let j = start; j < end; j++) ranks[order[j]] = average;
    const t = end - start;
    if (t > 1) {
      tieSizes.push(t);
      tieTerm += t * t * t - t;
    }
    start = end;
  }
  return { ranks, tieSizes, tieTerm };
}
