// Summary of ascending finite values: quartiles read directly (no selection), mean and sample
// standard deviation in two tight passes, the same methods src/core/stats/summarize uses
// (compensated sum with a residual correction; corrected two-pass variance, Chan, Golub & LeVeque,
// "Algorithms for computing the sample variance", The American Statistician 37(3), 1983).

import { IQR_PER_SIGMA } from '../stats';
import { sortedQuantile } from './sortedColumn';
import type { Summary } from './types';

/** Mean and sample variance of values[from..to) (any order). */
export function moments(values: ArrayLike<number>, from = 0, to = values.length): { mean: number; variance: number } {
  const n = to - from;
  let sum = 0;
  let compensation = 0;
  for (let i = from; i < to; i++) {
    const v = values[i];
    const t = sum + v;
    compensation += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  const m0 = (sum + compensation) / n;
  let sumDeviation = 0;
  let sumSquares = 0;
  for (let i = from; i < to; i++) {
    const d = values[i] - m0;
    sumDeviation += d;
    sumSquares += d * d;
  }
  const mean = m0 + sumDeviation / n;
  const variance = n < 2 ? NaN : Math.max(sumSquares - (sumDeviation * sumDeviation) / n, 0) / (n - 1);
  return { mean, variance };
}

/** Count, mean and sum of squared deviations of a group, the form groups combine in. */
export interface Moments { n: number; mean: number; m2: number }

export function momentsOf(summary: Summary): Moments {
  return { n: summary.n, mean: summary.mean, m2: summary.n < 2 ? 0 : summary.sigma * summary.sigma * (summary.n - 1) };
}

/**
 * Moments of the union of disjoint groups from the groups' own (T. F. Chan, G. H. Golub and
 * R. J. LeVeque, "Updating formulae and a pairwise algorithm for computing sample variances",
 * 1979): n = na + nb, delta = mean_b - mean_a, mean = mean_a + delta nb/n,
 * M2 = M2a + M2b + delta^2 na nb / n.
 */
export function combineMoments(parts: Moments[]): Moments {
  let acc: Moments = { n: 0, mean: 0, m2: 0 };
  for (const p of parts) {
    if (p.n === 0) continue;
    const n = acc.n + p.n;
    const delta = p.mean - acc.mean;
    acc = { n, mean: acc.mean + (delta * p.n) / n, m2: acc.m2 + p.m2 + (delta * delta * acc.n * p.n) / n };
  }
  return acc;
}

/**
 * Summary of ascending finite values in [from, to); undefined when empty. With `given` (the
 * moments of exactly these values, combined from their groups) no pass over the values is made
 * for the mean and standard deviation.
 */
export function sortedSummary(sorted: ArrayLike<number>, from = 0, to = sorted.length, given?: Moments): Summary | undefined {
  const n = to - from;
  if (n < 1) return undefined;
  const { mean, variance } = given && given.n === n
    ? { mean: given.mean, variance: n < 2 ? NaN : given.m2 / (n - 1) }
    : moments(sorted, from, to);
  const q1 = sortedQuantile(sorted, 0.25, from, to);
  const q3 = sortedQuantile(sorted, 0.75, from, to);
  return {
    n, mean, sigma: Math.sqrt(variance), median: sortedQuantile(sorted, 0.5, from, to), q1, q3,
    robustSigma: (q3 - q1) / IQR_PER_SIGMA, min: sorted[from], max: sorted[to - 1],
  };
}
