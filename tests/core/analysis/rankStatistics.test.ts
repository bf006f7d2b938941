// The analysis reads rank tests, correlations and quantiles from one sorted stream per group;
// these checks hold those shortcuts against simple-statistics (npm) on random data.
import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { siteBiasOfStream } from '../../../src/core/analysis';
import { mergeSorted } from '../../../src/core/analysis/lotMerge';
import { pairCorrelation } from '../../../src/core/analysis/rankCorrelation';
import { kruskalWallisFromSums, kthOfSorted, mannWhitneyFromRankSum } from '../../../src/core/analysis/siteBias';
import { sortColumn } from '../../../src/core/analysis/sortedColumn';
import { sortedSummary } from '../../../src/core/analysis/sortedSummary';
import { scatterMidranks } from '../../../src/core/analysis/streams';
import { seeded } from '../../support/random';

const random = seeded(2026);
const relClose = (a: number, b: number, tol = 1e-9) => Math.abs(a - b) <= tol * Math.max(Math.abs(a), Math.abs(b), 1e-300);

describe('rank tests from rank sums', () => {
  it('gives the Kruskal-Wallis H of three sites and its chi-square(2) p = exp(-H/2)', () => {
    // Rank sums of each group in the pooled sample from simple-statistics' wilcoxonRankSum (group
    // against the rest); H = 12/(N(N+1)) sum R_i^2/n_i - 3(N+1) (Kruskal & Wallis 1952, no ties
    // in continuous data); for 2 degrees of freedom the chi-square upper tail is exp(-x/2).
    const groups = [0, 0.15, -0.1].map((shift, g) => Array.from({ length: 60 + 10 * g }, () => random() + shift));
    const n = groups.reduce((s, g) => s + g.length, 0);
    const sums = groups.map((g, i) => ss.wilcoxonRankSum(g, groups.filter((_, j) => j !== i).flat()));
    const h = (12 / (n * (n + 1))) * sums.reduce((s, r, i) => s + (r * r) / groups[i].length, 0) - 3 * (n + 1);
    const p = kruskalWallisFromSums(Float64Array.from(sums), Int32Array.from(groups.map((g) => g.length)), n, 0);
    expect(relClose(p, Math.exp(-h / 2), 1e-7)).toBe(true);
  });

  it('gives the Mann-Whitney normal approximation of simple-statistics rank sums', () => {
    // Without ties and without the continuity correction's half step being material:
    // z = (R - n1(N+1)/2) / sqrt(n1 n2 (N+1)/12), so |z| matches within the 0.5 correction.
    const a = Array.from({ length: 80 }, () => random() + 0.2);
    const b = Array.from({ length: 120 }, () => random());
    const r = ss.wilcoxonRankSum(a, b);
    const n1 = a.length, n2 = b.length, N = n1 + n2;
    const sd = Math.sqrt((n1 * n2 * (N + 1)) / 12);
    const test = mannWhitneyFromRankSum(r, n1, n2, 0);
    expect(test.z).toBeCloseTo((r - (n1 * (N + 1)) / 2 - 0.5) / sd, 10);
    // Rank-biserial = 2U/(n1 n2) - 1 with U = R - n1(n1+1)/2 (Kerby 2014).
    expect(test.rankBiserial).toBeCloseTo((2 * (r - (n1 * (n1 + 1)) / 2)) / (n1 * n2) - 1, 12);
  });

  it('finds a biased site from one sorted stream with the README rule', () => {
    const site = Int32Array.from({ length: 4000 }, (_, i) => 1 + (i % 4));
    const values = Float64Array.from(site, (s) => (s === 3 ? 1.2 : 1) * (1 + 0.05 * random()));
    const column = sortColumn(values, 'A', site);
    const found = siteBiasOfStream('Ioff_n', column.sorted, column.site, { siteBiasMaxP: 1e-3, siteBiasMinShift: 0.05 });
    expect(found.map((b) => b.site)).toEqual([3]);
    const others = Array.from(values).filter((_, i) => site[i] !== 3);
    const own = Array.from(values).filter((_, i) => site[i] === 3);
    expect(relClose(found[0].shift, (ss.median(own) - ss.median(others)) / ss.median(others))).toBe(true);
  });
});

describe('correlation from group ranks', () => {
  it('matches simple-statistics Pearson, Spearman and least squares of |Ion| on log10|Ioff|', () => {
    const n = 3000;
    const logIoff = Float64Array.from({ length: n }, () => -11 + 0.1 * random());
    // Ties on purpose in Ion, to exercise the mid-ranks.
    const ion = Float64Array.from(logIoff, (v) => Math.round((7e-4 + 2e-4 * (v + 11) + 1e-5 * random()) * 1e6) / 1e6);
    const ioff = Float64Array.from(logIoff, (v) => 10 ** v);
    const site = new Int32Array(n);
    const rankIoff = new Float32Array(n);
    const rankIon = new Float32Array(n);
    const a = sortColumn(ioff, 'A', site);
    const b = sortColumn(ion, 'A', site);
    scatterMidranks(a.sorted, a.order, rankIoff);
    scatterMidranks(b.sorted, b.order, rankIon);
    const logs = Float64Array.from(ioff, Math.log10);
    const c = pairCorrelation('n', 'Ion_n', 'Ioff_n', [{ logIoff: logs, ion, rankIoff, rankIon, dies: null }])!;
    const xs = Array.from(logs);
    const ys = Array.from(ion);
    expect(c.pearson).toBeCloseTo(ss.sampleCorrelation(xs, ys), 10);
    expect(c.spearman).toBeCloseTo(ss.sampleRankCorrelation(xs, ys), 10);
    const line = ss.linearRegression(xs.map((x, i) => [x, ys[i]]));
    expect(relClose(c.slope, line.m, 1e-8)).toBe(true);
    expect(relClose(c.intercept, line.b, 1e-8)).toBe(true);
  });
});

describe('order statistics of sorted streams', () => {
  it('summarises like simple-statistics (type 7 quartiles, sample sd)', () => {
    const values = Array.from({ length: 1001 }, () => 5 + random());
    const s = sortedSummary(Float64Array.from(values).sort())!;
    expect(s.median).toBe(ss.median(values));
    expect(relClose(s.mean, ss.mean(values), 1e-13)).toBe(true);
    expect(relClose(s.sigma, ss.sampleStandardDeviation(values), 1e-12)).toBe(true);
    // simple-statistics' quantile is not type 7; the oracle is the type 7 definition itself.
    const sorted = [...values].sort((x, y) => x - y);
    const h = 1000 * 0.25;
    expect(s.q1).toBe(sorted[Math.floor(h)] + (h - Math.floor(h)) * (sorted[Math.floor(h) + 1] - sorted[Math.floor(h)]));
  });

  it('merges wafer streams into the lot order and picks k-th values of a union without merging', () => {
    const site = new Int32Array(500);
    const parts = [0, 1, 2].map(() => sortColumn(Float64Array.from({ length: 500 }, () => random()), '', site));
    const merged = mergeSorted(parts);
    const all = parts.flatMap((p) => Array.from(p.sorted)).sort((x, y) => x - y);
    expect(Array.from(merged.sorted)).toEqual(all);
    for (const k of [0, 1, 700, 749, 750, 1499]) expect(kthOfSorted(parts.map((p) => p.sorted), k)).toBe(all[k]);
    for (let k = 0; k < merged.sorted.length; k += 97) expect(parts[merged.wafer[k]].sorted[merged.position[k]]).toBe(merged.sorted[k]);
  });
});

describe('lot statistics from the wafers', () => {
  it('match simple-statistics on the pooled dies of the lot and of each site', async () => {
    const { analyzeLot } = await import('../../../src/core/analysis');
    const { generateLot } = await import('../../../src/core/generator');
    const lot = generateLot({ seed: 99, lot: 'POOL.1', waferCount: 4, layout: { dieWidthMm: 9, dieHeightMm: 9 } });
    const analysis = analyzeLot(lot.wafers);
    for (const name of ['Ioff_n', 'Vtsat_p']) {
      for (const site of [undefined, 1, 4]) {
        const values = lot.wafers.flatMap((w) => Array.from(w.values[name]).filter((_, i) => site === undefined || w.site[i] === site));
        const mags = name.startsWith('I') ? values.map(Math.abs) : values;
        const s = site === undefined ? analysis.lots[0].params[name] : analysis.lots[0].sites[String(site)][name];
        expect(s.n).toBe(mags.length);
        expect(s.median).toBe(ss.median(mags));
        expect(relClose(s.mean, ss.mean(mags), 1e-12)).toBe(true);
        expect(relClose(s.sigma, ss.sampleStandardDeviation(mags), 1e-9)).toBe(true);
        if (s.log10) {
          const logs = mags.map(Math.log10);
          expect(relClose(s.log10.mean, ss.mean(logs), 1e-12)).toBe(true);
          expect(relClose(s.log10.sigma, ss.sampleStandardDeviation(logs), 1e-9)).toBe(true);
        }
      }
    }
  });
});
