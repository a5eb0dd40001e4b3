import { requireFinite, requireOpenInterval } from '../core/inputChecks';
import { fQuantile } from './fQuantile';
import type { Interval } from './types';

/**
 * Confidence interval for Cronbach's alpha from its sampling distribution:
 * (1 − α) / (1 − α̂) follows F with df1 = n − 1 and df2 = (n − 1)(k − 1)
 * (exact for a persons × items design with normal, essentially tau-equivalent
 * items and uncorrelated errors), so with γ = 1 − level
 *   lower = 1 − (1 − α̂) · F(1 − γ/2; df1, df2),
 *   upper = 1 − (1 − α̂) · F(γ/2;     df1, df2).
 *
 * Reference: Feldt, L. S. (1965). The approximate sampling distribution of
 * Kuder–Richardson reliability coefficient twenty. Psychometrika, 30,
 * 357–370; in this form Feldt, Woodruff & Salih (1987), Applied Psychological
 * Measurement, 11, 93–103 (equation 3, from memory). The direction follows
 * from Hoyt's ANOVA: 1 − α̂ = MS_res / MS_persons and
 * (MS_res / σ²_e) / (MS_persons / (σ²_e + kσ²_p)) ~ F((n−1)(k−1), n−1).
 *
 * For the pooled within-group alpha (item scores centred on their group's
 * means) pass the within-group degrees of freedom N − G as `subjectDf`: each
 * group mean removed costs one (the same reasoning as for the pooled variance).
 *
 * @param alpha the estimate α̂ (finite, ≤ 1; α̂ = 1 gives the interval [1, 1]).
 * @param subjectDf n − 1 for one group (≥ 1; may be N − G when pooled).
 * @param k number of items (≥ 2).
 * @param level confidence level in (0, 1), default 0.95.
 * @returns { value: α̂, lower, upper, level } with lower ≤ α̂ ≤ upper; for α̂ < 1
 *   the upper end stays below 1, the lower end may be negative.
 * @throws Error when an argument is out of range.
 * @example feldtInterval(0.8, 99, 10) // { value: .8, lower: ≈ .736, upper: ≈ .854, level: .95 } (computed with F quantiles)
 */
export function feldtInterval(alpha: number, subjectDf: number, k: number, level = 0.95): Interval {
  requireFinite(alpha, "Cronbach's alpha");
  if (!(alpha <= 1)) throw new Error(`Cronbach's alpha cannot exceed 1; got ${alpha}.`);
  if (!(Number.isInteger(subjectDf) && subjectDf >= 1)) {
    throw new Error(`Feldt's interval needs at least 2 people (1 degree of freedom); got ${subjectDf} degrees of freedom.`);
  }
  if (!(Number.isInteger(k) && k >= 2)) throw new Error(`Feldt's interval needs at least 2 items; got ${k}.`);
  requireOpenInterval(level, 0, 1, 'The confidence level');
  const g = 1 - level;
  const df2 = subjectDf * (k - 1);
  const lower = 1 - (1 - alpha) * fQuantile(1 - g / 2, subjectDf, df2);
  const upper = 1 - (1 - alpha) * fQuantile(g / 2, subjectDf, df2);
  return { value: alpha, lower, upper, level };
}
