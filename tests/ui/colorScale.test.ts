// Colour range of the map. Oracles: Hyndman & Fan (1996), "Sample quantiles in statistical
// packages", definition 7 (R's default: with h = (n - 1) p on 0-based order statistics,
// Q(p) = x[floor h] + (h - floor h)(x[floor h + 1] - x[floor h])), worked by hand below, and
// the definition of log10.
import { describe, expect, it } from 'vitest';
import { colourScaleFor, rampStepOf, transformValue } from '../../src/ui/map/colorScale';
import { RAMP_STEPS } from '../../src/ui/map/colorRamp';

describe('colourScaleFor', () => {
  it('colours currents by log10 of the magnitude, sign ignored', () => {
    expect(transformValue(-1e-11, true)).toBeCloseTo(-11, 12);
    expect(transformValue(3.16e-10, true)).toBeCloseTo(Math.log10(3.16e-10), 12);
    expect(transformValue(0, true)).toBeNaN();
    expect(transformValue(-0.4, false)).toBe(-0.4);
  });

  it('spans the 2nd to 98th percentile so one wild die does not squash the ramp', () => {
    // 99 dies at 10 pA .. 1 nA in log steps and one at 1 mA.
    const values = new Float64Array(100);
    for (let i = 0; i < 99; i++) values[i] = 10 ** (-11 + (2 * i) / 98);
    values[99] = 1e-3;
    const scale = colourScaleFor(values, 'A');
    expect(scale.log).toBe(true);
    expect(scale.valid).toBe(100);
    // Sorted logs are -11 + 2 i / 98 (i = 0..98), then -3. Type 7 with n = 100:
    // p = 0.02: h = 1.98 -> x1 + 0.98 (x2 - x1) = -11 + (2 + 0.98 * 2) / 98;
    // p = 0.98: h = 97.02 -> x97 + 0.02 (x98 - x97) = -11 + (194 + 0.02 * 2) / 98.
    expect(scale.low).toBeCloseTo(-11 + (2 + 0.98 * 2) / 98, 12);
    expect(scale.high).toBeCloseTo(-11 + (194 + 0.02 * 2) / 98, 12);
    expect(scale.high).toBeLessThan(-9);
  });

  it('uses the values themselves for voltages and skips missing ones', () => {
    const scale = colourScaleFor(Float64Array.from([0.40, 0.41, NaN, 0.42, 0.43]), 'V');
    expect(scale.log).toBe(false);
    expect(scale.valid).toBe(4);
    expect(scale.low).toBeGreaterThanOrEqual(0.40);
    expect(scale.high).toBeLessThanOrEqual(0.43);
  });

  it('opens a range around a constant parameter instead of dividing by zero', () => {
    const scale = colourScaleFor(new Float64Array(20).fill(0.5), 'V');
    expect(scale.high).toBeGreaterThan(scale.low);
    expect(rampStepOf(0.5, scale)).toBe(Math.round((RAMP_STEPS - 1) / 2));
  });

  it('maps the range ends to the first and last step, clamps beyond, and marks missing as -1', () => {
    const scale = { log: false, low: 0, high: 10, unit: 'V', valid: 1 };
    expect(rampStepOf(0, scale)).toBe(0);
    expect(rampStepOf(10, scale)).toBe(RAMP_STEPS - 1);
    expect(rampStepOf(-5, scale)).toBe(0);
    expect(rampStepOf(50, scale)).toBe(RAMP_STEPS - 1);
    expect(rampStepOf(NaN, scale)).toBe(-1);
  });
});
