import { TWO_GROUP_ANALYSIS_IDS, type AnalysisRecord, type Plan } from './plan';
import type { ModelParameters } from './modelParameters';
import { modelWithPretestGap, modelWithSem } from './adjustModel';
import { assertFiniteOutput } from './assertFiniteOutput';
import { breakEvenReliability } from './breakEvenReliability';
import { deriveModelParameters } from './deriveModelParameters';
import { expectedEstimate } from './expectedEstimate';
import { formatNumber } from './inputChecks';
import { covariateModelWithSem } from './multivariate/adjustCovariateModel';
import { covariateExpectedEstimate } from './multivariate/covariateExpectedEstimate';
import { deriveCovariateModel, matchingDistance, usesCovariateModel, type CovariateModel } from './multivariate/covariateModel';
import { bandCrossings } from './bandCrossings';
import { isSelectionDesign, studyDesign } from './design/studyDesign';
import { clusterModelFor } from './clusters/clusterModel';
import { clusterArtefact } from './clusters/clusterEstimates';
import { designAnalysisIds } from './design/studyDesign';
import { selectionSensitivityCurve } from './design/selectionSensitivity';

/** What the sensitivity curve varies. */
export type SensitivityVariable = 'reliability' | 'pretestGap' | 'cutOff' | 'screenerReliability';

/** One point of a sensitivity curve: x and the expected bias (points) of each analysis. */
export interface SensitivityPoint {
  x: number;
  bias: AnalysisRecord<number>;
}

export interface SensitivityCurve {
  variable: SensitivityVariable;
  /** Axis label, plain language. */
  xLabel: string;
  /** The plan's current x. */
  current: number;
  points: SensitivityPoint[];
  /** Hoped-for effect tau, posttest points. */
  effect: number;
  /** Bias band tolerated: ±tolerableBiasShare·|tau|, posttest points. */
  tolerableBand: { lower: number; upper: number };
  /** x values at which the matched-difference artefact reaches the band's edge (growth gap aside); may be empty. */
  breakEvenX: number[];
  /** What the curve holds fixed while x varies, one plain sentence (shown with the chart). */
  holdsFixed: string;
}

/** The reliability axis of existing-groups plans: the same scale as the break-even figure (breakEvenReliability). */
export const WITHIN_GROUP_RELIABILITY_LABEL = 'Within-group pretest reliability (comparison group)';

/** What the reliability curve of existing-groups plans holds fixed. */
export const WITHIN_GROUP_RELIABILITY_FIXED =
  'Only the pretest’s measurement error changes along the curve: true scores, the groups’ true gap and the outcome stay fixed, so the observed pretest SDs grow as the reliability falls.';

/** What the pretest-gap curve holds fixed. */
const GAP_FIXED = 'Only the programme group’s pretest mean moves along the curve: the comparison group, the reliability and the outcome model stay fixed.';

/**
 * Expected bias of each analysis as one design feature varies, for charts.
 *
 * - 'reliability': x is the comparison group's within-group pretest
 *   reliability (the scale of the break-even figure), on a grid from 0.3 to
 *   1. True scores and the outcome model stay fixed; the SEM is
 *   SD_T,C·sqrt((1 − x)/x) (Lord & Novick 1968, from memory), so the
 *   observed SDs change with x (holdsFixed says so).
 * - 'pretestGap': x is the programme-minus-comparison pretest gap, on a grid
 *   symmetric around the current gap (± max(|gap|, pooled pretest SD)).
 * - 'cutOff', 'screenerReliability': selection designs only (see
 *   selectionSensitivityCurve, which also handles 'reliability' for them and
 *   refuses 'pretestGap' with a plain message: the gap follows from the rule).
 *   For existing groups they throw a plain message.
 * Biases are the closed forms of expectedEstimate (Thorndike 1942; Lord 1960;
 * Porter 1967). Pure and deterministic.
 *
 * @param plan a validated plan.
 * @param variable 'reliability' | 'pretestGap' | 'cutOff' | 'screenerReliability'.
 * @param points grid points (integer 3..1001; default 41).
 * @returns the curve, band and break-even x values (all finite).
 * @throws Error when points is out of range or the plan's inputs contradict each other.
 * @example demo plan, 'reliability': at x = 1 the matched-difference bias is 0,
 *   at x = 0.75 it is −2 points; break-even x = 0.921875 (= breakEven.reliability)
 */
export function sensitivityCurve(plan: Plan, variable: SensitivityVariable, points = 41): SensitivityCurve {
  if (!Number.isInteger(points) || points < 3 || points > 1001) {
    throw new Error(`The number of curve points must be a whole number from 3 to 1001; got ${formatNumber(points)}.`);
  }
  if (isSelectionDesign(plan)) return selectionSensitivityCurve(plan, variable, points);
  if (variable === 'cutOff' || variable === 'screenerReliability') {
    throw new Error(
      `This plan's groups already existed, so it has no ${variable === 'cutOff' ? 'cut-off' : 'screener'} to vary: vary the pretest reliability or the pretest gap instead.`,
    );
  }
  const m = deriveModelParameters(plan);
  const tau = m.effect;
  const share = plan.analysis.tolerableBiasShare;
  const rhoA = plan.analysis.assumedReliability;
  const design = studyDesign(plan);
  if (design.kind === 'clusters') {
    // Clusters: each point re-runs the clusters model with the changed SEM or gap; points where
    // the ICC would contradict the changed reliability are left out.
    const ids = designAnalysisIds(plan);
    // x is the comparison group's within-group reliability (the break-even's scale): SEM² = trueVar_C (1 − x)/x.
    const trueVarC = Math.max(m.trueSD.comparison ** 2, Number.MIN_VALUE);
    const reliability = variable === 'reliability';
    const pooledSD = Math.sqrt((m.observedSD.programme ** 2 + m.observedSD.comparison ** 2) / 2);
    const w = Math.max(Math.abs(m.pretestGap), pooledSD);
    const xs = reliability
      ? Array.from({ length: points }, (_, i) => (i === points - 1 ? 1 : 0.3 + (0.7 * i) / (points - 1)))
      : Array.from({ length: points }, (_, i) => m.pretestGap - w + (2 * w * i) / (points - 1));
    const pts: SensitivityPoint[] = [];
    for (const x of xs) {
      const mx = reliability ? modelWithSem(m, Math.sqrt((trueVarC * Math.max(0, 1 - x)) / x)) : modelWithPretestGap(m, x);
      try {
        const cm = clusterModelFor(design, mx);
        pts.push({ x, bias: Object.fromEntries(ids.map((id) => [id, m.growthGap + clusterArtefact(id, cm)])) as AnalysisRecord<number> });
      } catch {
        // An ICC the changed pretest cannot carry: no point here.
      }
    }
    const band = { lower: -share * Math.abs(tau), upper: share * Math.abs(tau) };
    return assertFiniteOutput(
      {
        variable,
        xLabel: reliability ? WITHIN_GROUP_RELIABILITY_LABEL : 'Pretest gap, programme minus comparison (points)',
        current: reliability ? m.reliability.comparison : m.pretestGap,
        points: pts,
        effect: tau,
        tolerableBand: band,
        breakEvenX: bandCrossings(pts, band),
        holdsFixed: reliability ? WITHIN_GROUP_RELIABILITY_FIXED : GAP_FIXED,
      },
      'sensitivity curve',
    );
  }
  const biasOf = (mx: ModelParameters): AnalysisRecord<number> =>
    Object.fromEntries(TWO_GROUP_ANALYSIS_IDS.map((id) => [id, expectedEstimate(id, mx, rhoA) - tau])) as AnalysisRecord<number>;
  // With covariates (or a propensity / Mahalanobis distance) every point comes from the
  // several-covariate closed form, with the pretest's SEM or gap changed in that model.
  const cm = usesCovariateModel(plan) ? deriveCovariateModel(plan, m) : null;
  const distance = matchingDistance(plan);
  const covariateBiasOf = (c: CovariateModel): AnalysisRecord<number> =>
    Object.fromEntries(TWO_GROUP_ANALYSIS_IDS.map((id) => [id, covariateExpectedEstimate(id, c, distance, rhoA) - tau])) as AnalysisRecord<number>;
  const grid = (lo: number, hi: number): number[] =>
    Array.from({ length: points }, (_, i) => (i === points - 1 ? hi : lo + ((hi - lo) * i) / (points - 1)));

  let result: SensitivityCurve;
  const band = { lower: -share * Math.abs(tau), upper: share * Math.abs(tau) };
  if (variable === 'reliability') {
    // A better or worse instrument changes the SEM, not the people: the true-score
    // variance of each group stays fixed. x is the comparison group's within-group
    // reliability, the scale of the break-even figure (breakEvenReliability), so
    // SEM² = trueVar_C (1 − x)/x (Lord & Novick 1968, reliability as true over observed variance).
    const trueVarC = Math.max(m.trueSD.comparison ** 2, Number.MIN_VALUE);
    const semAt = (x: number): number => Math.sqrt((trueVarC * Math.max(0, 1 - x)) / x);
    const be = breakEvenReliability(m, share);
    const breakEvenX: number[] = [];
    if (cm) {
      const pts = grid(0.3, 1).map((x) => ({ x, bias: covariateBiasOf(covariateModelWithSem(cm, 0, semAt(x))) }));
      return assertFiniteOutput(
        {
          variable,
          xLabel: WITHIN_GROUP_RELIABILITY_LABEL,
          current: m.reliability.comparison,
          points: pts,
          effect: tau,
          tolerableBand: band,
          breakEvenX: bandCrossings(pts, band),
          holdsFixed: WITHIN_GROUP_RELIABILITY_FIXED,
        },
        'sensitivity curve',
      );
    }
    if (be.reliability !== null && be.reliability > 0 && be.reliability <= 1) breakEvenX.push(be.reliability);
    result = {
      variable,
      xLabel: WITHIN_GROUP_RELIABILITY_LABEL,
      current: m.reliability.comparison,
      points: grid(0.3, 1).map((x) => ({ x, bias: biasOf(modelWithSem(m, semAt(x))) })),
      effect: tau,
      tolerableBand: band,
      breakEvenX,
      holdsFixed: WITHIN_GROUP_RELIABILITY_FIXED,
    };
  } else {
    const pooledSD = Math.sqrt((m.observedSD.programme ** 2 + m.observedSD.comparison ** 2) / 2);
    const w = Math.max(Math.abs(m.pretestGap), pooledSD);
    if (cm) {
      const pts = grid(m.pretestGap - w, m.pretestGap + w).map((x) => ({ x, bias: covariateBiasOf(covariateModelWithPretestGap(cm, x)) }));
      return assertFiniteOutput(
        {
          variable,
          xLabel: 'Pretest gap, programme minus comparison (points)',
          current: m.pretestGap,
          points: pts,
          effect: tau,
          tolerableBand: band,
          breakEvenX: bandCrossings(pts, band),
          holdsFixed: GAP_FIXED,
        },
        'sensitivity curve',
      );
    }
    const slope = m.beta * (1 - m.reliability.comparison);
    const breakEvenX: number[] = [];
    if (tau !== 0 && slope !== 0) {
      const g = (share * Math.abs(tau)) / Math.abs(slope);
      for (const x of [-g, g]) if (x >= m.pretestGap - w && x <= m.pretestGap + w) breakEvenX.push(x);
    }
    result = {
      variable,
      xLabel: 'Pretest gap, programme minus comparison (points)',
      current: m.pretestGap,
      points: grid(m.pretestGap - w, m.pretestGap + w).map((x) => ({ x, bias: biasOf(modelWithPretestGap(m, x)) })),
      effect: tau,
      tolerableBand: band,
      breakEvenX,
      holdsFixed: GAP_FIXED,
    };
  }
  return assertFiniteOutput(result, 'sensitivity curve');
}

/**
 * The covariate model with the pretest's group gap set to `gap` (programme
 * minus comparison, points), the comparison mean held: only the programme
 * mean of variable 0 moves. Covariances, slopes and the other gaps stay.
 */
function covariateModelWithPretestGap(cm: CovariateModel, gap: number): CovariateModel {
  const programme = [...cm.mean.programme];
  programme[0] = (cm.mean.comparison[0] as number) + gap;
  const gaps = [...cm.gap];
  gaps[0] = gap;
  return { ...cm, mean: { programme, comparison: cm.mean.comparison }, gap: gaps };
}
