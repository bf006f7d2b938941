// Mechanism triage against the device physics of DOMAIN.md: a die moved only in Vt follows the
// alpha-power law (Sakurai & Newton, IEEE JSSC 25(2), 1990) and the constant-current subthreshold
// form; an extra leakage path raises only Ioff; series resistance lowers only Ion. The displaced
// dies below are computed here from those formulas, with DOMAIN.md's worked values.
import { describe, expect, it } from 'vitest';
import { classifyDie, diblMvPerV, impliedSwing } from '../../../src/core/analysis';
import { DEFAULT_MECHANISM_SETTINGS, type TradeoffBand } from '../../../src/core/analysis/types';
import type { DeviceColumns } from '../../../src/core/analysis/mechanism';

const settings = { ...DEFAULT_MECHANISM_SETTINGS, vdLin: 0.05, vdSat: 0.8 };

describe('DOMAIN.md check values', () => {
  it('gives DIBL 200 mV/V for Vt 0.40 V at 0.1 V and 0.22 V at 1.0 V', () => {
    expect(diblMvPerV(0.4, 0.22, { ...settings, vdLin: 0.1, vdSat: 1.0 })).toBeCloseTo(200, 10);
  });

  it('implies a 75 mV/decade swing from Vt 0.30 V and Ioff 2.000e-10 A, and from Vt 0.35 V and 4.309e-11 A (Icc 100 nA, W/L 20)', () => {
    expect(impliedSwing(0.3, 2.0e-10, 100e-9, { ...settings, wOverL: 20 })).toBeCloseTo(75, 9);
    expect(impliedSwing(0.35, 4.309e-11, 100e-9, { ...settings, wOverL: 20 })).toBeCloseTo(75, 2);
  });
});

describe('classifyDie', () => {
  // Population: Vt 0.30 V, S 85 mV/dec, alpha 1.3, Vdd 0.8 V (DOMAIN.md's trade-off example).
  // d ln Ion / dVt = -alpha/(Vdd - Vt) = -2.6 /V; d log10 Ioff / dVt = -1/S = -11.765 dec/V;
  // band slope (Vdd - Vt)/(alpha S) = 4.525 decades per unit ln Ion (+24.7 % Ion per decade).
  const S = 0.085, ALPHA = 1.3, VDD = 0.8, VT = 0.3, ION = 1e-3, IOFF = 1e-10;
  const band: TradeoffBand = {
    device: 'n', ion: 'Ion_n', ioff: 'Ioff_n', n: 1000,
    centreLnIon: Math.log(ION), centreLog10Ioff: Math.log10(IOFF), slope: (VDD - VT) / (ALPHA * S), slopeSource: 'vt',
    sigmaLnIon: 0.02, sigmaLog10Ioff: 0.05, sigmaVt: 0.004, centreVt: VT, ionPerVt: -ALPHA / (VDD - VT), ioffPerVt: -1 / S,
  };
  // Dies: [Ion, Ioff, Vt_sat].
  const dies: [number, number, number][] = [
    // dVt = -30 mV: Ion x ((0.53/0.50)^1.3 = 1.0787), Ioff x 10^(0.03/0.085) = 2.254 (DOMAIN.md).
    [ION * (0.53 / 0.5) ** ALPHA, IOFF * 10 ** (0.03 / S), VT - 0.03],
    // dVt = +40 mV: both down.
    [ION * (0.46 / 0.5) ** ALPHA, IOFF * 10 ** (-0.04 / S), VT + 0.04],
    // An extra leakage path: Ioff x 30, nothing else.
    [ION, IOFF * 30, VT],
    // Series resistance: Ion x 0.7, nothing else.
    [ION * 0.7, IOFF, VT],
    // Ioff one decade low with Ion and Vt unchanged: no mechanism points that way.
    [ION, IOFF / 10, VT],
    // Inside the population.
    [ION * 1.01, IOFF * 1.05, VT],
    // Ion missing.
    [NaN, IOFF * 30, VT],
  ];
  const cols = (withVt: boolean): DeviceColumns => ({
    device: 'n', ion: 'Ion_n', ioff: 'Ioff_n',
    ionValues: Float64Array.from(dies, (d) => d[0]), ioffValues: Float64Array.from(dies, (d) => d[1]),
    ...(withVt ? { vtSat: Float64Array.from(dies, (d) => d[2]) } : {}),
  });

  for (const withVt of [true, false]) {
    it(`names threshold-shift, extra-leakage and weak-drive from Ion and Ioff${withVt ? ' and Vt_sat' : ' alone'}`, () => {
      const devices = [{ cols: cols(withVt), band }];
      const kinds = dies.map((_, i) => classifyDie(i, devices, settings, null).kind);
      expect(kinds).toEqual(['threshold-shift', 'threshold-shift', 'extra-leakage', 'weak-drive', 'unclassified', 'unclassified', 'unclassified']);
      const call = classifyDie(0, devices, settings, 25);
      expect(call.confidence).toBeGreaterThan(0.99);
      expect(call.temperatureC).toBe(25);
      // On the band: the residual is small next to the 0.353 decade the die moved.
      expect(Math.abs(call.residualDecades!)).toBeLessThan(0.05);
      expect(call.ioffDecades).toBeCloseTo(0.03 / S, 10);
      expect(classifyDie(2, devices, settings, null).residualDecades).toBeCloseTo(Math.log10(30), 10);
    });
  }

  it('says why a die is left unclassified', () => {
    const devices = [{ cols: cols(true), band }];
    expect(classifyDie(4, devices, settings, null).why).toMatch(/no single mechanism fits/);
    expect(classifyDie(5, devices, settings, null).why).toMatch(/within 4 robust sigmas/);
    expect(classifyDie(6, devices, settings, null).why).toMatch(/missing/);
    expect(classifyDie(0, [], settings, null).why).toMatch(/no Ion\/Ioff pair/);
  });
});
