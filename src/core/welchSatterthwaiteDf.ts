/**
 * Welch–Satterthwaite degrees of freedom of a sum of independent variance
 * terms: df = (Σ a_i)² / Σ (a_i² / f_i), where a_i is one term's contribution
 * to the squared standard error (e.g. s_g²/n_g) and f_i its own degrees of
 * freedom (e.g. n_g − 1).
 *
 * Reference: Welch, B. L. (1947), Biometrika 34, 28–35; Satterthwaite, F. E.
 * (1946), Biometrics Bulletin 2, 110–114 (the same approximation).
 *
 * @param terms the variance terms, each { variance ≥ 0 (squared points), df > 0 }; at least one
 *   term with a positive variance.
 * @returns the approximate df, between min f_i and Σ f_i (> 0).
 * @throws Error when a term is negative or not finite, a df is not positive, or every variance is 0.
 * @example welchSatterthwaiteDf([{ variance: 1, df: 99 }, { variance: 1, df: 99 }]) // 198 (equal terms: the pooled df)
 * @example welchSatterthwaiteDf([{ variance: 400 / 20, df: 19 }, { variance: 100 / 400, df: 399 }]) // ≈ 19.5
 */
export function welchSatterthwaiteDf(terms: readonly { variance: number; df: number }[]): number {
  let sum = 0;
  let denominator = 0;
  for (const t of terms) {
    if (!(t.variance >= 0) || !Number.isFinite(t.variance)) {
      throw new Error(`A variance term of the standard error must be a finite number of at least 0; got ${t.variance}.`);
    }
    if (!(t.df > 0) || !Number.isFinite(t.df)) {
      throw new Error(`The degrees of freedom of a variance term must be positive; got ${t.df}.`);
    }
    sum += t.variance;
    denominator += (t.variance * t.variance) / t.df;
  }
  if (!(sum > 0)) throw new Error('The degrees of freedom are undefined: every variance term is zero.');
  return (sum * sum) / denominator;
}
