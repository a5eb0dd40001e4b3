import type { ModelParameters } from '../modelParameters';
import type { Plan } from '../plan';
import { SEL_OUTCOME, SEL_PRETEST, SEL_TRUE, type SelectedGroup, type SelectionModel } from './selectionModel';

/**
 * ModelParameters for a selection design, filled from the two groups the rule
 * forms, so every consumer of the existing-groups model keeps working:
 * observed pretest means (mean.programme/comparison; under selection these are
 * not the true-score means), observed and true-score SDs within each group,
 * within-group reliabilities as the slope of the true score on the pretest
 * within the group, cov_g(T, X)/var_g(X) (the coefficient Kelley's formula and
 * ANCOVA's attenuation use), and the pooled one Σ n_g cov_g(T, X) / Σ n_g var_g(X),
 * the population's SEM, outcome slope on the
 * true score and residual SD, each group's posttest SD without the programme,
 * the growth gap, the effect in points and the expected group sizes (not
 * rounded; for a one-group study the comparison is the people not selected).
 *
 * Reference: classical test theory (Lord & Novick 1968); the group moments are the
 * selection formulas of selectionModel (Pearson 1903; Aitken 1934).
 * @param m the selection model. @param plan the plan (effect, its scale, growth gap).
 * @returns model parameters (points).
 * @throws never for a valid model.
 *
 * The slope equals var_g(T)/var_g(X) whenever the pretest's errors are
 * independent of the true scores within the group (existing groups; rules on a
 * screener or on the true score). A rule on the pretest selects on its errors
 * too: within the group errors and true scores then correlate negatively, and
 * var_g(T)/var_g(X) can exceed 1 (1.37 for the lowest fifth at reliability .8),
 * while the slope stays the population's reliability (selection on X leaves
 * E[T | X] unchanged). So the slope is reported: it stays in (0, 1].
 * @example lowest fifth on a pretest of SD 10, reliability .8 → reliability.programme 0.8,
 *   n.programme = 0.2 × population
 */
export function selectionModelParameters(m: SelectionModel, plan: Plan): ModelParameters {
  const v = (g: SelectedGroup, a: number): number => (g.cov[a] as number[])[a] as number;
  const P = m.programme;
  const C = m.comparison;
  const sxP = v(P, SEL_PRETEST);
  const sxC = v(C, SEL_PRETEST);
  const tvP = v(P, SEL_TRUE);
  const tvC = v(C, SEL_TRUE);
  const ctxP = (P.cov[SEL_TRUE] as number[])[SEL_PRETEST] as number;
  const ctxC = (C.cov[SEL_TRUE] as number[])[SEL_PRETEST] as number;
  const effect =
    plan.outcome.effectScale === 'points' ? plan.outcome.hypothesisedEffect : plan.outcome.hypothesisedEffect * plan.outcome.posttestSD;
  return {
    mean: { programme: P.mean[SEL_PRETEST] as number, comparison: C.mean[SEL_PRETEST] as number },
    pretestGap: (P.mean[SEL_PRETEST] as number) - (C.mean[SEL_PRETEST] as number),
    observedSD: { programme: Math.sqrt(sxP), comparison: Math.sqrt(sxC) },
    trueSD: { programme: Math.sqrt(tvP), comparison: Math.sqrt(tvC) },
    sem: m.population.sem,
    reliability: { programme: ctxP / sxP, comparison: ctxC / sxC, pooled: (P.n * ctxP + C.n * ctxC) / (P.n * sxP + C.n * sxC) },
    beta: m.population.beta,
    residualSD: m.population.residualSD,
    posttestSD: { programme: Math.sqrt(v(P, SEL_OUTCOME)), comparison: Math.sqrt(v(C, SEL_OUTCOME)) },
    growthGap: plan.outcome.growthGap,
    effect,
    n: { programme: P.n, comparison: C.n },
  };
}
