import type { AnalysisId, AnalysisRecord, Plan } from '../plan';
import type { SensitivityCurve, SensitivityPoint, SensitivityVariable } from '../sensitivityCurve';
import { assertFiniteOutput } from '../assertFiniteOutput';
import { bandCrossings } from '../bandCrossings';
import { normalQuantile } from '../distributions';
import { selectionArtefact } from './selectionEstimates';
import { selectionMatchedFigures } from './selectionMatching';
import { MIN_SELECTED, selectionModel, type SelectionModel } from './selectionModel';
import { modelWith, populationWithSem, withBasis } from './selectionVariants';
import { designAnalysisIds, headlineAnalysisId } from './studyDesign';

/**
 * Expected bias of each of a selection design's analyses as one feature
 * varies, for the sensitivity chart (sensitivityCurve dispatches here):
 * - 'reliability': x is the pretest's reliability in its reference population
 *   (pretest.referenceSD, default the population's SD), 0.3 (or the plan's own, if lower) to 1; the SEM is
 *   referenceSD·sqrt(1 − x) with the reference true-score variance held
 *   (as for existing groups), the population's true scores, the outcome's
 *   slope on them and the cut-off in points stay; a rule on the pretest then
 *   looks at the changed pretest.
 * - 'cutOff': x is the cut-off in points, over the range where each group
 *   keeps at least max(2%, 1.05 × MIN_SELECTED people) of the population (the plan's cut-off always included).
 * - 'screenerReliability': basis 'screener' only; x from 0.3 (or the plan's own, if lower) to 1 (1: the screener measures the true score exactly).
 * - 'pretestGap' does not apply (the gap follows from the rule): a plain error.
 * Bias = expected estimate − tau, growth gap included (selectionArtefact).
 * The matched difference is left out of every point when the plan's rule is a
 * sharp cut-off on the pretest (no overlap at any x). Grid points at which the
 * rule would leave fewer than MIN_SELECTED people in a group are left out.
 * breakEvenX: where the headline analysis (the matched difference, or ANCOVA
 * when it is left out; the pre–post change for one group) reaches the band's edge.
 *
 * Reference: the closed forms of selectionArtefact (Lord 1960; Porter 1967; Barnett et al. 2005).
 * @param plan a validated selection plan. @param variable what varies. @param points grid points (3..1001, checked by the caller).
 * @returns the curve (all numbers finite).
 * @throws Error with a plain message for 'pretestGap', for 'screenerReliability' without a screener,
 *   or when fewer than 2 grid points can be computed.
 * @example lowest fifth on a screener: 'screenerReliability' at x = 1 gives ANCOVA's bias of a rule on
 *   the true score; regression discontinuity stays at 0 throughout
 */
export function selectionSensitivityCurve(plan: Plan, variable: SensitivityVariable, points: number): SensitivityCurve {
  const m = selectionModel(plan);
  const d = m.design;
  const tau = plan.outcome.effectScale === 'points' ? plan.outcome.hypothesisedEffect : plan.outcome.hypothesisedEffect * plan.outcome.posttestSD;
  const growth = plan.outcome.growthGap;
  const rhoA = plan.analysis.assumedReliability;
  const share = plan.analysis.tolerableBiasShare;
  const band = { lower: -share * Math.abs(tau), upper: share * Math.abs(tau) };
  const noOverlap = !selectionMatchedFigures(m).overlap;
  const ids = designAnalysisIds(plan).filter((id) => !(id === 'matchedDifference' && noOverlap));
  const biasOf = (mx: SelectionModel): AnalysisRecord<number> =>
    Object.fromEntries(ids.map((id) => [id, selectionArtefact(id, mx, rhoA) + growth])) as AnalysisRecord<number>;
  const grid = (lo: number, hi: number): number[] =>
    Array.from({ length: points }, (_, i) => (i === points - 1 ? hi : lo + ((hi - lo) * i) / (points - 1)));
  const curve = (xs: number[], modelAt: (x: number) => SelectionModel): SensitivityPoint[] => {
    const out: SensitivityPoint[] = [];
    for (const x of xs) {
      let mx: SelectionModel;
      try {
        mx = modelAt(x);
      } catch {
        continue; // too few people in a group at this x
      }
      out.push({ x, bias: biasOf(mx) });
    }
    if (out.length < 2) {
      throw new Error(
        'This sensitivity curve cannot be drawn: the rule leaves too few people in a group (fewer than ' +
          `${MIN_SELECTED}) almost everywhere along it. Enlarge the population or move the cut-off toward its mean.`,
      );
    }
    return out;
  };

  let xLabel: string;
  let holdsFixed: string;
  let current: number;
  let pts: SensitivityPoint[];
  if (variable === 'pretestGap') {
    throw new Error(
      'In a selection design the pretest gap between the groups is not a setting: it follows from the rule. Vary the cut-off (or a reliability) instead.',
    );
  } else if (variable === 'reliability') {
    const refSD = plan.pretest.referenceSD ?? m.population.observedSD;
    const sem = m.population.sem;
    const trueVarRef = Math.max(refSD * refSD - sem * sem, Number.MIN_VALUE);
    const semAt = (x: number): number => Math.sqrt((trueVarRef * Math.max(0, 1 - x)) / x);
    xLabel = 'Pretest reliability in its reference population';
    holdsFixed = 'Only the pretest’s measurement error changes along the curve: true scores, the rule and the outcome stay fixed, so the observed pretest SD grows as the reliability falls.';
    current = trueVarRef / (trueVarRef + sem * sem);
    pts = curve(grid(Math.min(0.3, current), 1), (x) => modelWith(m, { population: populationWithSem(m.population, semAt(x)) }));
  } else if (variable === 'screenerReliability') {
    if (d.basis !== 'screener') {
      throw new Error('This plan\u2019s rule does not use a screener, so there is no screener reliability to vary.');
    }
    xLabel = 'Screener reliability in the population';
    holdsFixed = 'Only the screener’s measurement error changes along the curve: the pretest, the cut-off and the outcome stay fixed.';
    current = d.screenerReliability as number;
    pts = curve(grid(Math.min(0.3, current), 1), (x) => modelWith(m, withBasis(d, m.population, 'screener', x)));
  } else {
    const q = Math.min(0.5, Math.max(0.02, (1.05 * MIN_SELECTED) / m.population.poolSize));
    const mean = m.population.mean;
    const lo = Math.min(d.cutOff, mean + m.latentSD * normalQuantile(q));
    const hi = Math.max(d.cutOff, q >= 0.5 ? mean : mean + m.latentSD * normalQuantile(1 - q));
    xLabel = 'Cut-off (pretest points)';
    holdsFixed = 'Only the cut-off moves along the curve: the population, the reliabilities and the outcome stay fixed.';
    current = d.cutOff;
    pts = curve(grid(lo, hi), (x) => modelWith(m, { design: { cutOff: x } }));
  }
  const headline: AnalysisId = ids.includes(headlineAnalysisId(plan)) ? headlineAnalysisId(plan) : 'ancova';
  return assertFiniteOutput(
    { variable, xLabel, current, points: pts, effect: tau, tolerableBand: band, breakEvenX: bandCrossings(pts, band, headline), holdsFixed },
    'sensitivity curve',
  );
}
