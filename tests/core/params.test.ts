import { describe, expect, it } from 'vitest';
import { parseMeasurementHeader, parseUnit, tradeoffPairs, canonicalBaseUnit } from '../../src/core/params';

describe('parseUnit', () => {
  // SI prefixes (SI Brochure, 9th ed., table 7): p = 1e-12, n = 1e-9, u = 1e-6, m = 1e-3, f = 1e-15.
  it.each([
    ['A', 'A', 1], ['pA', 'A', 1e-12], ['nA', 'A', 1e-9], ['uA', 'A', 1e-6], ['µA', 'A', 1e-6],
    ['mA', 'A', 1e-3], ['fA', 'A', 1e-15], ['V', 'V', 1], ['mV', 'V', 1e-3], ['PA', 'A', 1e-12], ['UA', 'A', 1e-6],
  ])('reads %s as %s times %d', (text, base, scale) => {
    expect(parseUnit(text)).toEqual({ base, scale });
  });
  it('returns undefined for words that are not a current or voltage unit', () => {
    expect(parseUnit('ohm')).toBeUndefined();
    expect(parseUnit('')).toBeUndefined();
    expect(parseUnit('kg')).toBeUndefined();
  });
});

describe('parseMeasurementHeader', () => {
  it('reads the canonical name and unit in brackets, parentheses and suffix forms, any case', () => {
    expect(parseMeasurementHeader('Ioff_n [A]')).toMatchObject({ name: 'Ioff_n', canonical: true, unit: { base: 'A', scale: 1 } });
    expect(parseMeasurementHeader('Ion_n (uA)')).toMatchObject({ name: 'Ion_n', unit: { base: 'A', scale: 1e-6 } });
    expect(parseMeasurementHeader('IOFF_P (pA)')).toMatchObject({ name: 'Ioff_p', unit: { base: 'A', scale: 1e-12 } });
    expect(parseMeasurementHeader('vtsat_n_mV')).toMatchObject({ name: 'Vtsat_n', unit: { base: 'V', scale: 1e-3 } });
    expect(parseMeasurementHeader('ISB')).toMatchObject({ name: 'Isb', canonical: true, unit: undefined });
  });
  it('keeps an unknown column under its own header text', () => {
    expect(parseMeasurementHeader('Rcontact (ohm)')).toMatchObject({ name: 'Rcontact', canonical: false, unitText: 'ohm', unit: undefined });
    expect(parseMeasurementHeader('Temp')).toMatchObject({ name: 'Temp', canonical: false });
  });
  it('knows which base unit each canonical parameter has', () => {
    expect(canonicalBaseUnit('Vtlin_p')).toBe('V');
    expect(canonicalBaseUnit('Ig_n')).toBe('A');
    expect(canonicalBaseUnit('Rcontact')).toBeUndefined();
  });
  it('pairs Ion and Ioff per device type only when both exist', () => {
    expect(tradeoffPairs(['Ioff_n', 'Ion_n', 'Ioff_p'])).toEqual([{ device: 'n', ion: 'Ion_n', ioff: 'Ioff_n' }]);
  });
});
