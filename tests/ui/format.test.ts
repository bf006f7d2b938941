// Engineering-unit formatting. Oracles: the SI prefixes of the SI Brochure (BIPM, 9th ed. 2019,
// table 7: p = 1e-12, n = 1e-9, u(micro) = 1e-6, m = 1e-3, ...) and the ECMAScript rounding of
// Number.prototype.toPrecision (ECMA-262, 21.1.3.5), which the formatter must agree with.
import { describe, expect, it } from 'vitest';
import {
  formatBytes, formatCount, formatEngineering, formatFixed, formatPlain, formatQuantity, formatSeconds, MISSING_TEXT,
} from '../../src/ui/format';

const PREFIX_FACTOR: Record<string, number> = { a: 1e-18, f: 1e-15, p: 1e-12, n: 1e-9, u: 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9 };

/** Reads "123 pA" back to 1.23e-10 using the SI Brochure's prefix factors. */
function parseEngineering(text: string, unit: string): number {
  const match = new RegExp(`^(-?\\d+(?:\\.\\d+)?) ([afpnumkMG]?)${unit}$`).exec(text);
  if (!match) throw new Error(`not engineering notation: ${text}`);
  return Number(match[1]) * PREFIX_FACTOR[match[2]];
}

describe('formatEngineering', () => {
  it('writes currents with the SI prefix that leaves one to three integer digits', () => {
    // SI Brochure table 7 prefixes; values chosen by hand.
    expect(formatEngineering(1.234e-10, 'A')).toBe('123 pA');
    expect(formatEngineering(2.5e-11, 'A')).toBe('25.0 pA');
    expect(formatEngineering(3.1e-9, 'A')).toBe('3.10 nA');
    expect(formatEngineering(7.3e-4, 'A')).toBe('730 uA');
    expect(formatEngineering(1.2e-3, 'A')).toBe('1.20 mA');
    expect(formatEngineering(4.5e-16, 'A')).toBe('450 aA');
  });

  it('writes voltages in mV below one volt and in V above', () => {
    expect(formatEngineering(0.4217, 'V')).toBe('422 mV');
    expect(formatEngineering(1.05, 'V')).toBe('1.05 V');
    expect(formatEngineering(-0.4034, 'V')).toBe('-403 mV');
  });

  it('keeps the raw sign of negative PMOS currents', () => {
    // Testers report PMOS currents as negative numbers (common practice, see DOMAIN.md).
    expect(formatEngineering(-4.22152e-4, 'A')).toBe('-422 uA');
    expect(formatEngineering(-1.63222e-11, 'A')).toBe('-16.3 pA');
  });

  it('moves to the next prefix when rounding carries, so 999.6 pA reads 1.00 nA', () => {
    expect(formatEngineering(9.996e-10, 'A')).toBe('1.00 nA');
    expect(formatEngineering(9.9996e-7, 'A')).toBe('1.00 uA');
  });

  it('shows missing values as a dash and zero without a prefix', () => {
    expect(formatEngineering(NaN, 'A')).toBe(MISSING_TEXT);
    expect(formatEngineering(Infinity, 'A')).toBe(MISSING_TEXT);
    expect(formatEngineering(null, 'A')).toBe(MISSING_TEXT);
    expect(formatEngineering(undefined, 'V')).toBe(MISSING_TEXT);
    expect(formatEngineering(0, 'A')).toBe('0 A');
  });

  it('agrees with toPrecision rounding for values spread over eighteen decades', () => {
    // Deterministic spread of magnitudes from 1e-17 to 1e+1 with awkward mantissas.
    for (let k = 0; k < 2000; k++) {
      const exponent = -17 + (k % 19);
      const mantissa = 1 + ((k * 7919) % 8999) / 1000;
      const value = (k % 3 === 0 ? -1 : 1) * mantissa * 10 ** exponent;
      const text = formatEngineering(value, 'A');
      const expected = Number(value.toPrecision(3));
      expect(Math.abs(parseEngineering(text, 'A') - expected)).toBeLessThanOrEqual(Math.abs(expected) * 1e-12);
      // Three significant digits: one to three integer digits, the rest after the point.
      const digits = text.replace(/[^0-9]/g, '').replace(/^0+/, '');
      expect(digits.length).toBe(3);
    }
  });

  it('honours a requested number of significant digits', () => {
    expect(formatEngineering(1.23456e-10, 'A', 2)).toBe('120 pA');
    expect(formatEngineering(1.23456e-10, 'A', 4)).toBe('123.5 pA');
  });

  it('writes a plain number when the unit is unknown', () => {
    expect(formatEngineering(12.3456, '')).toBe('12.35');
    expect(formatEngineering(1.5e-7, '')).toBe('1.500e-7');
  });
});

describe('other number formats', () => {
  it('groups thousands with commas', () => {
    expect(formatCount(70000)).toBe('70,000');
    expect(formatCount(1234567)).toBe('1,234,567');
    expect(formatCount(-1509)).toBe('-1,509');
    expect(formatCount(12)).toBe('12');
  });

  it('prints fixed decimals without a negative zero', () => {
    expect(formatFixed(-10.61749, 3)).toBe('-10.617');
    expect(formatFixed(-0.0004, 2)).toBe('0.00');
    expect(formatFixed(NaN)).toBe(MISSING_TEXT);
  });

  it('switches plain numbers to exponent form outside 1e-4 to 1e6', () => {
    expect(formatPlain(0.5)).toBe('0.5');
    // Four significant digits by default.
    expect(formatPlain(123456)).toBe('123500');
    expect(formatPlain(0.000123456)).toBe('0.0001235');
    expect(formatPlain(1234567)).toBe('1.235e+6');
  });

  it('says durations in seconds, and in minutes past one minute', () => {
    expect(formatSeconds(0.4213)).toBe('0.42 s');
    expect(formatSeconds(75)).toBe('1 min 15 s');
  });

  it('uses binary multiples for byte counts (IEC 80000-13: 1 KiB = 1024 B)', () => {
    expect(formatBytes(512)).toBe('512 B');
    expect(formatBytes(1536)).toBe('1.5 KiB');
    expect(formatBytes(5 * 1024 * 1024)).toBe('5 MiB');
  });

  it('puts the noun in the singular for exactly one', () => {
    expect(formatQuantity(1, 'wafer')).toBe('1 wafer');
    expect(formatQuantity(25, 'wafer')).toBe('25 wafers');
    expect(formatQuantity(1, 'die', 'dies')).toBe('1 die');
    expect(formatQuantity(70000, 'die', 'dies')).toBe('70,000 dies');
  });
});
