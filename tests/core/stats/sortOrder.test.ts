import { describe, expect, it } from 'vitest';
import { ascendingOrder } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/** Oracle: a stable comparison sort of the indices by value (definition of a stable ordering). */
function stableOrder(values: Float64Array): number[] {
  return Array.from(values.keys()).sort((a, b) => values[a] - values[b] || a - b);
}

describe('ascendingOrder', () => {
  it('orders mixed signs, magnitudes, subnormals and zeros like a stable comparison sort', () => {
    const random = seeded(25);
    for (const n of [0, 1, 5, 2047, 2048, 10000]) {
      const values = Float64Array.from({ length: n }, (_, i) => {
        const kind = i % 7;
        if (kind === 0) return (random() - 0.5) * 1e300;
        if (kind === 1) return (random() - 0.5) * 1e-310; // subnormal
        if (kind === 2) return Math.round(random() * 20) - 10; // many ties
        if (kind === 3) return random() < 0.5 ? -0 : 0;
        return Math.log(random()) * (random() < 0.5 ? -1 : 1);
      });
      const order = ascendingOrder(values);
      const expected = stableOrder(values);
      // Values in sorted order must agree; -0 and +0 compare equal, and the radix keys put every
      // -0 before every +0, so zeros are normalised (v + 0) before comparing. Then stability.
      expect(Array.from(order, (i) => values[i] + 0)).toEqual(expected.map((i) => values[i] + 0));
      for (let k = 1; k < n; k++) {
        const a = values[order[k - 1]];
        const b = values[order[k]];
        if (a === b && Object.is(a, b)) expect(order[k - 1]).toBeLessThan(order[k]);
      }
    }
  });

  it('returns a permutation of the indices', () => {
    const values = Float64Array.from({ length: 5000 }, (_, i) => (i * 7919) % 5000);
    const order = ascendingOrder(values);
    expect(new Set(order).size).toBe(5000);
    expect(Array.from(order, (i) => values[i])).toEqual(Array.from({ length: 5000 }, (_, i) => i));
  });

  it('works on a Float64Array view that starts inside a larger buffer', () => {
    const buffer = Float64Array.from({ length: 6000 }, (_, i) => 6000 - i);
    const view = buffer.subarray(1000, 5000);
    const order = ascendingOrder(view);
    expect(view[order[0]]).toBe(1001);
    expect(view[order[3999]]).toBe(5000);
  });
});
