import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decodeUtf8, fastInteger, fastNumber } from '../../../src/core/import/fastNumber';

const bytes = (text: string) => new TextEncoder().encode(text);
const read = (text: string) => { const b = bytes(text); return fastNumber(b, 0, b.length); };

describe('fastNumber', () => {
  // Oracle: ECMAScript Number() (ECMA-262 StringToNumber, correctly rounded); the fast path must
  // give the identical double or decline (NaN) so the string path can decide.
  it('reads the decimal forms testers write exactly as Number() does', () => {
    for (const t of ['0', '-0', '723.509', '-413.55', '0.000123', '1.5e-12', '-1.7E+3', '22.1625', ' 12 ', '5\r', '1.', '.5', '+5', '007', '123456789012345', '1234567890123456', '0.1']) {
      expect(Object.is(read(t), Number(t)), t).toBe(true);
    }
  });
  it('declines what it cannot read exactly and words, leaving them to the string path', () => {
    for (const t of ['', 'NA', 'NaN', 'Infinity', '1e', '0x1f', '1,5', '12345678901234567890', '1e400', '1e-400', '-']) expect(read(t), t).toBeNaN();
  });
  it('agrees with Number() on random decimal numbers', () => {
    fc.assert(fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 1, max: 17 }), (v, digits) => {
      const text = v.toPrecision(digits);
      const got = read(text);
      return Number.isNaN(got) || Object.is(got, Number(text));
    }), { numRuns: 20000 });
  });
  it('reads whole numbers for die coordinates and sites', () => {
    const b = bytes('-149');
    expect(fastInteger(b, 0, b.length)).toBe(-149);
    const c = bytes('1.5');
    expect(fastInteger(c, 0, c.length)).toBeNaN();
  });
  // Oracle: the WHATWG TextDecoder (UTF-8) of the Node runtime.
  it('decodes UTF-8 lot names as TextDecoder does', () => {
    for (const t of ['LOT-7', 'Los Ñ', 'ウェハ', 'a😀b']) { const b = bytes(t); expect(decodeUtf8(b, 0, b.length)).toBe(new TextDecoder().decode(b)); }
  });
});
