/**
 * An independent normal generator for tests that check core formulas by a
 * simulation written in the test itself: mulberry32 uniforms (a public-domain
 * 32-bit generator; common practice) and the Box–Muller transform (Box &
 * Muller 1958). Nothing here comes from src/, so the check stays independent
 * of the engine.
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal variates from a seeded mulberry32 stream (Box–Muller, both variates used). */
export function normalSource(seed: number): () => number {
  const u = mulberry32(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    const r = Math.sqrt(-2 * Math.log(1 - u()));
    const th = 2 * Math.PI * u();
    spare = r * Math.sin(th);
    return r * Math.cos(th);
  };
}

/** Arithmetic mean. */
export const mean = (a: number[]): number => a.reduce((s, x) => s + x, 0) / a.length;

/** Sample SD (divisor n − 1). */
export const sd = (a: number[]): number => {
  const m = mean(a);
  return Math.sqrt(a.reduce((s, x) => s + (x - m) ** 2, 0) / (a.length - 1));
};
