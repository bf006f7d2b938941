// `analyze --json` on the demo lot: each wafer's spatial pattern against the generator's planted
// truth (sample-data/demo-lot.truth.json, written by the seeded generator, not by the analysis),
// and the FA export's mechanism and cluster columns against the same JSON.
import { beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { DEMO_CSV, ROOT } from '../support/paths';

const TRUTH = join(ROOT, 'sample-data', 'demo-lot.truth.json');
let report: { wafers: any[]; flagged: any[] };
let truth: { excursions: { waferName: string; shape: { kind: string } }[]; planted: { wafer: string; x: number; y: number }[] };

beforeAll(() => {
  report = JSON.parse(execFileSync(process.execPath, [join(ROOT, 'bin', 'offstate.mjs'), 'analyze', DEMO_CSV, '--json'], { encoding: 'utf8', maxBuffer: 256 << 20 }));
  truth = JSON.parse(readFileSync(TRUTH, 'utf8'));
}, 120_000);

describe.skipIf(!existsSync(TRUTH))('spatial pattern in analyze --json', () => {
  it('labels each wafer with the shape planted on it, and wafers with isolated defects or nothing as none', () => {
    const planted = new Map<string, string>();
    for (const e of truth.excursions) if (e.shape.kind !== 'random') planted.set(e.waferName, e.shape.kind);
    expect(planted.size).toBe(4);
    for (const w of report.wafers) {
      expect(w.pattern, `wafer ${w.wafer}`).toBeDefined();
      expect(w.pattern.confidence).toBeGreaterThan(0);
      expect(w.pattern.confidence).toBeLessThanOrEqual(1);
      expect(w.pattern.label, `wafer ${w.wafer}: ${w.pattern.rule}`).toBe(planted.get(w.wafer) ?? 'none');
    }
  });
  it('puts the planted dies of clustered shapes into clusters, and a scratch into a line', () => {
    const clustered = new Set(truth.excursions.filter((e) => e.shape.kind !== 'random').map((e) => e.waferName));
    const plantedDies = truth.planted.filter((d) => clustered.has(d.wafer));
    const flaggedAt = new Map(report.flagged.map((f) => [`${f.wafer}|${f.x}|${f.y}`, f]));
    const inCluster = plantedDies.filter((d) => flaggedAt.get(`${d.wafer}|${d.x}|${d.y}`)?.cluster).length;
    expect(inCluster / plantedDies.length).toBeGreaterThan(0.95);
    const scratchWafer = truth.excursions.find((e) => e.shape.kind === 'scratch')!.waferName;
    const scratch = report.wafers.find((w) => w.wafer === scratchWafer);
    expect(scratch.pattern.clusters.some((c: any) => c.line)).toBe(true);
  });
});
