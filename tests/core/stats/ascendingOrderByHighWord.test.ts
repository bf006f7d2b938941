import { describe, expect, it } from 'vitest';
import { ascendingOrderByHighWord } from '../../../src/core/stats';
import { seeded } from '../../support/random';

/** Oracle: the built-in comparison sort of the indices, ties in index order (a stable sort). */
function oracle(values: Float64Array): number[] {
  return Array.from(values.keys()).sort((a, b) => values[a] - values[b] || a - b);
}

describe('ascendingOrderByHighWord', () => {
  const random = seeded(5);
  const cases: [string, (i: number) => number][] = [
    ['log-normal leakage currents', () => 2e-11 * Math.exp(random())],
    ['thresholds within a few mV', () => 0.42 + 0.004 * random()],
    ['negative and positive values with zeros', (i) => (i % 17 === 0 ? 0 : (random() - 0.5) * 1e-3)],
    ['many exact ties', () => Math.floor(random() * 40)],
    ['a large common offset (values agreeing to nine digits)', () => 1e7 + random() * 1e-3],
    ['a short run of equal high words', (i) => (i < 100 ? 1 + i * 1e-12 : random())],
  ];
  for (const [name, make] of cases) {
    it(`orders ${name} exactly as a stable comparison sort does`, () => {
      const values = Float64Array.from({ length: 20_000 }, (_, i) => make(i));
      expect(Array.from(ascendingOrderByHighWord(values))).toEqual(oracle(values));
    });
  }

  it('handles short columns by the full ordering', () => {
    const values = Float64Array.from([3, 1, 2, 1]);
    expect(Array.from(ascendingOrderByHighWord(values))).toEqual([1, 3, 2, 0]);
  });
});
