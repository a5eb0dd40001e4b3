import { requireReliability } from './inputChecks';

/**
 * How many parallel forms must be averaged to raise reliability from
 * `reliability` to `target`: the Spearman–Brown prophecy solved for k,
 * k = target(1 − ρ) / (ρ(1 − target)).
 *
 * Reference: Spearman, C. (1910); Brown, W. (1910). British Journal of Psychology, 3.
 *
 * @param reliability current reliability, in (0, 1].
 * @param target reliability wanted, in (0, 1) (1 cannot be reached with finite k).
 * @returns exact k, and `forms` = k rounded up to a whole number of forms (at least 1).
 * @throws Error when either value is out of range or target is 1 while reliability < 1.
 * @example parallelFormsNeeded(0.5, 0.8) // { exact: 4, forms: 4 }
 */
export function parallelFormsNeeded(reliability: number, target: number): { exact: number; forms: number } {
  requireReliability(reliability);
  requireReliability(target, 'The target reliability');
  if (target <= reliability) return { exact: target === reliability ? 1 : rawK(reliability, target), forms: 1 };
  if (target === 1) {
    throw new Error('A reliability of exactly 1 cannot be reached by averaging any finite number of parallel forms.');
  }
  const exact = rawK(reliability, target);
  // Guard against 3.9999999999 → 4 being rounded up to 5 by floating point.
  const forms = Math.max(1, Math.ceil(exact - 1e-9));
  return { exact, forms };
}

function rawK(reliability: number, target: number): number {
  if (reliability === 1) return 1;
  return (target * (1 - reliability)) / (reliability * (1 - target));
}
