import type { Remedy } from './analyticResults';
import type { ModelParameters } from './modelParameters';
import type { Plan } from './plan';
import { modelWithPoolSizes, modelWithSem } from './adjustModel';
import { breakEvenReliability } from './breakEvenReliability';
import { deriveModelParameters } from './deriveModelParameters';
import { correctedAncovaEstimate, gainScoreEstimate, matchedDifferenceEstimate } from './expectedEstimate';
import { expectedMatchedShare } from './expectedMatchedShare';
import { formatPointsText } from './inputChecks';
import { shareOfEffect } from './shareOfEffect';
import type { MatchingSpec } from './plan';
import type { CovariateModel } from './multivariate/covariateModel';
import { matchingDistance, usesCovariateModel } from './multivariate/covariateUse';
import { engine } from './engineRegistry';

/** The covariate engine (src/core/engineRegistry.ts), asked for only on the paths of a plan with covariates. */
const covariates = () => engine('covariates');

const pts = formatPointsText;
const pct = (x: number): string => `${Math.round(x * 100)}%`;
const rel = (x: number): string => x.toFixed(2);
const rel3 = (x: number): string => x.toFixed(3);

/** More parallel forms than this is flagged as unrealistic (common practice: few tests have more than 3–4 forms). */
export const MAX_REALISTIC_PARALLEL_FORMS = 4;

/**
 * Design changes that would shrink or remove the regression artefact, ranked
 * by the expected artefact left (|remaining bias|, points), then by the share
 * of the programme pool discarded:
 * - a more reliable pretest (averaged parallel forms up to the break-even
 *   reliability; Spearman 1910, Brown 1910);
 * - reliability-corrected ANCOVA with the true pooled within-group reliability (Porter 1967);
 * - a gain score ((beta − 1)·Delta remains; Lord 1967);
 * - a caliper half or twice as wide, and a comparison pool twice as large:
 *   these change how many programme members find partners
 *   (expectedMatchedShare, approximate) but leave the true-score artefact
 *   unchanged (Cochran & Rubin 1973: matching on a fallible x removes only
 *   about rho of the true-score bias, from memory).
 * Remaining bias includes the growth gap, which no remedy here removes.
 * With covariates (usesCovariateModel) every figure comes from the covariate
 * model for the plan's matching distance, and two remedies may join: matching
 * on all measured covariates (when the plan matches on the pretest alone and
 * measures more), and measuring the unmeasured covariates and matching on
 * them too (when they carry an artefact).
 *
 * @param plan a validated plan.
 * @param model its model parameters (derived from the plan when omitted).
 * @returns six remedies (up to eight with covariates), best first.
 * @throws Error when the plan's inputs contradict each other (as deriveModelParameters).
 * @example demo plan → corrected ANCOVA first (remaining 0), then the more reliable pretest
 */
export function rankRemedies(plan: Plan, model?: ModelParameters): Remedy[] {
  const m = model ?? deriveModelParameters(plan);
  const tau = m.effect;
  const shareOf = (b: number): number | null => shareOfEffect(b, tau);
  const matching = plan.matching;
  // With covariates, the same quantities from the covariate model (plan's distance).
  const cov = usesCovariateModel(plan) ? covariates().deriveCovariateModel(plan, m) : null;
  const distance = matchingDistance(plan);
  const matchedBiasOf = (mm: ModelParameters, cm: CovariateModel | null): number =>
    (cm ? covariates().covariateMatchedEstimate(cm, distance) : matchedDifferenceEstimate(mm)) - tau;
  const matchedShareOf = (mm: ModelParameters, cm: CovariateModel | null, spec: MatchingSpec): number =>
    cm ? covariates().covariateMatchedShare(cm, mm, spec, distance) : expectedMatchedShare(mm, spec);
  const currentShare = matchedShareOf(m, cov, matching);
  const matchedBias = matchedBiasOf(m, cov);
  const remedies: Remedy[] = [];

  // 1. More reliable pretest: average k parallel forms (SEM / sqrt(k)).
  const be = cov
    ? covariates().covariateBreakEven(cov, m, distance, plan.analysis.tolerableBiasShare)
    : breakEvenReliability(m, plan.analysis.tolerableBiasShare);
  const k = be.alreadyMet ? 1 : (be.parallelForms ?? 2);
  const mk = modelWithSem(m, m.sem / Math.sqrt(k));
  const cmk = cov ? covariates().covariateModelWithSem(cov, 0, m.sem / Math.sqrt(k)) : null;
  const biasK = matchedBiasOf(mk, cmk);
  // More than MAX_REALISTIC_PARALLEL_FORMS forms is rarely feasible: say so, and what the feasible number buys.
  let feasibility: string | null = null;
  if (k > MAX_REALISTIC_PARALLEL_FORMS) {
    const kf = MAX_REALISTIC_PARALLEL_FORMS;
    const mf = modelWithSem(m, m.sem / Math.sqrt(kf));
    const cmf = cov ? covariates().covariateModelWithSem(cov, 0, m.sem / Math.sqrt(kf)) : null;
    const biasF = matchedBiasOf(mf, cmf);
    const shareF = shareOf(biasF);
    feasibility =
      `Unrealistic: few tests have more than 3–4 parallel forms, and every extra sitting costs time and goodwill. ` +
      `What is feasible: ${kf} forms raise the within-group reliability to ${rel(mf.reliability.comparison)} and leave ` +
      `${pts(biasF)} points${shareF === null ? '' : ` (${pct(Math.abs(shareF))} of the effect)`}; combine that with another remedy.`;
  }
  remedies.push({
    id: 'more-reliable-pretest',
    title: k === 1 ? 'Keep the pretest: it is reliable enough' : `Average ${k} parallel pretests`,
    summary:
      k === 1
        ? `The current pretest already keeps the matched-difference artefact at ${pts(biasK)} points.`
        : `Averaging ${k} parallel forms raises the comparison group's within-group reliability from ` +
          `${rel(m.reliability.comparison)} to ${rel(mk.reliability.comparison)} and changes the matched-difference ` +
          `artefact from ${pts(matchedBias)} to ${pts(biasK)} points.`,
    remainingBias: biasK,
    remainingBiasShare: shareOf(biasK),
    discardedShare: 1 - matchedShareOf(mk, cmk, matching),
    assumption: 'The forms are parallel (same true score, independent errors of equal size) and the extra testing is feasible.',
    feasibility,
  });

  // 2. Reliability-corrected ANCOVA: what is left at the reliability the researcher assumed,
  // and the pooled within-group reliability it would need to assume to leave nothing.
  const rhoTrue = m.reliability.pooled;
  // An assumed figure equal to the pooled one up to rounding (12 decimals) is taken as that figure.
  const rhoAssumed = Math.abs(plan.analysis.assumedReliability - rhoTrue) < 1e-12 ? rhoTrue : plan.analysis.assumedReliability;
  const corrected = (r: number): number => (cov ? covariates().covariateCorrectedAncovaEstimate(cov, r) : correctedAncovaEstimate(m, r));
  const biasCorr = corrected(rhoAssumed) - tau;
  const biasAtTrue = corrected(rhoTrue) - tau;
  remedies.push({
    id: 'corrected-ancova',
    title: 'Reliability-corrected ANCOVA on the full sample',
    summary:
      `At the reliability you assumed (${rel3(rhoAssumed)})${cov ? " and the covariates' stated reliabilities" : ''} the artefact left is ${pts(biasCorr)} points. ` +
      `It would be ${pts(biasAtTrue)} points only if the assumed figure equalled the pooled within-group reliability of these groups, ${rel3(rhoTrue)}: ` +
      'a norm-sample or whole-population reliability is higher than that and leaves an artefact.',
    remainingBias: biasCorr,
    remainingBiasShare: shareOf(biasCorr),
    discardedShare: 0,
    assumption: `The within-group reliability is known accurately for these groups (the correction needs ${rel3(rhoTrue)}), not only for a norm sample.`,
    neededReliability: rhoTrue,
  });

  // 3. Gain score.
  const biasGain = (cov ? covariates().covariateGainScoreEstimate(cov) : gainScoreEstimate(m)) - tau;
  remedies.push({
    id: 'gain-score',
    title: 'Compare gain scores (post-test minus pretest)',
    summary: `With an outcome slope of ${m.beta.toFixed(2)} on the true pretest, the gain-score artefact is ${pts(biasGain)} points.`,
    remainingBias: biasGain,
    remainingBiasShare: shareOf(biasGain),
    discardedShare: 0,
    assumption: 'Both groups would have grown alike without the programme (parallel growth, slope near 1, same scale).',
  });

  // 4–6. Caliper and pool size: the artefact does not move.
  const caliperRemedy = (id: 'tighter-caliper' | 'looser-caliper', factor: number): Remedy => {
    const caliper = matching.caliper * factor;
    const share = matchedShareOf(m, cov, { ...matching, caliper });
    return {
      id,
      title: `${factor < 1 ? 'Tighter' : 'Looser'} caliper (${caliper.toFixed(2)} SD)`,
      summary:
        `About ${pct(1 - share)} of the programme pool would go unmatched (now ${pct(1 - currentShare)}), but the ` +
        `true-score artefact stays at ${pts(matchedBias)} points: no caliper removes regression toward the mean.`,
      remainingBias: matchedBias,
      remainingBiasShare: shareOf(matchedBias),
      discardedShare: 1 - share,
      assumption: 'Matching on the observed pretest; approximate matched share (the simulation gives the exact figure).',
    };
  };
  remedies.push(caliperRemedy('tighter-caliper', 0.5), caliperRemedy('looser-caliper', 2));

  const mPool = modelWithPoolSizes(m, m.n.programme, m.n.comparison * 2);
  const cmPool = cov ? covariates().covariateModelWithPoolSizes(cov, m.n.programme, m.n.comparison * 2) : null;
  const biasPool = matchedBiasOf(mPool, cmPool);
  const sharePool = matchedShareOf(mPool, cmPool, matching);
  remedies.push({
    id: 'larger-pools',
    title: `Double the comparison pool (${m.n.comparison * 2} people)`,
    summary:
      `About ${pct(1 - sharePool)} of the programme pool would go unmatched (now ${pct(1 - currentShare)}), but the ` +
      `true-score artefact stays at ${pts(biasPool)} points.`,
    remainingBias: biasPool,
    remainingBiasShare: shareOf(biasPool),
    discardedShare: 1 - sharePool,
    assumption: 'The extra comparison members come from the same population as the current pool.',
  });

  if (cov) remedies.push(...covariateRemedies(cov, m, matching, distance, matchedBias, shareOf));

  return rankRemedyList(remedies.map(withEstimand), tau, plan.analysis.tolerableBiasShare, m.growthGap);
}

/** Above this share of the programme pool discarded, a remedy's estimate describes too few programme members to rank with the others. */
export const DISCARD_LIMIT = 0.2;

/**
 * The estimand a remedy's estimate describes, stated when it discards
 * programme members: the matched programme members, not the programme.
 */
function withEstimand(r: Remedy): Remedy {
  if (r.discardedShare === null || !(r.discardedShare > 0.005)) return { ...r, estimand: null };
  const kept = 1 - r.discardedShare;
  return {
    ...r,
    estimand:
      `The estimate would describe the matched programme members (about ${pct(kept)} of the programme pool), not the programme as a whole` +
      (r.discardedShare > DISCARD_LIMIT ? `: about ${pct(r.discardedShare)} of the programme pool is discarded.` : '.'),
  };
}

/**
 * Remedies best first, counting the discarded share and realism, not only
 * the artefact left: first those that leave a tolerable artefact, discard at
 * most DISCARD_LIMIT of the programme pool and are realistic; then those that
 * leave a tolerable artefact but discard more or are unrealistic; then the
 * rest. Within each tier, by |remaining artefact| and then by discarded share.
 * Reference: none (this project's ranking rule).
 * @param remedies the remedies. @param tau hoped-for effect, points. @param tolerableShare share of |tau| tolerated.
 * @param growthGap the plan's assumed growth gap, points (left out of the judgement; default 0).
 * @returns a new, sorted array.
 * @throws never.
 * @example a remedy leaving 0 points but discarding 66% ranks after one leaving 0.3 of a 2.5-point effect and discarding 5%
 */
export function rankRemedyList(remedies: Remedy[], tau: number, tolerableShare: number, growthGap = 0): Remedy[] {
  // Judged on the regression artefact each remedy leaves (its remaining bias without the assumed growth
  // gap), as the verdict is: a guessed growth gap that offsets an artefact must not lift a remedy.
  const artefact = (r: Remedy): number => r.remainingBias - growthGap;
  const tolerable = (r: Remedy): boolean => Math.abs(artefact(r)) <= (tau === 0 ? 1e-9 : tolerableShare * Math.abs(tau) + 1e-12);
  const tier = (r: Remedy): number => {
    if (!tolerable(r)) return 2;
    return (r.discardedShare ?? 0) > DISCARD_LIMIT || r.feasibility ? 1 : 0;
  };
  const tol = 1e-9 * Math.max(1, Math.abs(tau));
  return [...remedies].sort((a, b) => {
    const t = tier(a) - tier(b);
    if (t !== 0) return t;
    const d = Math.abs(artefact(a)) - Math.abs(artefact(b));
    if (Math.abs(d) > tol) return d;
    return (a.discardedShare ?? 0) - (b.discardedShare ?? 0);
  });
}

/** The covariate-only remedies: match on all measured covariates; measure the unmeasured ones. */
function covariateRemedies(
  cov: CovariateModel,
  m: ModelParameters,
  matching: MatchingSpec,
  distance: ReturnType<typeof matchingDistance>,
  matchedBias: number,
  shareOf: (b: number) => number | null,
): Remedy[] {
  const tau = cov.effect;
  const out: Remedy[] = [];
  const others = cov.measuredIndices.filter((j) => j > 0 && !cov.exact[j]);
  if (distance === 'pretest' && others.length > 0) {
    const bias = covariates().covariateMatchedEstimate(cov, 'mahalanobis') - tau;
    const caliper = covariates().mahalanobisCaliperSuggestion(cov, m, matching);
    out.push({
      id: 'match-all-measured',
      title: 'Match on all measured covariates (propensity score or Mahalanobis distance)',
      summary:
        `Matching on the pretest together with ${covariates().joinNames(others.map((j) => cov.names[j] as string))} changes the ` +
        `matched-difference artefact from ${pts(matchedBias)} to ${pts(bias)} points; what is left comes from measurement ` +
        `error in the covariates and from anything never measured. ${caliper.note}`,
      remainingBias: bias,
      caliperSuggestion: caliper,
      remainingBiasShare: shareOf(bias),
      discardedShare: 1 - covariates().covariateMatchedShare(cov, m, matching, 'mahalanobis'),
      assumption:
        'Exact matching on all measured covariates (Mahalanobis distance; the propensity score gives the same in expectation when the groups\' covariances are equal); approximate matched share.',
    });
  }
  const hidden = covariates().unmeasuredBias(cov);
  const unmeasured = cov.names.flatMap((name, j) => (cov.measured[j] ? [] : [j]));
  if (unmeasured.length > 0 && Math.abs(hidden) > 1e-9 * Math.max(1, Math.abs(tau))) {
    const all = covariates().covariateModelWithMeasured(cov, unmeasured);
    const d = distance === 'pretest' ? 'mahalanobis' : distance;
    const bias = covariates().covariateMatchedEstimate(all, d) - tau;
    const caliper = distance === 'pretest' ? covariates().mahalanobisCaliperSuggestion(all, m, matching) : null;
    const names = covariates().joinNames(unmeasured.map((j) => cov.names[j] as string));
    out.push({
      id: 'measure-confounders',
      title: `Measure ${names} and match on ${unmeasured.length === 1 ? 'it' : 'them'} too`,
      summary:
        `No analysis of the measured covariates removes the ${pts(hidden)} points carried by ${names}. Measured with ` +
        `the stated reliabilit${unmeasured.length === 1 ? 'y' : 'ies'} and matched on with everything else, the ` +
        `matched-difference artefact would be ${pts(bias)} points (now ${pts(matchedBias)}).` + (caliper ? ` ${caliper.note}` : ''),
      remainingBias: bias,
      ...(caliper ? { caliperSuggestion: caliper } : {}),
      remainingBiasShare: shareOf(bias),
      discardedShare: 1 - covariates().covariateMatchedShare(all, m, matching, d),
      assumption: `${names} can be measured for both groups before the programme starts, with the reliability stated in the plan.`,
    });
  }
  return out;
}
