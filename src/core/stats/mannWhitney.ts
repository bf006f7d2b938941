// Two-sample rank test: does one group tend to give larger values than the other?
import { countFinite, isFiniteNumber, type NumericInput } from './finite';
import { normalSurvival } from './normal';
import { midranksOfFinite } from './ranks';

export interface MannWhitneyResult {
  /**
   * U of the first sample: the number of pairs (aᵢ, bⱼ) with aᵢ > bⱼ, ties counting ½;
   * equals R_a - n1(n1+1)/2. The second sample's U is n1·n2 - u.
   */
  u: number;
  /** Normal-approximation z with tie and continuity corrections; positive when a tends larger. */
  z: number;
  /** Two-sided p-value from the normal approximation. */
  p: number;
  /** Finite values in the first sample. */
  n1: number;
  /** Finite values in the second sample. */
  n2: number;
  /**
   * Rank-biserial correlation 2u/(n1·n2) - 1 = P(a > b) - P(a < b), in [-1, 1]
   * (D. S. Kerby, "The simple difference formula", Comprehensive Psychology 3, 2014).
   */
  rankBiserial: number;
}

/**
 * Mann–Whitney U test (Wilcoxon rank-sum test) of two independent samples (H. B. Mann and
 * D. R. Whitney, "On a test of whether one of two random variables is stochastically larger than
 * the other", Annals of Mathematical Statistics 18(1), 1947, 50–60).
 *
 * Method: average ranks of the pooled finite values; z = (|U - n1n2/2| - ½) / σ_U with
 * σ_U² = n1n2/12 · [(N + 1) - Σ(t³ - t)/(N(N - 1))] (tie correction; continuity correction ½,
 * never carried past zero); p = 2 Q(|z|). This is the normal approximation R's wilcox.test
 * uses with exact = FALSE, correct = TRUE. It is reliable once both groups have about 8 or
 * more values; for smaller groups treat p as indicative (an exact distribution would be needed).
 * When every pooled value is tied the samples cannot be told apart: z = 0, p = 1.
 *
 * O(n1 + n2) with a radix ordering of the pooled copy (within the required O(N log N)); one
 * pooled copy plus its ranks.
 *
 * @returns undefined when either sample has fewer than 2 finite values.
 */
export function mannWhitney(a: NumericInput, b: NumericInput): MannWhitneyResult | undefined {
  const n1 = countFinite(a);
  const n2 = countFinite(b);
  if (n1 < 2 || n2 < 2) return undefined;
  const total = n1 + n2;
  const pooled = new Float64Array(total);
  let k = 0;
  for (let i = 0; i < a.length; i++) {
    const v = a[i];
    if (isFiniteNumber(v)) pooled[k++] = v;
  }
  for (let i = 0; i < b.length; i++) {
    const v = b[i];
    if (isFiniteNumber(v)) pooled[k++] = v;
  }
  // a's values come first in the pooled copy, so its rank sum is a sequential sum.
  const { ranks, tieTerm } = midranksOfFinite(pooled);
  let rankSumA = 0;
  for (let i = 0; i < n1; i++) rankSumA += ranks[i];
  const u = rankSumA - (n1 * (n1 + 1)) / 2;
  const product = n1 * n2;
  const variance = (product / 12) * (total + 1 - tieTerm / (total * (total - 1)));
  const rankBiserial = (2 * u) / product - 1;
  const shift = u - product / 2;
  if (!(variance > 0)) return { u, z: 0, p: 1, n1, n2, rankBiserial };
  const z = (Math.sign(shift) * Math.max(Math.abs(shift) - 0.5, 0)) / Math.sqrt(variance);
  const p = Math.min(1, 2 * normalSurvival(Math.abs(z)));
  return { u, z, p, n1, n2, rankBiserial };
}
