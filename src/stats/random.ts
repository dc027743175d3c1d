/**
 * Seeded pseudo-random numbers, identical in the Worker and in Node because
 * they use only 32-bit integer arithmetic (Math.imul, >>>).
 *
 * Generator: xoshiro128** 1.1 (Blackman & Vigna 2021, "Scrambled linear
 * pseudorandom number generators", ACM TOMS 47:36), state seeded by
 * SplitMix32 from one 32-bit seed.
 */

export interface RandomSource {
  /** Uniform on [0, 1) with 53 random bits. */
  uniform(): number;
  /** Uniform integer in [0, n). */
  integer(n: number): number;
  /** Standard normal by the polar method (Marsaglia & Bray 1964). */
  normal(): number;
  /** Bernoulli(p). */
  bernoulli(p: number): boolean;
}

function splitMix32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x9e3779b9) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/** A generator from a seed (any integer; only its low 32 bits are used). */
export function createRandom(seed: number): RandomSource {
  const init = splitMix32(seed);
  let s0 = init(), s1 = init(), s2 = init(), s3 = init();
  const next32 = (): number => {
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0;
    const t = s1 << 9;
    s2 ^= s0; s3 ^= s1; s1 ^= s2; s0 ^= s3;
    s2 ^= t;
    s3 = rotl(s3, 11);
    return result;
  };
  let spareNormal: number | undefined;
  const uniform = (): number => {
    const hi = next32() >>> 5; // 27 bits
    const lo = next32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  };
  return {
    uniform,
    integer: (n) => Math.floor(uniform() * n),
    bernoulli: (p) => uniform() < p,
    normal: () => {
      if (spareNormal !== undefined) {
        const v = spareNormal;
        spareNormal = undefined;
        return v;
      }
      let u: number, v: number, s: number;
      do {
        u = 2 * uniform() - 1;
        v = 2 * uniform() - 1;
        s = u * u + v * v;
      } while (s >= 1 || s === 0);
      const m = Math.sqrt((-2 * Math.log(s)) / s);
      spareNormal = v * m;
      return u * m;
    },
  };
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
