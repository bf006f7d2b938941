// AEC-Q001 Rev-D ("Guidelines for Part Average Testing", Automotive Electronics Council, 2011):
// robust mean = median (Q2), robust sigma = (Q3 - Q1)/1.35, PAT limits = robust mean +/- 6 robust
// sigma; dynamic limits from the passing parts, static limits from earlier lots, and PAT limits
// never beyond the specification limits. The standard fixes no quartile rule; the project uses
// Hyndman & Fan type 7 (DOMAIN.md). Every expected number below is worked out by hand in the
// comments from those definitions.
import { describe, expect, it } from 'vitest';
import { analyzeLot, dynamicPatLimits, staticPatLimits } from '../../src/core/analysis';
import type { WaferFrame } from '../../src/core/frame';

function frameOf(name: string, unit: string, values: number[]): WaferFrame {
  const n = values.length;
  // Dies on a line 3 apart, so no die is another's neighbour (NNR and GDBN stay out of it).
  return {
    lot: 'HAND.1', wafer: '01', x: Int32Array.from({ length: n }, (_, i) => 3 * i), y: new Int32Array(n), site: new Int32Array(n).fill(-1),
    params: [{ name, unit }], values: { [name]: Float64Array.from(values) },
  };
}

const ONE_TO_TWENTY_AND_100 = [...Array.from({ length: 20 }, (_, i) => i + 1), 100];

describe('AEC-Q001 dynamic PAT on a hand-worked set', () => {
  it('takes median and (Q3 - Q1)/1.35 of 1..20 and 100 and puts the limits 6 robust sigma either side', () => {
    // n = 21, type 7: h = 20p. Q1: h = 5 -> x(5) = 6; Q2: h = 10 -> x(10) = 11; Q3: h = 15 ->
    // x(15) = 16 (0-based order statistics). Robust sigma = (16 - 6)/1.35 = 7.407407...;
    // limits 11 -/+ 6 x 7.407407 = -33.4444 and 55.4444.
    const sorted = Float64Array.from(ONE_TO_TWENTY_AND_100);
    const limits = dynamicPatLimits(sorted, 'linear', 6)!;
    expect(limits.centre).toBe(11);
    expect(limits.robustSigma).toBeCloseTo(10 / 1.35, 12);
    expect(limits.low).toBeCloseTo(11 - 60 / 1.35, 10);
    expect(limits.high).toBeCloseTo(11 + 60 / 1.35, 10);
    expect(limits.clippedLow || limits.clippedHigh).toBe(false);
  });

  it('flags only the 100, at (100 - 11)/7.4074 = +12.015 robust sigma', () => {
    const analysis = analyzeLot([frameOf('Vtsat_n', 'V', ONE_TO_TWENTY_AND_100)], { settings: { methods: { patWafer: true, patLot: false, patStatic: false, nnr: false, gdbn: false } } });
    expect(analysis.flagged.map((f) => f.values.Vtsat_n)).toEqual([100]);
    const reason = analysis.flagged[0].reasons[0];
    expect(reason.method).toBe('pat-wafer');
    expect(reason.direction).toBe('high');
    expect(reason.score).toBeCloseTo((89 * 1.35) / 10, 10);
  });

  it('computes dynamic limits from the passing parts only and clips them to the specification limits', () => {
    // Spec [2, 50] leaves 2..20 passing (19 parts): h = 18p. Q1: h = 4.5 -> (6 + 7)/2 = 6.5;
    // Q2: h = 9 -> 11; Q3: h = 13.5 -> (15 + 16)/2 = 15.5. Robust sigma = 9/1.35 = 6.6667;
    // limits 11 -/+ 40 = -29 and 51, clipped to the spec: 2 and 50. So 1 and 100 are flagged.
    const limits = dynamicPatLimits(Float64Array.from(ONE_TO_TWENTY_AND_100), 'linear', 6, { low: 2, high: 50 })!;
    expect(limits.n).toBe(19);
    expect(limits.centre).toBe(11);
    expect(limits.robustSigma).toBeCloseTo(9 / 1.35, 12);
    expect([limits.low, limits.high]).toEqual([2, 50]);
    expect([limits.clippedLow, limits.clippedHigh]).toEqual([true, true]);
    const analysis = analyzeLot([frameOf('Vtsat_n', 'V', ONE_TO_TWENTY_AND_100)], {
      settings: { specLimits: { Vtsat_n: { low: 2, high: 50 } }, methods: { patWafer: true, patLot: false, patStatic: false, nnr: false, gdbn: false } },
    });
    expect(analysis.flagged.map((f) => f.values.Vtsat_n).sort((a, b) => a! - b!)).toEqual([1, 100]);
    expect(analysis.flagged.every((f) => f.reasons[0].method === 'pat-wafer' && (f.reasons[0] as { clipped: boolean }).clipped)).toBe(true);
  });

  it('judges currents on log10 of their magnitude, PMOS negative signs included', () => {
    // log10|I| = -11.00, -10.99, ..., -10.80 (21 values) and -9 (one die at 1 nA): n = 22,
    // h = 21p. Q1: h = 5.25 -> -10.95 + 0.25 x 0.01 = -10.9475; Q2: h = 10.5 -> -10.895;
    // Q3: h = 15.75 -> -10.8425. Robust sigma = 0.105/1.35 = 0.077778; limits -10.895 -/+ 0.46667.
    // The 1 nA die scores (-9 + 10.895)/0.077778 = +24.364.
    const values = [...Array.from({ length: 21 }, (_, i) => -(10 ** (-11 + i / 100))), -1e-9];
    const analysis = analyzeLot([frameOf('Ioff_p', 'A', values)], { settings: { methods: { patWafer: true, patLot: false, patStatic: false, nnr: false, gdbn: false } } });
    expect(analysis.flagged).toHaveLength(1);
    const reason = analysis.flagged[0].reasons[0];
    expect(reason.scale).toBe('log10');
    expect(reason.value).toBe(-1e-9);
    expect(reason.score).toBeCloseTo((1.895 * 1.35) / 0.105, 6);
  });
});

describe('AEC-Q001 static PAT from earlier lots', () => {
  it('puts limits at the reference median -/+ 6 robust sigma and clips them to the spec', () => {
    // Reference 0.40 V, robust sigma 5 mV: limits 0.37 and 0.43; a spec high of 0.42 replaces 0.43.
    const limits = staticPatLimits({ centre: 0.4, robustSigma: 0.005, lots: 6, n: 600 }, 'linear', 6)!;
    expect(limits.low).toBeCloseTo(0.37, 12);
    expect(limits.high).toBeCloseTo(0.43, 12);
    const clipped = staticPatLimits({ centre: 0.4, robustSigma: 0.005, lots: 6, n: 600 }, 'linear', 6, { high: 0.42 })!;
    expect(clipped.high).toBe(0.42);
    expect(clipped.clippedHigh).toBe(true);
  });

  it('flags against the earlier lots and warns when there are fewer than the six lots the standard asks for', () => {
    const values = [0.395, 0.4, 0.405, 0.41, 0.44];
    const history = { lots: 3, references: { Vtsat_n: { centre: 0.4, robustSigma: 0.005, lots: 3, n: 300 } } };
    const analysis = analyzeLot([frameOf('Vtsat_n', 'V', values)], { history, settings: { methods: { patWafer: false, patLot: false, patStatic: true, nnr: false, gdbn: false } } });
    // 0.44 is (0.44 - 0.40)/0.005 = +8 robust sigma, beyond 0.43; the others are inside.
    expect(analysis.flagged.map((f) => f.values.Vtsat_n)).toEqual([0.44]);
    expect(analysis.flagged[0].reasons[0].method).toBe('pat-static');
    expect(analysis.flagged[0].reasons[0].score).toBeCloseTo(8, 10);
    expect(analysis.warnings?.join(' ')).toMatch(/3 earlier lots; AEC-Q001 asks for at least 6/);
  });
});
