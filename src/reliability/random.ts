/**
 * Seeded pseudo-random numbers: xoshiro128** (D. Blackman & S. Vigna, "Scrambled linear
 * pseudorandom number generators", ACM TOMS 47(4), 2021; period 2^128 − 1), with its 128-bit state
 * filled from SplitMix64 (G. Steele, D. Lea & C. Flood, OOPSLA 2014), the seeding the xoshiro
 * authors recommend. The generator runs on 32-bit integer arithmetic (Math.imul, >>> 0), which
 * JavaScript defines exactly, so a seed gives the same sequence on every platform. SplitMix64 uses
 * BigInt, once, at seeding only.
 *
 * Nothing here reads a clock or Math.random: every random number in the project comes from a
 * generator built from the study's seed.
 */

export interface Rng {
  /** A uniform double in the open interval (0, 1): never exactly 0 or 1. */
  next(): number;
  /** The raw 32-bit output, 0 … 2^32 − 1. */
  nextUint32(): number;
}

const MASK64 = (1n << 64n) - 1n;

/** One SplitMix64 step: advances the state and returns [newState, output]. */
export function splitMix64(state: bigint): [bigint, bigint] {
  const s = (state + 0x9e3779b97f4a7c15n) & MASK64;
  let z = s;
  z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK64;
  z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK64;
  z = z ^ (z >> 31n);
  return [s, z];
}

/** 32-bit left rotation on an int32 (the bits are what the reference's uint32 rotation gives). */
function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

/**
 * A generator for a seed (an integer, |seed| < 2^53) and an optional stream number, so that parts of
 * an analysis can draw from independent sequences of one seed. Throws on a seed that is not an
 * integer: a silently rounded seed would not reproduce what the study says.
 */
export function createRng(seed: number, stream = 0): Rng {
  if (!Number.isSafeInteger(seed)) throw new RangeError(`seed must be an integer below 2^53, got ${seed}`);
  if (!Number.isSafeInteger(stream) || stream < 0) throw new RangeError(`stream must be a non-negative integer, got ${stream}`);
  // Mix the stream in through one SplitMix64 output, so nearby (seed, stream) pairs share nothing.
  let state = BigInt.asUintN(64, BigInt(seed));
  if (stream !== 0) state ^= splitMix64(BigInt(stream))[1];
  const words: number[] = [];
  for (let i = 0; i < 2; i++) {
    const [next, out] = splitMix64(state);
    state = next;
    words.push(Number(out >> 32n), Number(out & 0xffffffffn));
  }
  return xoshiro128StarStar(words as [number, number, number, number]);
}

/**
 * xoshiro128** from an explicit 128-bit state of four 32-bit words (the reference algorithm's
 * `s[0..3]`), for tests against the published algorithm; `createRng` is the normal way in.
 */
export function xoshiro128StarStar(state: readonly [number, number, number, number]): Rng {
  // The state as int32 words in a typed array: the same bits as the reference's uint32 words, but
  // never a boxed number (a uint32 above 2^31 kept in a closure variable is a heap allocation per
  // step, and every Monte Carlo trial takes dozens of steps).
  const s = Int32Array.from(state, (w) => w | 0);
  if ((s[0]! | s[1]! | s[2]! | s[3]!) === 0) s[0] = 1; // the all-zero state is the one fixed point; unreachable from SplitMix64 in practice

  /** One step; the output as an int32 (callers take >>> 0 or >>> 6 of it). */
  const step = (): number => {
    const s0 = s[0]!;
    const s1 = s[1]!;
    let s2 = s[2]!;
    let s3 = s[3]!;
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9);
    const t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s[1] = s1 ^ s2;
    s[0] = s0 ^ s3;
    s[2] = s2 ^ t;
    s[3] = rotl(s3, 11);
    return result;
  };

  const nextUint32 = (): number => step() >>> 0;

  const next = (): number => {
    const hi = step() >>> 6; // 26 bits
    const lo = step() >>> 6; // 26 bits
    return (hi * 67108864 + lo + 0.5) / 4503599627370496;
  };

  return { next, nextUint32 };
}

/** The largest double below 1 and the smallest positive one used to keep uniforms inside (0, 1). */
const BELOW_ONE = 1 - 2 ** -53;
const ABOVE_ZERO = 2 ** -53;

/**
 * One column of a Latin hypercube sample (M. D. McKay, R. J. Beckman & W. J. Conover,
 * Technometrics 21, 1979): n uniforms, exactly one in each stratum [k/n, (k+1)/n), placed at
 * random inside it and then put in random order (Fisher–Yates shuffle). Call once per dimension,
 * with the same generator, for independent columns. Values stay in (0, 1).
 */
export function latinHypercube(rng: Rng, n: number): number[] {
  if (!Number.isSafeInteger(n) || n < 0) throw new RangeError(`sample size must be a non-negative integer, got ${n}`);
  const out = new Array<number>(n);
  for (let k = 0; k < n; k++) {
    const u = (k + rng.next()) / n;
    out[k] = u >= 1 ? BELOW_ONE : u <= 0 ? ABOVE_ZERO : u;
  }
  for (let i = n - 1; i > 0; i--) {
    const j = Math.min(i, Math.floor(rng.next() * (i + 1)));
    const tmp = out[i]!;
    out[i] = out[j]!;
    out[j] = tmp;
  }
  return out;
}
