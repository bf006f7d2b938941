// Reading typed values with SI prefixes. Oracle: the SI Brochure (9th ed., 2019), table 7
// (pico 1e-12, nano 1e-9, micro 1e-6, milli 1e-3, kilo 1e3).
import { describe, expect, it } from 'vitest';
import { parseEngineering } from '../../src/ui/parseEngineering';

describe('parseEngineering', () => {
  it('reads prefixes with and without the unit', () => {
    expect(parseEngineering('2 nA', 'A')).toBeCloseTo(2e-9, 20);
    expect(parseEngineering('450 mV', 'V')).toBeCloseTo(0.45, 12);
    expect(parseEngineering('25uA', 'A')).toBeCloseTo(25e-6, 18);
    expect(parseEngineering('25 µA', 'A')).toBeCloseTo(25e-6, 18);
    expect(parseEngineering('100 pA', 'A')).toBeCloseTo(1e-10, 22);
    expect(parseEngineering('1.5k', '')).toBe(1500);
  });

  it('reads plain and exponent numbers', () => {
    expect(parseEngineering('6', '')).toBe(6);
    expect(parseEngineering('-0.8', 'V')).toBe(-0.8);
    expect(parseEngineering('1e-9', 'A')).toBe(1e-9);
  });

  it('refuses text that is not a number in that unit', () => {
    expect(parseEngineering('', 'A')).toBeNull();
    expect(parseEngineering('abc', 'A')).toBeNull();
    expect(parseEngineering('3 V', 'A')).toBeNull();
  });
});
