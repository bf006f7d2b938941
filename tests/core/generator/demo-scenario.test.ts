import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { median, quantile } from 'simple-statistics';
import { DEMO_LOT_OPTIONS, generateLot, grossDiesApproximation, lotToCsv } from '../../../src/core/generator';

const demo = generateLot(DEMO_LOT_OPTIONS);

/**
 * Robust z as AEC-Q001 Rev-D writes it: (value - Q2) / ((Q3 - Q1) / 1.35), quartiles by linear
 * interpolation (Hyndman & Fan type 7, simple-statistics' quantile).
 */
function robustZ(values: number[]): number[] {
  const [q1, q2, q3] = quantile(values, [0.25, 0.5, 0.75]);
  const sigma = (q3 - q1) / 1.35;
  return values.map((v) => (v - q2) / sigma);
}

const log10Abs = (values: Float64Array) => Array.from(values, (v) => Math.log10(Math.abs(v)));
const abs = (values: Float64Array) => Array.from(values, Math.abs);

describe('demo lot scenario', () => {
  it('has 25 wafers "01".."25" of about 1,500 dies in lot KX2417.1', () => {
    // Classic gross-die approximation (DOMAIN.md) on the 294 mm usable diameter (SEMI T7 3 mm exclusion).
    expect(demo.lot).toBe('KX2417.1');
    expect(demo.wafers.map((w) => w.wafer)).toEqual(Array.from({ length: 25 }, (_, i) => String(i + 1).padStart(2, '0')));
    const expected = grossDiesApproximation(294, 6.5 * 6.5);
    expect(Math.abs(demo.layout.x.length - expected) / expected).toBeLessThan(0.03);
    expect(new Set(demo.wafers[0].site)).toEqual(new Set([1, 2, 3, 4]));
  });

  it('plants every excursion strongly enough to pass 6 robust sigma on its wafer', () => {
    // AEC-Q001 Rev-D: dynamic PAT limits at robust mean +/- 6 robust sigma; DOMAIN.md: do leakage
    // statistics on log10|I|. Drive loss is judged on |Ion| itself.
    for (const [k, excursion] of demo.truth.excursions.entries()) {
      const wafer = demo.wafers[excursion.wafer];
      const devices = excursion.device === 'both' ? (['n', 'p'] as const) : ([excursion.device] as const);
      for (const device of devices) {
        const weak = excursion.mechanism === 'weak-drive';
        const z = robustZ(weak ? abs(wafer.values[`Ion_${device}`]) : log10Abs(wafer.values[`Ioff_${device}`]));
        for (const die of demo.truth.planted.filter((d) => d.excursion === k)) {
          if (weak) expect(z[die.die]).toBeLessThan(-6);
          else expect(z[die.die]).toBeGreaterThan(6);
        }
      }
    }
  });

  it('keeps every unplanted die within 6 robust sigma', () => {
    // Normal die-to-die noise: P(|z| > 6) is about 2e-9 per die (normal tail), so no false alarms
    // are expected among 37,725 dies when the planted ones are left out.
    const planted = new Set(demo.truth.planted.map((d) => `${d.waferIndex}:${d.die}`));
    for (const wafer of demo.wafers) {
      for (const values of [
        log10Abs(wafer.values.Ioff_n), log10Abs(wafer.values.Ioff_p), abs(wafer.values.Ion_n), abs(wafer.values.Ion_p),
      ]) {
        const worst = Math.max(...robustZ(values).map((z, i) => (planted.has(`${wafer.index}:${i}`) ? 0 : Math.abs(z))));
        expect(worst).toBeLessThan(6);
      }
    }
  });

  it('keeps the within-wafer log10 sigma of Ioff_n between 0.05 and 0.1 decade', () => {
    // Demo specification (sample-data/README.md): a well-behaved process scatter, so planted
    // excursions of one decade or more stand out. Robust sigma = IQR / 1.35 (AEC-Q001), over the
    // dies nothing was planted on.
    const planted = new Set(demo.truth.planted.map((d) => `${d.waferIndex}:${d.die}`));
    for (const wafer of demo.wafers) {
      const clean = log10Abs(wafer.values.Ioff_n).filter((_, i) => !planted.has(`${wafer.index}:${i}`));
      const [q1, q3] = quantile(clean, [0.25, 0.75]);
      const sigma = (q3 - q1) / 1.35;
      expect(sigma).toBeGreaterThan(0.05);
      expect(sigma).toBeLessThan(0.1);
    }
  });

  it('reads Ioff_n about 25 % high on probe site 3 on wafers 01-21 and not after', () => {
    // DOMAIN.md: the same site off on many wafers means test hardware; compare site medians.
    for (const wafer of demo.wafers) {
      const site3 = Array.from(wafer.values.Ioff_n).filter((_, i) => wafer.site[i] === 3);
      const others = Array.from(wafer.values.Ioff_n).filter((_, i) => wafer.site[i] !== 3);
      const ratio = median(site3) / median(others);
      if (wafer.index < 21) {
        expect(ratio).toBeGreaterThan(1.15);
        expect(ratio).toBeLessThan(1.35);
      } else {
        expect(Math.abs(ratio - 1)).toBeLessThan(0.07);
      }
    }
    expect(demo.truth.siteBias[0].wafers).toHaveLength(21);
  });

  it('keeps Ion on the threshold-shifted centre dies up with their Ioff (trade-off, not a new path)', () => {
    // DOMAIN.md: lower Vt raises Ioff and Ion together; an extra leakage path raises Ioff alone.
    const centre = demo.truth.planted.filter((d) => d.mechanism === 'threshold-shift');
    const w07 = demo.wafers[6];
    const zIon = robustZ(abs(w07.values.Ion_n));
    expect(median(centre.map((d) => zIon[d.die]))).toBeGreaterThan(6);
    const ring = demo.truth.planted.filter((d) => d.shape === 'edge-ring');
    const zRingIon = robustZ(abs(demo.wafers[11].values.Ion_n));
    expect(Math.max(...ring.map((d) => Math.abs(zRingIon[d.die])))).toBeLessThan(6);
  });
});

// Sync check, not an oracle: the committed file must be what the generator makes today.
const SAMPLE_DIR = join(process.cwd(), 'sample-data');
const committed = existsSync(join(SAMPLE_DIR, 'demo-lot.csv'));
if (!committed) console.warn('sample-data/demo-lot.csv is absent: skipping the committed-file checks (run npm run demo-data).');

describe.skipIf(!committed)('committed demo files', () => {
  it('hold exactly what DEMO_LOT_OPTIONS generates', () => {
    expect(readFileSync(join(SAMPLE_DIR, 'demo-lot.csv'), 'utf8') === lotToCsv(demo)).toBe(true);
  });

  it('list the planted dies of the truth with lot, wafer, position, site, mechanism and shape', () => {
    const truth = JSON.parse(readFileSync(join(SAMPLE_DIR, 'demo-lot.truth.json'), 'utf8'));
    expect(truth.planted).toHaveLength(demo.truth.planted.length);
    truth.planted.forEach((die: Record<string, unknown>, i: number) => {
      const d = demo.truth.planted[i];
      expect(die).toMatchObject({ lot: d.lot, wafer: d.wafer, x: d.x, y: d.y, site: d.site, mechanism: d.mechanism, shape: d.shape });
    });
  });
});
