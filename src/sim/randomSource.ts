/**
 * A source of uniform random 32-bit words. Every Monte Carlo routine in
 * src/sim takes one of these instead of calling Math.random, so the same plan
 * and seed give the same numbers, bit for bit (docs/simulation.md,
 * "Determinism"; DEVELOPERS.md, "Randomness is injected").
 */
export interface RandomSource {
  /** Next uniform integer in [0, 2^32). */
  nextUint32(): number;
  /** Next uniform number in [0, 1) with 32 bits of resolution. */
  nextFloat(): number;
}
