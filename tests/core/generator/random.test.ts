import { describe, expect, it } from 'vitest';
import { errorFunction, mean, sampleKurtosis, sampleSkewness, sampleStandardDeviation, variance } from 'simple-statistics';
import { Random, SplitMix64, Xoshiro128StarStar, createRandom, deriveSeed } from '../../../src/core/generator/random';

describe('Xoshiro128StarStar', () => {
  it('reproduces the reference implementation from state {1, 2, 3, 4}', () => {
    // Values from the rand_xoshiro crate's `reference` test, produced with the reference C code
    // prng.di.unimi.it/xoshiro128starstar.c (version 1.1).
    const generator = new Xoshiro128StarStar([1, 2, 3, 4]);
    const expected = [11520, 0, 5927040, 70819200, 2031721883, 1637235492, 1287239034, 3734860849, 3729100597, 4258142804];
    expect(expected.map(() => generator.nextUint32())).toEqual(expected);
  });

  it('reproduces a second reference sequence from a random-looking state', () => {
    // Test data of the edorfaus/xoshiro-6502 project (test-rom/testdata.asm, "starstar" column),
    // generated with the C reference implementation from the seed bytes 0C 4A 4D 96 ...
    const generator = new Xoshiro128StarStar([0x964d4a0c, 0xd40ab895, 0xad7fdecb, 0x3006f0f0]);
    const expected = [0xf1391922, 0x6fe53806, 0xa5be2840, 0xf510ee70];
    expect(expected.map(() => generator.nextUint32())).toEqual(expected);
  });

  it('refuses the all-zero state, which would never leave zero', () => {
    // Blackman & Vigna 2021: the state must not be everywhere zero.
    expect(() => new Xoshiro128StarStar([0, 0, 0, 0])).toThrow(/zero/);
  });
});

describe('SplitMix64', () => {
  it('reproduces the reference implementation', () => {
    // Values from the rand_xoshiro crate's SplitMix64 `reference` test, produced with
    // prng.di.unimi.it/splitmix64.c, seed 1477776061723855037.
    const mixer = new SplitMix64(1477776061723855037n);
    const expected = [1985237415132408290n, 2979275885539914483n, 13511426838097143398n, 8488337342461049707n, 15141737807933549159n];
    expect(expected.map(() => mixer.next())).toEqual(expected);
  });
});

describe('Random streams', () => {
  it('give identical draws for the same seed', () => {
    const a = createRandom(42, 1, 3);
    const b = createRandom(42, 1, 3);
    const drawsA = Array.from({ length: 50 }, () => a.normal());
    const drawsB = Array.from({ length: 50 }, () => b.normal());
    expect(drawsA).toEqual(drawsB);
  });

  it('give different draws for different seeds and different stream labels', () => {
    const first = (random: Random) => Array.from({ length: 8 }, () => random.nextUint32());
    const base = first(createRandom(42, 1, 3));
    expect(first(createRandom(43, 1, 3))).not.toEqual(base);
    expect(first(createRandom(42, 1, 4))).not.toEqual(base);
    expect(first(createRandom(42, 2, 3))).not.toEqual(base);
    expect(deriveSeed(42, 1, 3)).not.toBe(deriveSeed(42, 3, 1));
  });
});

describe('Random.uniform and Random.int', () => {
  const random = new Random(7);
  const draws = Array.from({ length: 100_000 }, () => random.next());

  it('stays in [0, 1) with the mean and variance of the standard uniform', () => {
    // Standard uniform distribution: mean 1/2, variance 1/12 (any probability handbook); the
    // standard error of the mean over n = 1e5 draws is sqrt(1/12/n) = 0.0009.
    expect(Math.min(...draws)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...draws)).toBeLessThan(1);
    expect(Math.abs(mean(draws) - 0.5)).toBeLessThan(0.004);
    expect(Math.abs(variance(draws) - 1 / 12)).toBeLessThan(0.002);
  });

  it('scales uniform(min, max) onto the interval', () => {
    const r = new Random(8);
    const values = Array.from({ length: 20_000 }, () => r.uniform(-3, 5));
    expect(Math.min(...values)).toBeGreaterThanOrEqual(-3);
    expect(Math.max(...values)).toBeLessThan(5);
    // Uniform on [a, b): mean (a + b) / 2 = 1, standard error 8/sqrt(12 n) = 0.016.
    expect(Math.abs(mean(values) - 1)).toBeLessThan(0.08);
  });

  it('hits every integer of int(min, max) with equal frequency, both ends included', () => {
    const r = new Random(9);
    const counts = new Map<number, number>();
    const n = 60_000;
    for (let i = 0; i < n; i++) {
      const v = r.int(-2, 3);
      counts.set(v, (counts.get(v) ?? 0) + 1);
    }
    expect([...counts.keys()].sort((a, b) => a - b)).toEqual([-2, -1, 0, 1, 2, 3]);
    // Each count is binomial(n, 1/6): sd = sqrt(n p (1-p)) = 91; allow 5 sd.
    for (const count of counts.values()) expect(Math.abs(count - n / 6)).toBeLessThan(5 * 91.3);
  });

  it('refuses reversed or fractional bounds', () => {
    expect(() => random.int(3, 2)).toThrow(/min <= max/);
    expect(() => random.int(0.5, 2)).toThrow(/integer/);
  });
});

describe('Random.normal', () => {
  const random = new Random(11);
  const n = 200_000;
  const draws = Array.from({ length: n }, () => random.normal());

  it('has the moments of the standard normal', () => {
    // Standard normal: mean 0, sd 1, skewness 0, excess kurtosis 0 (any probability handbook);
    // tolerances are about 4 standard errors at n = 2e5.
    expect(Math.abs(mean(draws))).toBeLessThan(0.01);
    expect(Math.abs(sampleStandardDeviation(draws) - 1)).toBeLessThan(0.007);
    expect(Math.abs(sampleSkewness(draws))).toBeLessThan(0.025);
    expect(Math.abs(sampleKurtosis(draws))).toBeLessThan(0.05);
  });

  it('puts the right fraction of draws below each quantile of the normal CDF', () => {
    // Phi(z) = (1 + erf(z / sqrt 2)) / 2 with simple-statistics' errorFunction as the reference.
    for (const z of [-3, -2, -1, -0.5, 0, 0.5, 1, 2, 3]) {
      const expected = 0.5 * (1 + errorFunction(z / Math.SQRT2));
      const observed = draws.filter((v) => v < z).length / n;
      const standardError = Math.sqrt((expected * (1 - expected)) / n);
      expect(Math.abs(observed - expected)).toBeLessThan(5 * standardError + 1e-4);
    }
  });

  it('applies mean and standard deviation', () => {
    const r = new Random(12);
    const values = Array.from({ length: 50_000 }, () => r.normal(10, 0.5));
    expect(Math.abs(mean(values) - 10)).toBeLessThan(0.01);
    expect(Math.abs(sampleStandardDeviation(values) - 0.5)).toBeLessThan(0.01);
  });
});
