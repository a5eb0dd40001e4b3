import { ancovaEstimate } from './ancovaEstimate';

const OUT5 = new Float64Array(5);

/**
 * The regression-discontinuity estimate of the programme effect: OLS of the
 * outcome on group and the observed variable the selection rule used (the
 * pretest or a screener), common slope: θ̂ = ΔȲ − b ΔB̄ with b the pooled
 * within-group slope on B (Thistlethwaite & Campbell 1960; Cappelleri,
 * Darlington & Trochim 1994; the linear, global form). When the rule looked
 * only at B (a sharp cut-off, or a probability that depends on B alone)
 * everyone's outcome without the programme has the same linear regression on
 * B in both groups, so the estimate is unbiased apart from a growth gap.
 *
 * SE: the plain OLS SE s·sqrt(1/n_P + 1/n_C + ΔB̄²/Sbb), s² the pooled
 * residual variance, df N − 3. It is the right SE here, unlike for ANCOVA
 * between existing groups: Y given B is normal with the same variance in both
 * groups (selection on B, or on B plus independent noise, leaves the law of Y
 * given B unchanged), which is exactly OLS's assumption. Computed by the same
 * code as ANCOVA (ancovaEstimate's out[3], out[4]) with B as the covariate.
 *
 * @param m Float64Array [nP, meanBP, meanYP, SbbP, SbyP, SyyP, nC, meanBC, meanYC, SbbC, SbyC, SyyC]
 *   (within-group sums of squares and products about the group means).
 * @param out Float64Array(≥ 3) receiving [estimate, SE, df].
 * @returns false (out untouched) when it cannot be computed (fewer than 3 people in a group, no spread in B).
 * @throws never.
 * @example
 *   // P: B̄ 10, Ȳ 12; C: B̄ 12, Ȳ 13; Sbb 10 + 10, Sby 5 + 5 → b = 0.5, estimate −1 + 1 = 0 (hand-worked).
 */
export function regressionDiscontinuityEstimate(m: Float64Array, out: Float64Array): boolean {
  if (!ancovaEstimate(m, 1, OUT5)) return false;
  const se = OUT5[3] as number;
  const df = OUT5[4] as number;
  if (!(se > 0) || !Number.isFinite(se) || !(df >= 1)) return false;
  out[0] = OUT5[0] as number;
  out[1] = se;
  out[2] = df;
  return true;
}
