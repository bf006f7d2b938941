// Seeded pseudo-random numbers for the demo generator: the same seed gives the same lot on every
// machine and every run, and separate streams keep one part's draws from shifting another's.

const MASK64 = (1n << 64n) - 1n;

/**
 * SplitMix64 (G. L. Steele, D. Lea, C. H. Flood, "Fast splittable pseudorandom number generators",
 * OOPSLA 2014; reference code prng.di.unimi.it/splitmix64.c). Used only to expand a seed into
 * generator state, as the xoshiro authors recommend; BigInt is fine at that rate.
 */
export class SplitMix64 {
  private state: bigint;

  constructor(seed: bigint) {
    this.state = BigInt.asUintN(64, seed);
  }

  next(): bigint {
    this.state = (this.state + 0x9e3779b97f4a7c15n) & MASK64;
    let z = this.state;
    z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK64;
    z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK64;
    return z ^ (z >> 31n);
  }
}

/**
 * Mixes a base seed with stream labels into one 64-bit seed, so that (seed, wafer 3) and
 * (seed, wafer 4) start unrelated streams. Each label is folded in through a SplitMix64 step.
 */
export function deriveSeed(seed: number | bigint, ...labels: number[]): bigint {
  let value = BigInt.asUintN(64, BigInt(seed));
  for (const label of labels) {
    value = new SplitMix64(value ^ BigInt.asUintN(64, BigInt(label) * 0x9e3779b97f4a7c15n)).next();
  }
  return value;
}

/**
 * xoshiro128** 1.1 (D. Blackman and S. Vigna, "Scrambled linear pseudorandom number generators",
 * ACM TOMS 47(4), 2021; reference code prng.di.unimi.it/xoshiro128starstar.c): 128-bit state,
 * 32-bit outputs, period 2^128 - 1. Fast in JavaScript because it needs only 32-bit integer ops.
 */
export class Xoshiro128StarStar {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  /** State words as given; they must not all be zero (the generator would stay at zero). */
  constructor(state: readonly [number, number, number, number]) {
    [this.s0, this.s1, this.s2, this.s3] = state.map((word) => word >>> 0);
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) {
      throw new RangeError('xoshiro128** state must not be all zero');
    }
  }

  /** Seeds the four state words from two SplitMix64 outputs. */
  static fromSeed(seed: number | bigint): Xoshiro128StarStar {
    const mixer = new SplitMix64(BigInt(seed));
    const a = mixer.next();
    const b = mixer.next();
    const words: [number, number, number, number] = [
      Number(a & 0xffffffffn), Number(a >> 32n), Number(b & 0xffffffffn), Number(b >> 32n),
    ];
    // Two consecutive SplitMix64 outputs are never both zero, but guard the contract anyway.
    if ((words[0] | words[1] | words[2] | words[3]) === 0) words[0] = 1;
    return new Xoshiro128StarStar(words);
  }

  /** Next 32-bit output as an unsigned integer. */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9) >>> 0;
    const t = this.s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

const TWO_POW_26 = 67108864;
const TWO_POW_53 = 9007199254740992;

/** The draws the generator needs, on top of a xoshiro128** stream. */
export class Random {
  private readonly source: Xoshiro128StarStar;
  private spareNormal: number | undefined;

  constructor(seed: number | bigint) {
    this.source = Xoshiro128StarStar.fromSeed(seed);
  }

  /** Next raw 32-bit unsigned integer. */
  nextUint32(): number {
    return this.source.nextUint32();
  }

  /** Uniform on [0, 1) with 53 random bits (two outputs, the usual 27 + 26 bit split). */
  next(): number {
    const high = this.source.nextUint32() >>> 5;
    const low = this.source.nextUint32() >>> 6;
    return (high * TWO_POW_26 + low) / TWO_POW_53;
  }

  /** Uniform on [min, max). */
  uniform(min = 0, max = 1): number {
    return min + (max - min) * this.next();
  }

  /** Uniform integer in [min, max], both ends included. */
  int(min: number, max: number): number {
    if (!Number.isInteger(min) || !Number.isInteger(max) || max < min) {
      throw new RangeError('int requires integer bounds with min <= max');
    }
    return min + Math.floor(this.next() * (max - min + 1));
  }

  /**
   * Normal deviate by the Box-Muller transform (G. E. P. Box and M. E. Muller, "A note on the
   * generation of random normal deviates", Ann. Math. Statist. 29(2):610-611, 1958). Each pair of
   * uniforms gives two independent deviates; the second is kept for the next call.
   */
  normal(mean = 0, sd = 1): number {
    if (this.spareNormal !== undefined) {
      const z = this.spareNormal;
      this.spareNormal = undefined;
      return mean + sd * z;
    }
    const u1 = 1 - this.next(); // (0, 1]: log(u1) stays finite
    const u2 = this.next();
    const radius = Math.sqrt(-2 * Math.log(u1));
    const angle = 2 * Math.PI * u2;
    this.spareNormal = radius * Math.sin(angle);
    return mean + sd * radius * Math.cos(angle);
  }
}

/** A Random for one stream of a seed: createRandom(seed, 1, 7) is wafer 7's stream, say. */
export function createRandom(seed: number | bigint, ...labels: number[]): Random {
  return new Random(deriveSeed(seed, ...labels));
}
