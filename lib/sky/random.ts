/**
 * Seeded pseudo-random numbers for reproducible simulations (isotropic skies,
 * time scrambling, blinding offsets).
 *
 * Generator: xoshiro128** 1.1 (Blackman & Vigna 2018, "Scrambled linear
 * pseudorandom number generators"), seeded through SplitMix32-style mixing of a
 * 32-bit integer seed. Period 2^128 - 1; passes BigCrush per its authors. Not
 * cryptographic: never use it for secrets.
 */

/** A seeded stream of uniform deviates. Holds its own state; no module-level state. */
export interface Random {
  /** Uniform deviate in [0, 1) with 32 bits of resolution. */
  next(): number;
  /** Uniform 32-bit unsigned integer in [0, 2^32). */
  nextUint32(): number;
  /** Uniform integer in [0, n) for 1 <= n <= 2^32 (rejection sampling, no modulo bias). */
  nextInt(n: number): number;
  /** Standard normal deviate (mean 0, standard deviation 1), Marsaglia polar method. */
  nextGaussian(): number;
  /**
   * Fills `out` with the next out.length deviates of next(), the very values that many calls
   * of next() would return (the stream continues after them), several times faster in bulk.
   */
  fillUniform(out: Float64Array): void;
}

/** 2^-32: multiplying by it is exact, like dividing by 2^32, and cheaper. */
const TWO_POW_MINUS_32 = 1 / 4294967296;

function splitmix32(state: number): () => number {
  let s = state >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/**
 * Creates a xoshiro128** stream from an integer seed (any safe integer; the low
 * 53 bits are folded into the state). The same seed always gives the same stream.
 */
export function createRandom(seed: number): Random {
  if (!Number.isSafeInteger(seed)) throw new RangeError(`seed must be a safe integer, got ${seed}`);
  const hi = Math.floor(seed / 2 ** 32) >>> 0;
  const mix = splitmix32((seed >>> 0) ^ Math.imul(hi, 0x27d4eb2d));
  let a = mix(), b = mix(), c = mix(), d = mix();
  if ((a | b | c | d) === 0) a = 1;
  let spare = NaN;

  const nextUint32 = (): number => {
    const result = Math.imul(rotl(Math.imul(b, 5), 7), 9) >>> 0;
    const t = b << 9;
    c ^= a; d ^= b; b ^= c; a ^= d;
    c ^= t;
    d = rotl(d, 11);
    return result;
  };
  const next = (): number => nextUint32() / 4294967296;
  const fillUniform = (out: Float64Array): void => {
    // next() unrolled with the state in locals; bitwise operations only, so the same bits.
    let A = a, B = b, C = c, D = d;
    for (let i = 0; i < out.length; i++) {
      const x = Math.imul(B, 5);
      const result = Math.imul((x << 7) | (x >>> 25), 9) >>> 0;
      const t = B << 9;
      C ^= A; D ^= B; B ^= C; A ^= D;
      C ^= t;
      D = (D << 11) | (D >>> 21);
      out[i] = result * TWO_POW_MINUS_32; // the same value as result / 2^32 (scaling by a power of two is exact)
    }
    a = A; b = B; c = C; d = D;
  };
  return {
    next,
    nextUint32,
    fillUniform,
    nextInt(n: number): number {
      if (!(n >= 1 && n <= 4294967296) || !Number.isInteger(n)) throw new RangeError(`n out of range: ${n}`);
      const limit = 4294967296 - (4294967296 % n);
      let u: number;
      do u = nextUint32(); while (u >= limit);
      return u % n;
    },
    nextGaussian(): number {
      if (!Number.isNaN(spare)) { const s = spare; spare = NaN; return s; }
      let u: number, v: number, s: number;
      do { u = 2 * next() - 1; v = 2 * next() - 1; s = u * u + v * v; } while (s >= 1 || s === 0);
      const f = Math.sqrt((-2 * Math.log(s)) / s);
      spare = v * f;
      return u * f;
    },
  };
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}

/**
 * Derives an independent child seed from a parent seed and a stream index (e.g. trial
 * sky number), so parallel workers reproduce the same skies whatever their split.
 */
export function deriveSeed(seed: number, stream: number): number {
  const mix = splitmix32(((seed >>> 0) ^ Math.imul(stream + 1, 0x9e3779b1)) >>> 0);
  mix();
  return (mix() * 2097152 + (mix() >>> 11)) % Number.MAX_SAFE_INTEGER;
}
