import { describe, expect, it } from 'vitest';
import { decodePayload, encodePayload } from '../../src/shared/codec';
import { validateArgs } from '../../src/shared/validate';

describe('payload codec', () => {
  it('round-trips typed arrays, NaN, infinities and nested plain data', () => {
    const value = {
      frame: { x: new Int32Array([1, -2, 3]), values: { Ioff_n: new Float64Array([1e-12, NaN, -3.5]) } },
      list: [1, 'two', null, { deep: Infinity }], odd: new Uint8Array([7]), neg: -Infinity,
    };
    const back = decodePayload<typeof value>(encodePayload(value));
    expect(Array.from(back.frame.x)).toEqual([1, -2, 3]);
    expect(back.frame.values.Ioff_n).toBeInstanceOf(Float64Array);
    expect(Array.from(back.frame.values.Ioff_n)).toEqual([1e-12, NaN, -3.5]);
    expect(back.list).toEqual([1, 'two', null, { deep: Infinity }]);
    expect(Array.from(back.odd)).toEqual([7]);
    expect(back.neg).toBe(-Infinity);
  });
  it('round-trips plain data exactly, also text that looks like the envelope\'s own markers', () => {
    // Plain data takes the decoder's short path (no array, no NaN); key order and every double
    // survive, as ECMA-262 defines JSON.stringify (shortest round-trip number text).
    const value = { lot: '$num', note: '"$typed"', rows: [{ b: 2, a: 1 }, { z: [0.1, 1e-300, 12345678901234567] }], flag: false };
    expect(decodePayload(encodePayload(value))).toEqual(value);
    expect(JSON.stringify(decodePayload(encodePayload(value)))).toBe(JSON.stringify(value));
    const mixed = { name: '$num', values: [NaN, 1] };
    expect(decodePayload<typeof mixed>(encodePayload(mixed)).values).toEqual([NaN, 1]);
  });
  it('refuses bytes that are not a payload or are cut short', () => {
    expect(() => decodePayload(new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8]))).toThrow(/bad magic/);
    const whole = encodePayload({ a: new Float64Array(10) });
    expect(() => decodePayload(whole.subarray(0, whole.length - 8))).toThrow(/past the end/);
  });
});

describe('validateArgs', () => {
  it('accepts arguments that fit the contract', () => {
    expect(() => validateArgs('getWafer', ['L1', '07'])).not.toThrow();
    expect(() => validateArgs('importBytes', ['a.csv', new Uint8Array(3)])).not.toThrow();
  });
  it('refuses unknown methods, wrong counts, wrong types and oversized text', () => {
    expect(() => validateArgs('constructor', [])).toThrow(/Unknown API method/);
    expect(() => validateArgs('getWafer', ['L1'])).toThrow(/expects 2/);
    expect(() => validateArgs('listWafers', [{ lot: 'x' }])).toThrow(/must be text/);
    expect(() => validateArgs('listWafers', ['x'.repeat(600)])).toThrow(/1 to 512/);
    expect(() => validateArgs('importFile', ['a\u0000b'])).toThrow(/NUL/);
  });
});
