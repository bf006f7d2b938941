// The analysis can be split by parameter (one group per worker thread) and joined again. What the
// split must keep is exactness: the joined result is the one-pass result, key order and all, so
// the threaded path can never report something the single-threaded path would not. The oracle
// here is the one-pass analysis itself (an invariance check, not a reference value); the engine's
// values are checked against outside sources in the other analysis and reference tests.
import { describe, expect, it } from 'vitest';
import {
  AnalysisScratch, analyzeLot, analyzeLotFromGroups, analyzeParamGroup, analysisOrder, planParamGroups, type ParamGroupResult,
} from '../../../src/core/analysis';
import { withParams, type WaferFrame } from '../../../src/core/frame';
import { generateLot } from '../../../src/core/generator';

const lot = generateLot({
  seed: 90210, lot: 'SPLIT.3', waferCount: 4,
  layout: { waferDiameterMm: 300, edgeExclusionMm: 3, dieWidthMm: 5, dieHeightMm: 5, sitesX: 2, sitesY: 2, shotX: 4, shotY: 4 },
  excursions: [
    { wafer: 1, mechanism: 'extra-leakage', device: 'n', magnitude: 1.2, spread: 0.1, shape: { kind: 'center', radiusFraction: 0.3 } },
    { wafer: 2, mechanism: 'weak-drive', device: 'p', magnitude: 0.3, spread: 0.1, shape: { kind: 'edge-ring', innerFraction: 0.9 } },
  ],
  siteBias: [{ site: 2, param: 'Ioff_n', factor: 1.3 }],
});

/** The frames with only the named parameters (what a worker loads for its group). */
function only(frames: WaferFrame[], names: string[]): WaferFrame[] {
  return frames.map((f) => withParams(f, names));
}

/** As a worker would: each group from frames holding only its parameters, posted (cloned) back. */
function groupsOf(frames: WaferFrame[], parts: number, options: Parameters<typeof analyzeParamGroup>[2] = {}): ParamGroupResult[] {
  return planParamGroups(frames, parts).map((names) => structuredClone(analyzeParamGroup(only(frames, names), names, options)));
}

describe('splitting the analysis by parameter', () => {
  const names = analysisOrder(lot.wafers).map((p) => p.name);

  it('plans contiguous groups of the analysis order that never separate an Ion-Ioff pair', () => {
    expect(names.slice(0, 4)).toEqual(['Ioff_n', 'Ion_n', 'Ioff_p', 'Ion_p']);
    for (let parts = 1; parts <= names.length + 2; parts++) {
      const groups = planParamGroups(lot.wafers, parts);
      expect(groups.flat()).toEqual(names);
      expect(groups.length).toBe(Math.min(parts, names.length - 2));
      for (const g of groups) {
        expect(g.length).toBeGreaterThan(0);
        for (const device of ['n', 'p']) expect(g.includes(`Ioff_${device}`)).toBe(g.includes(`Ion_${device}`));
      }
    }
    const four = only(lot.wafers, ['Ioff_n', 'Ion_n', 'Ioff_p', 'Ion_p']);
    expect(planParamGroups(four, 2)).toEqual([['Ioff_n', 'Ion_n'], ['Ioff_p', 'Ion_p']]);
  });

  it('joins any split into exactly the one-pass analysis', () => {
    const whole = analyzeLot(lot.wafers);
    expect(whole.flagged.length).toBeGreaterThan(50);
    for (const parts of [1, 2, 3, 5]) {
      const joined = analyzeLotFromGroups(lot.wafers, groupsOf(lot.wafers, parts));
      expect(JSON.stringify(joined)).toBe(JSON.stringify(whole));
    }
  });

  it('joins the groups in analysis order whatever order they arrive in, with history and other settings', () => {
    const settings = { nnrParams: 'all' as const, nnrRadius: 2 };
    const history = { lots: 2, references: { Ioff_n: { centre: -11.2, robustSigma: 0.08, lots: 2, n: 4000 }, Vtlin_p: { centre: -0.42, robustSigma: 0.01, lots: 2, n: 4000 } } };
    const whole = analyzeLot(lot.wafers, { settings, history });
    const groups = groupsOf(lot.wafers, 3, { settings, history }).reverse();
    const joined = analyzeLotFromGroups(lot.wafers, groups, { settings, history });
    expect(JSON.stringify(joined)).toBe(JSON.stringify(whole));
    expect(joined.flagged.some((d) => d.reasons.some((r) => r.method === 'pat-static'))).toBe(true);
  });

  it('refuses to join groups that leave a parameter out', () => {
    const groups = groupsOf(lot.wafers, 2);
    expect(() => analyzeLotFromGroups(lot.wafers, groups.slice(1))).toThrow(/missing parameters? Ioff_n/);
  });

  it('gives the same analysis with scratch memory kept from an earlier, larger or smaller lot', () => {
    // Memory kept between analyses must never leak values from one lot into the next.
    const other = generateLot({
      seed: 31337, lot: 'KEPT.9', waferCount: 6,
      layout: { waferDiameterMm: 300, edgeExclusionMm: 3, dieWidthMm: 4, dieHeightMm: 4, sitesX: 3, sitesY: 2, shotX: 5, shotY: 4 },
      excursions: [{ wafer: 3, mechanism: 'threshold-shift', device: 'both', magnitude: -0.07, spread: 0.1, shape: { kind: 'center', radiusFraction: 0.3 } }],
    }).wafers;
    const fresh = [JSON.stringify(analyzeLot(lot.wafers)), JSON.stringify(analyzeLot(other))];
    const scratch = new AnalysisScratch();
    for (const [frames, expected] of [[lot.wafers, fresh[0]], [other, fresh[1]], [lot.wafers, fresh[0]], [only(other, ['Ioff_n', 'Ion_n']), JSON.stringify(analyzeLot(only(other, ['Ioff_n', 'Ion_n'])))]] as const) {
      expect(JSON.stringify(analyzeLot(frames, { scratch }))).toBe(expected);
    }
  });
});
