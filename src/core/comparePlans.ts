import type { AnalyticResults, ArtefactVerdict } from './analyticResults';
import type { AnalysisId, Plan } from './plan';
import { analysePlan } from './analysePlan';
import { ANALYSIS_DESCRIPTIONS } from './analysisDescriptions';
import { headlineAnalysisId } from './design/studyDesign';

/** Fewest and most plans one comparison holds. */
export const COMPARE_MIN_PLANS = 2;
export const COMPARE_MAX_PLANS = 6;

/** One candidate plan to compare: a name, the plan, and (optionally) the analysis it relies on. */
export interface CandidatePlan {
  name: string;
  plan: Plan;
  /** Default: the design's headline analysis (headlineAnalysisId). */
  analysisId?: AnalysisId;
}

/** One row of the comparison: the figures of the analysis a candidate plan relies on. */
export interface PlanComparisonRow {
  name: string;
  analysisId: AnalysisId;
  analysisName: string;
  /** The hoped-for effect, posttest points. */
  effect: number;
  /** Expected artefact (expected estimate − effect), posttest points. */
  artefact: number;
  /** artefact / effect; null when the effect is 0. */
  artefactShare: number | null;
  /** The verdict of analysePlan for this analysis. */
  verdict: ArtefactVerdict;
  /** P(significant | no effect, artefact as expected), at the plan's alpha; null when not feasible. */
  falsePositiveRate: number | null;
  alpha: number;
  /** Power with the artefact; null when not feasible. */
  power: number | null;
  /** Power the same design would have with no artefact; null when not feasible. */
  powerWithoutBias: number | null;
  /** Programme members the analysis uses (expected matched count for the matched difference). */
  programmeN: number;
  /** Comparison members the analysis uses. */
  comparisonN: number;
  /** Programme pool size (people). */
  programmePool: number;
  /** Expected share of the programme pool left out of the analysis (0 for full-sample analyses). */
  discardedShare: number;
  /** Whom the estimate describes, one sentence. */
  estimand: string;
}

/**
 * The closed-form figures of two to six candidate plans side by side, one row
 * each, for the analysis each relies on: expected artefact and its share of
 * the effect, false-positive rate, power (with and without the artefact),
 * the programme members used, the share of the programme pool discarded, and
 * the estimand. Every figure is analysePlan's (closed forms; the matched n is
 * the expected matched count for unlimited-pool formulas as analysePlan gives it).
 * @param plans two to six validated plans (names need not be unique).
 * @param analyse the analysis to use (default analysePlan; pass another for planned-procedure figures).
 * @returns one row per plan, in the order given.
 * @throws Error when fewer than two or more than six plans are given, or a plan lacks the analysis named.
 */
export function comparePlans(plans: readonly CandidatePlan[], analyse: (plan: Plan) => AnalyticResults = analysePlan): PlanComparisonRow[] {
  if (plans.length < COMPARE_MIN_PLANS || plans.length > COMPARE_MAX_PLANS) {
    throw new Error(`A comparison holds ${COMPARE_MIN_PLANS} to ${COMPARE_MAX_PLANS} plans; got ${plans.length}.`);
  }
  return plans.map((c) => comparisonRow(c, analyse(c.plan)));
}

/** One candidate's row from its results (see comparePlans). */
export function comparisonRow(c: CandidatePlan, results: AnalyticResults): PlanComparisonRow {
  const id = c.analysisId ?? headlineAnalysisId(c.plan);
  const a = results.analyses[id];
  if (a === undefined) throw new Error(`"${c.name}" has no ${ANALYSIS_DESCRIPTIONS[id].name.toLowerCase()} in its design.`);
  const pool = c.plan.groups.programme.poolSize;
  const discardedShare = id === 'matchedDifference' ? Math.min(1, Math.max(0, 1 - a.nProgramme / pool)) : 0;
  return {
    name: c.name,
    analysisId: id,
    analysisName: a.name,
    effect: results.tau,
    artefact: a.bias,
    artefactShare: a.biasShare,
    verdict: a.verdict,
    falsePositiveRate: a.falsePositiveRate,
    alpha: c.plan.analysis.alpha,
    power: a.power,
    powerWithoutBias: a.powerWithoutBias,
    programmeN: a.nProgramme,
    comparisonN: a.nComparison,
    programmePool: pool,
    discardedShare,
    estimand: estimandText(c.plan, id, discardedShare),
  };
}

/**
 * Whom an analysis' estimate describes, in plain words (common practice:
 * matching that discards programme members estimates the effect for those
 * matched, not for the whole programme group).
 */
export function estimandText(plan: Plan, id: AnalysisId, discardedShare: number): string {
  const programme = plan.groups.programme.label;
  switch (id) {
    case 'matchedDifference':
      return discardedShare > 0.005
        ? `The matched members of "${programme}" (about ${Math.round((1 - discardedShare) * 100)}% of the pool), not the whole group.`
        : `The members of "${programme}" (nearly all find a partner).`;
    case 'regressionDiscontinuity':
      return 'People near the cut-off.';
    case 'prePostChange':
      return `The selected people ("${programme}"), with no comparison group.`;
    default:
      return `All members of "${programme}".`;
  }
}
