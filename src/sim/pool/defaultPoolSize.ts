/** The most workers a pool or `--workers` accepts. */
export const MAX_POOL_WORKERS = 64;

/**
 * How many simulation workers to start on a machine with `cores` logical
 * cores: one per core, leaving one for the page (or the command line's own
 * thread), and at least one: max(1, cores − 1), at most MAX_POOL_WORKERS.
 * An unknown or nonsensical count (undefined, 0, NaN) gives 1.
 *
 * @param cores navigator.hardwareConcurrency in the browser, os.availableParallelism() in Node.
 * @returns a whole number from 1 to 64.
 * @throws never.
 * @example defaultPoolSize(8) // 7; defaultPoolSize(2) // 1; defaultPoolSize(undefined) // 1
 */
export function defaultPoolSize(cores: number | undefined): number {
  if (typeof cores !== 'number' || !Number.isFinite(cores) || cores < 2) return 1;
  return Math.min(MAX_POOL_WORKERS, Math.floor(cores) - 1);
}
