import { describe, expect, it } from 'vitest';
import { countFinite, finiteValues } from '../../../src/core/stats';

// The family's documented missing-data rule: a value counts only when Number.isFinite(v).
const messy = [1, NaN, 2, Infinity, -Infinity, null, undefined, -3, 0];

describe('countFinite', () => {
  it('counts only finite numbers, skipping NaN, ±Infinity, null and undefined', () => {
    expect(countFinite(messy)).toBe(4);
  });

  it('returns 0 for an empty input and for an input with no finite value', () => {
    expect(countFinite([])).toBe(0);
    expect(countFinite(new Float64Array([NaN, Infinity]))).toBe(0);
  });
});

describe('finiteValues', () => {
  it('copies the finite values into a Float64Array in their original order', () => {
    const out = finiteValues(messy);
    expect(out).toBeInstanceOf(Float64Array);
    expect(Array.from(out)).toEqual([1, 2, -3, 0]);
  });

  it('returns a copy, leaving the input untouched even when everything is finite', () => {
    const input = new Float64Array([3, 1, 2]);
    const out = finiteValues(input);
    out[0] = 99;
    expect(Array.from(input)).toEqual([3, 1, 2]);
  });

  it('returns an empty array when no value is finite', () => {
    expect(finiteValues([NaN, null, undefined]).length).toBe(0);
  });
});
