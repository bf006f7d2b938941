import { describe, expect, it } from 'vitest';
import { interquartileRange, median, sampleStandardDeviation } from 'simple-statistics';
import { CANONICAL_PARAMS } from '../../../src/core/params';
import { alphaPowerIon, dibl, ioffFromVt, tradeoffSlope } from '../../../src/core/physics';
import {
  DEFAULT_PROCESS,
  generateLot,
  iterateWafers,
  prepareLot,
  type GeneratedLot,
  type LotOptions,
} from '../../../src/core/generator';

const BASE: LotOptions = {
  seed: 1234,
  lot: 'TEST.1',
  waferCount: 6,
  layout: { dieWidthMm: 10, dieHeightMm: 10 },
};

const log10Abs = (values: Float64Array) => Array.from(values, (v) => Math.log10(Math.abs(v)));
const abs = (values: Float64Array) => Array.from(values, Math.abs);

/** Dies of a wafer planted by excursion k. */
function plantedDies(lot: GeneratedLot, excursion: number): number[] {
  return lot.truth.planted.filter((d) => d.excursion === excursion).map((d) => d.die);
}

describe('generateLot determinism', () => {
  it('gives identical numbers for the same seed', () => {
    const a = generateLot(BASE);
    const b = generateLot(BASE);
    for (let w = 0; w < BASE.waferCount; w++) {
      for (const param of CANONICAL_PARAMS) expect(a.wafers[w].values[param]).toEqual(b.wafers[w].values[param]);
    }
    expect(a.truth).toEqual(b.truth);
  });

  it('gives different numbers for a different seed', () => {
    const a = generateLot(BASE);
    const b = generateLot({ ...BASE, seed: 1235 });
    expect(a.wafers[0].values.Ioff_n).not.toEqual(b.wafers[0].values.Ioff_n);
    expect(a.wafers[0].x).toEqual(b.wafers[0].x); // same layout
  });

  it('makes the same wafers one at a time as all at once', () => {
    const all = generateLot(BASE);
    const lazy = [...iterateWafers(prepareLot(BASE))];
    expect(lazy.map((w) => w.wafer)).toEqual(all.wafers.map((w) => w.wafer));
    expect(lazy[4].values.Ion_p).toEqual(all.wafers[4].values.Ion_p);
  });

  it('leaves every unplanted die unchanged when an excursion is planted', () => {
    const base = generateLot(BASE);
    const planted = generateLot({
      ...BASE,
      excursions: [{ wafer: 2, mechanism: 'extra-leakage', shape: { kind: 'random', count: 5 }, magnitude: 2 }],
    });
    const hit = new Set(plantedDies(planted, 0));
    expect(hit.size).toBe(5);
    for (let w = 0; w < BASE.waferCount; w++) {
      for (const param of CANONICAL_PARAMS) {
        const a = base.wafers[w].values[param];
        const b = planted.wafers[w].values[param];
        for (let i = 0; i < a.length; i++) if (w !== 2 || !hit.has(i)) expect(b[i]).toBe(a[i]);
      }
    }
  });
});

describe('generated population', () => {
  const lot = generateLot({ ...BASE, waferCount: 12 });
  const n = DEFAULT_PROCESS.n;
  const p = DEFAULT_PROCESS.p;
  const vdd = DEFAULT_PROCESS.vdd;

  it('centres log10 Ioff on the constant-current form at the nominal Vt', () => {
    // DOMAIN.md: log10(Ioff) = log10(Icc W/L) - Vt_sat/S. Lot median over 12 wafers whose mean Vt
    // scatters by 3 mV: standard error about 1 mV = 0.012 decade; allow 0.03.
    const all = lot.wafers.flatMap((w) => log10Abs(w.values.Ioff_n));
    const expected = Math.log10(ioffFromVt({ vt: n.vtSat, swing: n.swing, icc: n.icc, wOverL: n.wOverL }));
    expect(Math.abs(median(all) - expected)).toBeLessThan(0.03);
    const allP = lot.wafers.flatMap((w) => log10Abs(w.values.Ioff_p));
    const expectedP = Math.log10(ioffFromVt({ vt: p.vtSat, swing: p.swing, icc: p.icc, wOverL: p.wOverL }));
    expect(Math.abs(median(allP) - expectedP)).toBeLessThan(0.03);
  });

  it('centres each wafer on the closed form at that wafer’s mean Vt', () => {
    // Same form per wafer, with the wafer's recorded Vt offset: only die noise is left (SE < 0.003 dec).
    lot.wafers.forEach((wafer, i) => {
      const vt = n.vtSat + lot.truth.waferEffects[i].vtOffsetN;
      const expected = Math.log10(ioffFromVt({ vt, swing: n.swing, icc: n.icc, wOverL: n.wOverL }));
      expect(Math.abs(median(log10Abs(wafer.values.Ioff_n)) - expected)).toBeLessThan(0.012);
      const ion = alphaPowerIon({ k: n.k, vgs: vdd, vt, alpha: n.alpha });
      expect(Math.abs(median(abs(wafer.values.Ion_n)) / ion - 1)).toBeLessThan(0.005);
    });
  });

  it('centres Ion on the alpha-power law at the nominal Vt', () => {
    // Sakurai & Newton 1990: Ion = K (Vdd - Vt)^alpha; 1.3 * 3 mV / 0.38 V = 1 % per wafer sigma,
    // so the 12-wafer median sits within about 0.3 %; allow 1 %.
    const ionN = alphaPowerIon({ k: n.k, vgs: vdd, vt: n.vtSat, alpha: n.alpha });
    const ionP = alphaPowerIon({ k: p.k, vgs: vdd, vt: p.vtSat, alpha: p.alpha });
    expect(Math.abs(median(lot.wafers.flatMap((w) => abs(w.values.Ion_n))) / ionN - 1)).toBeLessThan(0.01);
    expect(Math.abs(median(lot.wafers.flatMap((w) => abs(w.values.Ion_p))) / ionP - 1)).toBeLessThan(0.01);
  });

  it('uses the low-standby magnitudes of DOMAIN.md', () => {
    // DOMAIN.md (CACTI/ITRS-derived): low-standby 22 nm Ion about 730 uA/um, Ioff about 24 pA/um.
    const ion = median(lot.wafers.flatMap((w) => abs(w.values.Ion_n)));
    const ioff = 10 ** median(lot.wafers.flatMap((w) => log10Abs(w.values.Ioff_n)));
    expect(ion).toBeGreaterThan(650e-6);
    expect(ion).toBeLessThan(850e-6);
    expect(ioff).toBeGreaterThan(15e-12);
    expect(ioff).toBeLessThan(35e-12);
  });

  it('separates Vt_lin from Vt_sat by the nominal DIBL', () => {
    // DIBL = (Vt_lin - Vt_sat)/(Vd_sat - Vd_lin) (DOMAIN.md); nominal 90 mV/V NMOS, 80 mV/V PMOS.
    const dn = lot.wafers.flatMap((w) => Array.from(w.values.Vtlin_n, (vl, i) => dibl(vl, w.values.Vtsat_n[i], DEFAULT_PROCESS.vdLin, vdd)));
    const dp = lot.wafers.flatMap((w) =>
      Array.from(w.values.Vtlin_p, (vl, i) => dibl(Math.abs(vl), Math.abs(w.values.Vtsat_p[i]), DEFAULT_PROCESS.vdLin, vdd)));
    expect(median(dn)).toBeCloseTo(n.dibl, 3);
    expect(median(dp)).toBeCloseTo(p.dibl, 3);
    expect(sampleStandardDeviation(dn)).toBeCloseTo(n.diblSigma, 3);
  });

  it('spreads log10 Ioff within a wafer as the error propagation of its Vt and swing terms predicts', () => {
    // log10 Ioff = c - Vt/S (DOMAIN.md), so var = var(Vt)/S^2 + (Vt/S^2)^2 var(S) to first order;
    // var(Vt) = random^2 + bowl^2 var(r^2/R^2) + var(reticle offset) over the wafer's dies.
    const R2 = lot.layout.usableRadiusMm ** 2;
    const r2 = Array.from(lot.layout.centreXMm, (x, i) => (x * x + lot.layout.centreYMm[i] ** 2) / R2);
    const reticle = Array.from(lot.layout.shotRow, (row, i) => lot.truth.reticleOffsets[row * lot.layout.shotX + lot.layout.shotColumn[i]]);
    const varR2 = sampleStandardDeviation(r2) ** 2;
    const varReticle = sampleStandardDeviation(reticle) ** 2;
    lot.wafers.forEach((wafer, i) => {
      const bowl = lot.truth.waferEffects[i].bowl;
      const vt = n.vtSat + lot.truth.waferEffects[i].vtOffsetN;
      const varVt = n.vtRandomSigma ** 2 + bowl * bowl * varR2 + varReticle;
      const expected = Math.sqrt(varVt / n.swing ** 2 + (vt / n.swing ** 2) ** 2 * n.swingSigma ** 2);
      const values = log10Abs(wafer.values.Ioff_n);
      // Sample sd over ~620 dies: relative standard error 1/sqrt(2n) = 2.8 %; allow 10 %.
      expect(Math.abs(sampleStandardDeviation(values) / expected - 1)).toBeLessThan(0.1);
      // Robust sigma (IQR / 1.349, DOMAIN.md) of a near-normal sample agrees within 15 %.
      expect(Math.abs(interquartileRange(values) / 1.349 / expected - 1)).toBeLessThan(0.15);
    });
  });

  it('reports PMOS thresholds and currents as negative numbers, NMOS as positive', () => {
    // DOMAIN.md (common practice): testers report PMOS currents negative; Vt_p is negative too.
    for (const wafer of lot.wafers) {
      for (const param of ['Ioff_p', 'Ion_p', 'Ig_p', 'Vtlin_p', 'Vtsat_p'] as const) {
        expect(Math.max(...wafer.values[param])).toBeLessThan(0);
      }
      for (const param of ['Ioff_n', 'Ion_n', 'Ig_n', 'Vtlin_n', 'Vtsat_n', 'Isb'] as const) {
        expect(Math.min(...wafer.values[param])).toBeGreaterThan(0);
      }
    }
  });

  it('keeps gate leakage in the pA to nA range and standby current tied to Ioff', () => {
    const ig = lot.wafers.flatMap((w) => abs(w.values.Ig_n).concat(abs(w.values.Ig_p)));
    expect(Math.min(...ig)).toBeGreaterThan(1e-13);
    expect(Math.max(...ig)).toBeLessThan(1e-9);
    // Isb = devices * (|Ioff_n| + |Ioff_p|) * noise + background, per die (the generator's model).
    const w = lot.wafers[0];
    const predicted = Array.from(w.values.Isb, (_, i) =>
      DEFAULT_PROCESS.isbDevices * (w.values.Ioff_n[i] - w.values.Ioff_p[i]) + DEFAULT_PROCESS.isbBackground);
    const ratio = Array.from(w.values.Isb, (isb, i) => Math.log10(isb / predicted[i]));
    expect(Math.abs(median(ratio))).toBeLessThan(0.01);
    expect(sampleStandardDeviation(ratio)).toBeCloseTo(DEFAULT_PROCESS.isbLog10Sigma, 2);
  });
});

describe('planted threshold shift', () => {
  // The DOMAIN.md worked example device: alpha 1.3, S 85 mV/dec, Vdd 0.8 V, Vt 0.30 V.
  const options: LotOptions = { ...BASE, waferCount: 2, process: { n: { vtSat: 0.3, swing: 0.085, alpha: 1.3 }, vdd: 0.8 } };
  const base = generateLot(options);
  const shifted = generateLot({
    ...options,
    excursions: [{ wafer: 1, mechanism: 'threshold-shift', device: 'n', magnitude: -0.03, shape: { kind: 'center', radiusFraction: 0.5 } }],
  });
  const dies = plantedDies(shifted, 0);
  const ratio = (param: 'Ioff_n' | 'Ion_n') => dies.map((i) => shifted.wafers[1].values[param][i] / base.wafers[1].values[param][i]);

  it('raises Ioff and Ion together as in the worked example', () => {
    // DOMAIN.md worked example [derived]: dVt = -30 mV gives Ion x1.0787 and Ioff x2.254.
    expect(dies.length).toBeGreaterThan(100);
    expect(median(ratio('Ioff_n'))).toBeCloseTo(2.254, 2);
    expect(Math.abs(median(ratio('Ion_n')) - 1.0787)).toBeLessThan(0.003);
  });

  it('moves each die along the trade-off slope', () => {
    // tradeoffSlope = alpha S/(Vdd - Vt) (DOMAIN.md [derived]) at the step's mid Vt, with the die's
    // own swing read back from its Ioff step: S = |dVt| / log10(Ioff ratio).
    const ioff = ratio('Ioff_n');
    const ion = ratio('Ion_n');
    dies.forEach((die, k) => {
      const decades = Math.log10(ioff[k]);
      const swing = 0.03 / decades;
      const midVt = base.wafers[1].values.Vtsat_n[die] - 0.015;
      const slope = tradeoffSlope({ alpha: 1.3, swing, vdd: 0.8, vt: midVt });
      expect(Math.abs(Math.log(ion[k]) / decades / slope - 1)).toBeLessThan(0.01);
    });
  });

  it('moves both thresholds by dVt and leaves PMOS alone', () => {
    for (const i of dies) {
      expect(shifted.wafers[1].values.Vtsat_n[i] - base.wafers[1].values.Vtsat_n[i]).toBeCloseTo(-0.03, 12);
      expect(shifted.wafers[1].values.Vtlin_n[i] - base.wafers[1].values.Vtlin_n[i]).toBeCloseTo(-0.03, 12);
      expect(shifted.wafers[1].values.Ioff_p[i]).toBe(base.wafers[1].values.Ioff_p[i]);
    }
  });

  it('shifts PMOS |Vt| the same way, keeping the raw sign', () => {
    const pShift = generateLot({
      ...options,
      excursions: [{ wafer: 0, mechanism: 'threshold-shift', device: 'p', magnitude: -0.03, shape: { kind: 'site', site: 2 } }],
    });
    for (const i of plantedDies(pShift, 0)) {
      expect(pShift.wafers[0].values.Vtsat_p[i] - base.wafers[0].values.Vtsat_p[i]).toBeCloseTo(0.03, 12);
      expect(pShift.wafers[0].values.Ioff_p[i] / base.wafers[0].values.Ioff_p[i]).toBeGreaterThan(2);
      expect(pShift.wafers[0].values.Ion_p[i] / base.wafers[0].values.Ion_p[i]).toBeGreaterThan(1.05);
    }
  });
});

describe('planted extra leakage and weak drive', () => {
  const base = generateLot(BASE);

  it('multiplies Ioff by 10^decades and leaves Ion and Vt untouched', () => {
    const lot = generateLot({
      ...BASE,
      excursions: [{ wafer: 3, mechanism: 'extra-leakage', device: 'n', magnitude: 1.5, shape: { kind: 'edge-ring', innerFraction: 0.85 } }],
    });
    const dies = plantedDies(lot, 0);
    expect(dies.length).toBeGreaterThan(50);
    const [a, b] = [base.wafers[3].values, lot.wafers[3].values];
    for (const i of dies) {
      expect(b.Ioff_n[i] / a.Ioff_n[i]).toBeCloseTo(10 ** 1.5, 9);
      expect(b.Ion_n[i]).toBe(a.Ion_n[i]);
      expect(b.Vtsat_n[i]).toBe(a.Vtsat_n[i]);
      expect(b.Ig_n[i]).toBe(a.Ig_n[i]);
      expect(b.Isb[i]).toBe(a.Isb[i]);
      expect(b.Ioff_p[i]).toBe(a.Ioff_p[i]);
    }
  });

  it('raises Ig and Isb too when the excursion says so', () => {
    const lot = generateLot({
      ...BASE,
      excursions: [{ wafer: 0, mechanism: 'extra-leakage', device: 'n', magnitude: 2, alsoIg: true, alsoIsb: true, shape: { kind: 'random', count: 4 } }],
    });
    const [a, b] = [base.wafers[0].values, lot.wafers[0].values];
    for (const i of plantedDies(lot, 0)) {
      expect(b.Ig_n[i] / a.Ig_n[i]).toBeCloseTo(100, 6);
      expect(b.Isb[i] / a.Isb[i]).toBeGreaterThan(20);
      expect(b.Ion_n[i]).toBe(a.Ion_n[i]);
    }
  });

  it('lowers Ion by the lost fraction and leaves Ioff and Vt untouched', () => {
    const lot = generateLot({
      ...BASE,
      excursions: [{ wafer: 1, mechanism: 'weak-drive', device: 'both', magnitude: 0.35,
        shape: { kind: 'scratch', xMm: 0, yMm: 0, angleDeg: 30, lengthMm: 200, widthMm: 8 } }],
    });
    const dies = plantedDies(lot, 0);
    expect(dies.length).toBeGreaterThan(10);
    const [a, b] = [base.wafers[1].values, lot.wafers[1].values];
    for (const i of dies) {
      expect(b.Ion_n[i] / a.Ion_n[i]).toBeCloseTo(0.65, 12);
      expect(b.Ion_p[i] / a.Ion_p[i]).toBeCloseTo(0.65, 12);
      expect(b.Ioff_n[i]).toBe(a.Ioff_n[i]);
      expect(b.Vtsat_p[i]).toBe(a.Vtsat_p[i]);
    }
  });

  it('spreads the magnitude die to die when asked, and records each die’s own value', () => {
    const lot = generateLot({
      ...BASE,
      excursions: [{ wafer: 2, mechanism: 'extra-leakage', device: 'n', magnitude: 1, spread: 0.2, shape: { kind: 'center', radiusFraction: 0.4 } }],
    });
    const records = lot.truth.planted;
    const magnitudes = records.map((d) => d.magnitude);
    expect(new Set(magnitudes).size).toBe(records.length);
    for (const d of records) {
      expect(Math.log10(lot.wafers[2].values.Ioff_n[d.die] / base.wafers[2].values.Ioff_n[d.die])).toBeCloseTo(d.magnitude, 9);
    }
    // ln of the factor is normal with sigma 0.2, so the median magnitude stays near 1.
    expect(Math.abs(median(magnitudes) - 1)).toBeLessThan(0.08);
  });

  it('describes each planted die with its position, site and mechanism', () => {
    const lot = generateLot({
      ...BASE,
      excursions: [{ wafer: 5, mechanism: 'extra-leakage', device: 'p', magnitude: 1.2, shape: { kind: 'loc', xMm: 40, yMm: 40, radiusMm: 30 } }],
    });
    const record = lot.truth.excursions[0];
    expect(record.waferName).toBe('06');
    expect(record.dieCount).toBe(lot.truth.planted.length);
    expect(record.description).toMatch(/loc extra-leakage on PMOS/);
    for (const d of lot.truth.planted) {
      const wafer = lot.wafers[5];
      expect([d.lot, d.wafer, d.x, d.y, d.site]).toEqual([lot.lot, '06', wafer.x[d.die], wafer.y[d.die], wafer.site[d.die]]);
      expect([d.mechanism, d.shape, d.device]).toEqual(['extra-leakage', 'loc', 'p']);
      expect(Math.hypot(lot.layout.centreXMm[d.die] - 40, lot.layout.centreYMm[d.die] - 40)).toBeLessThanOrEqual(30);
    }
  });

  it('refuses excursions on wafers outside the lot and impossible drive losses', () => {
    expect(() => generateLot({ ...BASE, excursions: [{ wafer: 6, mechanism: 'weak-drive', magnitude: 0.3, shape: { kind: 'random', count: 1 } }] }))
      .toThrow(/outside the lot/);
    expect(() => generateLot({ ...BASE, excursions: [{ wafer: 0, mechanism: 'weak-drive', magnitude: 1.2, shape: { kind: 'random', count: 1 } }] }))
      .toThrow(/fraction/);
    expect(() => generateLot({ ...BASE, siteBias: [{ site: 1, param: 'Ion_n', factor: 1.1, wafers: [9] }] })).toThrow(/outside the lot/);
  });
});

describe('probe-site tester bias', () => {
  const base = generateLot(BASE);
  const biased = generateLot({ ...BASE, siteBias: [{ site: 3, param: 'Ioff_n', factor: 1.25, wafers: [0, 1, 2, 3] }] });

  it('multiplies the chosen parameter on the chosen site and wafers only', () => {
    for (let w = 0; w < BASE.waferCount; w++) {
      const [a, b] = [base.wafers[w].values, biased.wafers[w].values];
      base.wafers[w].site.forEach((site, i) => {
        const expected = site === 3 && w < 4 ? a.Ioff_n[i] * 1.25 : a.Ioff_n[i];
        expect(b.Ioff_n[i]).toBe(expected);
        expect(b.Isb[i]).toBe(a.Isb[i]); // a measurement offset does not change the physics
        expect(b.Ion_n[i]).toBe(a.Ion_n[i]);
      });
    }
  });

  it('shows as a site median about 25 % above the other sites', () => {
    // Common practice (DOMAIN.md): compare the site's median with the other sites'.
    const w = biased.wafers[0];
    const site3 = Array.from(w.values.Ioff_n).filter((_, i) => w.site[i] === 3);
    const others = Array.from(w.values.Ioff_n).filter((_, i) => w.site[i] !== 3);
    expect(median(site3) / median(others)).toBeGreaterThan(1.15);
    expect(median(site3) / median(others)).toBeLessThan(1.35);
  });

  it('is recorded in the truth with the wafer names', () => {
    expect(biased.truth.siteBias).toEqual([{ site: 3, param: 'Ioff_n', factor: 1.25, wafers: ['01', '02', '03', '04'] }]);
  });
});
