/**
 * Random streams of scenario format 2: xoshiro128** (Blackman & Vigna, "Scrambled linear
 * pseudorandom number generators", ACM TOMS 47(4), 2021), a 128-bit-state generator of 32-bit
 * words built from 32-bit shifts, rotations and one multiplication — cheap in JavaScript.
 *
 * Every draw set (one path, or one antithetic pair of paths) has its own stream, seeded from
 * (run seed, draw set) by hashing, so a path's numbers depend on nothing else: not on the
 * thread that computes it, the chunk it falls in, or the other paths of the run.
 *
 * Seeding: the four state words are w_k = h(h(h(drawSet + A_k) ^ seedLow) + seedHigh ^ B_k),
 * with h a bijective 32-bit mixer (lowbias32: xor-shift / multiply rounds, C. Wellons,
 * "Prospecting for hash functions", 2018) and A_k, B_k odd constants. For a fixed seed each
 * w_k is a bijection of the draw set, so no two draw sets of a run (up to 2^32) share a state.
 */

/** Bijective 32-bit mixer (lowbias32). */
export function mix32(x: number): number {
  x ^= x >>> 16;
  x = Math.imul(x, 0x7feb352d);
  x ^= x >>> 15;
  x = Math.imul(x, 0x846ca68b);
  x ^= x >>> 16;
  return x | 0;
}

const SEED_A = [0x9e3779b9, 0x3c6ef372, 0xdaa66d2b, 0x78dde6e4];
const SEED_B = [0x85ebca6b, 0xc2b2ae35, 0x27d4eb2f, 0x165667b1];
const TWO_32 = 4294967296;

function word(drawSet: number, low: number, high: number, k: number): number {
  return mix32((mix32(mix32((drawSet + SEED_A[k]) | 0) ^ low) + high) ^ SEED_B[k]);
}

/** Saved generator state: the four 32-bit words as signed integers. */
export type XoshiroState = [number, number, number, number];

export class Xoshiro128 {
  s0 = 0;
  s1 = 0;
  s2 = 0;
  s3 = 0;

  /** Seed for draw set `drawSet` (0 ≤ drawSet < 2^32) of a run with integer seed `seed` (|seed| < 2^53). */
  seed(seed: number, drawSet: number): this {
    const high = Math.floor(seed / TWO_32) | 0;
    const low = (seed - Math.floor(seed / TWO_32) * TWO_32) | 0;
    this.s0 = word(drawSet, low, high, 0);
    this.s1 = word(drawSet, low, high, 1);
    this.s2 = word(drawSet, low, high, 2);
    this.s3 = word(drawSet, low, high, 3);
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1; // the all-zero state is a fixed point
    return this;
  }

  /** Next 32-bit output as a signed integer. */
  nextInt(): number {
    const s1 = this.s1;
    const x = Math.imul(s1, 5);
    const result = Math.imul((x << 7) | (x >>> 25), 9);
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= s1;
    this.s1 = s1 ^ this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = (this.s3 << 11) | (this.s3 >>> 21);
    return result;
  }

  /** Next uniform in [0, 1) with 53 random bits (two outputs). */
  next(): number {
    const a = this.nextInt() >>> 11;
    const b = this.nextInt() >>> 0;
    return (a * TWO_32 + b) * 1.1102230246251565e-16; // 2^-53
  }

  save(): XoshiroState {
    return [this.s0, this.s1, this.s2, this.s3];
  }

  restore(state: XoshiroState): void {
    [this.s0, this.s1, this.s2, this.s3] = state;
  }
}

/** A generator seeded for draw set `drawSet` of a run seeded with `seed`. */
export function drawSetStream(seed: number, drawSet: number): Xoshiro128 {
  return new Xoshiro128().seed(seed, drawSet);
}
