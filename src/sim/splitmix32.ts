/**
 * The MurmurHash3 32-bit finaliser ("fmix32"; Appleby 2008), the mixing step
 * of the 32-bit splitmix generator (Steele, Lea & Flood 2014, "Fast splittable
 * pseudorandom number generators", OOPSLA, adapted to 32-bit words). A
 * bijection on 32-bit words that spreads every input bit over the output.
 *
 * @param x any number; only its low 32 bits are used.
 * @returns a 32-bit unsigned integer.
 * @example mix32(0) === 0; mix32(1) === 1364076727 (computed with this code; a bijection fixing 0).
 */
export function mix32(x: number): number {
  let z = x | 0;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  return (z ^ (z >>> 16)) >>> 0;
}

/** The splitmix Weyl increment: 2^32 divided by the golden ratio (Steele et al. 2014). */
export const GOLDEN_GAMMA_32 = 0x9e3779b9;

/**
 * One step of splitmix32 (Steele, Lea & Flood 2014, 32-bit variant): advance a
 * Weyl sequence by the golden gamma and return the mixed value. The state is
 * held by the caller in a one-element Uint32Array so the step is allocation-free.
 *
 * @param state one-element array holding the 32-bit state; advanced in place.
 * @returns a 32-bit unsigned integer.
 * @example splitmix32(new Uint32Array([0])) === mix32(0x9e3779b9).
 */
export function splitmix32(state: Uint32Array): number {
  const s = ((state[0] ?? 0) + GOLDEN_GAMMA_32) >>> 0;
  state[0] = s;
  return mix32(s);
}

/**
 * Fold a seed (any safe integer, negative allowed) into 32 bits so seeds
 * beyond 2^32 still give distinct streams.
 * @throws Error when the seed is not a finite integer.
 * @example foldSeed(7) === 7.
 */
export function foldSeed(seed: number): number {
  if (!Number.isFinite(seed) || !Number.isInteger(seed)) {
    throw new Error(`The simulation seed must be a whole number; got ${String(seed)}.`);
  }
  const low = seed >>> 0; // low 32 bits (two's complement for negatives)
  const high = Math.floor(seed / 4294967296) | 0;
  return high === 0 ? low : (low ^ mix32(high + GOLDEN_GAMMA_32)) >>> 0;
}

/**
 * The 128-bit starting state of replication `index`'s own random stream,
 * derived from (seed, index) by hashing, so a replication's numbers do not
 * depend on which replications ran before it or how they were chunked.
 * The four words come from a splitmix32 sequence whose start is the mixed
 * pair (seed, index) (Steele, Lea & Flood 2014: splitmix for seeding).
 *
 * @param seed the simulation seed (safe integer).
 * @param index replication number, 0-based integer.
 * @param out four-word array to fill (reused to avoid allocation).
 * @throws Error when the seed is not a whole number.
 * @example streamState(1, 0, new Uint32Array(4)) differs from streamState(1, 1, ...).
 */
export function streamState(seed: number, index: number, out: Uint32Array): Uint32Array {
  const s = new Uint32Array(1);
  s[0] = mix32(foldSeed(seed) ^ 0x6a09e667) ^ mix32(Math.imul(index + 1, GOLDEN_GAMMA_32) ^ 0xbb67ae85);
  out[0] = splitmix32(s);
  out[1] = splitmix32(s);
  out[2] = splitmix32(s);
  out[3] = splitmix32(s);
  // xoshiro's all-zero state is a fixed point: never start there.
  if ((out[0] | out[1] | out[2] | out[3]) === 0) out[0] = 1;
  return out;
}
