import { describe, expect, it } from 'vitest';
import {
  BOLTZMANN,
  ELEMENTARY_CHARGE,
  alphaPowerIon,
  celsiusToKelvin,
  dibl,
  idealSwing,
  ioffFromVt,
  thermalVoltage,
  tradeoffSlope,
  vtFromIoff,
} from '../../src/core/physics';

const MILLI = 1e-3;

describe('physical constants', () => {
  it('are the exact SI values', () => {
    // SI Brochure, 9th ed. (BIPM 2019), table 1: k and e are fixed exactly.
    expect(BOLTZMANN).toBe(1.380649e-23);
    expect(ELEMENTARY_CHARGE).toBe(1.602176634e-19);
  });
});

describe('thermalVoltage', () => {
  it('gives kT/q at the usual test temperatures', () => {
    // DOMAIN.md check values, derived from the exact SI constants (SI Brochure, 9th ed., 2019).
    expect(thermalVoltage(300) / MILLI).toBeCloseTo(25.852, 3);
    expect(thermalVoltage(celsiusToKelvin(25)) / MILLI).toBeCloseTo(25.693, 3);
    expect(thermalVoltage(celsiusToKelvin(85)) / MILLI).toBeCloseTo(30.863, 3);
    expect(thermalVoltage(celsiusToKelvin(125)) / MILLI).toBeCloseTo(34.310, 3);
  });

  it('refuses a non-positive absolute temperature', () => {
    expect(() => thermalVoltage(0)).toThrow(/positive/);
  });
});

describe('celsiusToKelvin', () => {
  it('adds 273.15', () => {
    // SI Brochure, 9th ed., 2019, section 2.3.1: t/°C = T/K - 273.15.
    expect(celsiusToKelvin(0)).toBe(273.15);
    expect(celsiusToKelvin(-273.15)).toBe(0);
  });
});

describe('idealSwing', () => {
  it('is 59.53 mV/decade at 300 K for n = 1', () => {
    // DOMAIN.md: S = n kT/q ln10 (Weste & Harris), [derived] 59.53 mV/dec at 300 K.
    expect(idealSwing(300) / MILLI).toBeCloseTo(59.53, 2);
  });

  it('scales linearly with the slope factor n', () => {
    // S = n (kT/q) ln10 (Weste & Harris): n = 1.4 gives 1.4 x 59.53 mV/dec (DOMAIN.md) at 300 K.
    expect(idealSwing(300, 1.4) / MILLI).toBeCloseTo(1.4 * 59.53, 1);
  });
});

describe('ioffFromVt and vtFromIoff', () => {
  const convention = { swing: 75 * MILLI, icc: 100e-9, wOverL: 1 / 0.05 };

  it('reproduces the constant-current check values', () => {
    // DOMAIN.md [derived] check: Icc 100 nA, W/L 1/0.05, S 75 mV/dec.
    expect(ioffFromVt({ ...convention, vt: 0.30 })).toBeCloseTo(2.000e-10, 13);
    expect(ioffFromVt({ ...convention, vt: 0.35 })).toBeCloseTo(4.309e-11, 14);
  });

  it('are inverses of each other', () => {
    // log10(Ioff) = log10(Icc W/L) - Vt/S (DOMAIN.md) read both ways.
    const ioff = ioffFromVt({ ...convention, vt: 0.4123 });
    expect(vtFromIoff({ ...convention, ioff })).toBeCloseTo(0.4123, 12);
    expect(vtFromIoff({ ...convention, ioff: 2.0e-10 })).toBeCloseTo(0.30, 12);
  });

  it('moves Ioff one decade per swing of Vt', () => {
    // Definition of the swing S (Weste & Harris): one decade of current per S of gate voltage.
    const a = ioffFromVt({ ...convention, vt: 0.3 });
    const b = ioffFromVt({ ...convention, vt: 0.3 + convention.swing });
    expect(a / b).toBeCloseTo(10, 10);
  });

  it('refuses a non-positive current', () => {
    expect(() => vtFromIoff({ ...convention, ioff: 0 })).toThrow(/positive/);
  });
});

describe('dibl', () => {
  it('gives 200 mV/V for 0.40 V at 0.1 V and 0.22 V at 1.0 V', () => {
    // DOMAIN.md worked check [derived] from DIBL = (Vt_lin - Vt_sat)/(Vd_sat - Vd_lin).
    expect(dibl(0.40, 0.22, 0.1, 1.0) * 1000).toBeCloseTo(200, 9);
  });

  it('refuses equal drain biases', () => {
    expect(() => dibl(0.4, 0.3, 0.5, 0.5)).toThrow(/different/);
  });
});

describe('alphaPowerIon', () => {
  it('follows K (Vgs - Vt)^alpha above threshold', () => {
    // Sakurai & Newton, IEEE JSSC 25(2), 1990: Id_sat = K (Vgs - Vt)^alpha.
    expect(alphaPowerIon({ k: 2e-3, vgs: 0.8, vt: 0.3, alpha: 1.3 })).toBeCloseTo(2e-3 * 0.5 ** 1.3, 15);
    // alpha = 2 is the long-channel square law (Sakurai & Newton 1990, the alpha -> 2 limit).
    expect(alphaPowerIon({ k: 1e-3, vgs: 1.0, vt: 0.4, alpha: 2 })).toBeCloseTo(1e-3 * 0.36, 15);
  });

  it('is zero at and below threshold', () => {
    // Sakurai & Newton 1990: the law covers Vgs > Vt only; the cut-off region carries no drive.
    expect(alphaPowerIon({ k: 2e-3, vgs: 0.3, vt: 0.3, alpha: 1.3 })).toBe(0);
    expect(alphaPowerIon({ k: 2e-3, vgs: 0.2, vt: 0.3, alpha: 1.3 })).toBe(0);
  });
});

describe('tradeoffSlope', () => {
  const device = { alpha: 1.3, swing: 85 * MILLI, vdd: 0.8, vt: 0.30 };

  it('gives +24.7 % Ion per decade of Ioff in the worked example', () => {
    // DOMAIN.md worked example [derived]: alpha 1.3, S 85 mV/dec, Vdd 0.8 V, Vt 0.30 V.
    expect(Math.exp(tradeoffSlope(device)) - 1).toBeCloseTo(0.247, 3);
  });

  it('matches the finite Vt step of the worked example', () => {
    // DOMAIN.md worked example [derived]: dVt = -30 mV gives Ion x1.0787 and Ioff x2.254.
    const k = 1e-3;
    const icc = { swing: device.swing, icc: 100e-9, wOverL: 20 };
    const ionRatio =
      alphaPowerIon({ k, vgs: device.vdd, vt: 0.27, alpha: device.alpha }) /
      alphaPowerIon({ k, vgs: device.vdd, vt: 0.30, alpha: device.alpha });
    const ioffRatio = ioffFromVt({ ...icc, vt: 0.27 }) / ioffFromVt({ ...icc, vt: 0.30 });
    expect(ionRatio).toBeCloseTo(1.0787, 4);
    expect(ioffRatio).toBeCloseTo(2.254, 3);
  });

  it('is the limit of small Vt steps of the two laws', () => {
    // Derivative check: central difference of ln(Ion) against log10(Ioff) (DOMAIN.md derivation).
    const h = 1e-5;
    const k = 1e-3;
    const icc = { swing: device.swing, icc: 100e-9, wOverL: 20 };
    const lnIon = (vt: number) => Math.log(alphaPowerIon({ k, vgs: device.vdd, vt, alpha: device.alpha }));
    const logIoff = (vt: number) => Math.log10(ioffFromVt({ ...icc, vt }));
    const numeric = (lnIon(0.3 + h) - lnIon(0.3 - h)) / (logIoff(0.3 + h) - logIoff(0.3 - h));
    expect(tradeoffSlope(device)).toBeCloseTo(numeric, 8);
  });

  it('refuses Vt at or above Vdd', () => {
    expect(() => tradeoffSlope({ ...device, vt: 0.8 })).toThrow(/Vdd/);
  });
});
