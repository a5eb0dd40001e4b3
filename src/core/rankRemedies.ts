import type { Remedy } from './analyticResults';
import type { ModelParameters } from './modelParameters';
import type { Plan } from './plan';
import { modelWithPoolSizes, modelWithSem } from './adjustModel';
import { breakEvenReliability } from './breakEvenReliability';
import { deriveModelParameters } from './deriveModelParameters';
import { correctedAncovaEstimate, gainScoreEstimate, matchedDifferenceEstimate } from './expectedEstimate';
import { expectedMatchedShare } from './expectedMatchedShare';
import { shareOfEffect } from './shareOfEffect';

const pts = (x: number): string => `${x >= 0 ? '' : '−'}${Math.abs(x).toFixed(2)}`;
const pct = (x: number): string => `${Math.round(x * 100)}%`;
const rel = (x: number): string => x.toFixed(2);

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
 *
 * @param plan a validated plan.
 * @param model its model parameters (derived from the plan when omitted).
 * @returns six remedies, best first.
 * @throws Error when the plan's inputs contradict each other (as deriveModelParameters).
 * @example demo plan → corrected ANCOVA first (remaining 0), then the more reliable pretest
 */
export function rankRemedies(plan: Plan, model?: ModelParameters): Remedy[] {
  const m = model ?? deriveModelParameters(plan);
  const tau = m.effect;
  const shareOf = (b: number): number | null => shareOfEffect(b, tau);
  const matching = plan.matching;
  const currentShare = expectedMatchedShare(m, matching);
  const matchedBias = matchedDifferenceEstimate(m) - tau;
  const remedies: Remedy[] = [];

  // 1. More reliable pretest: average k parallel forms (SEM / sqrt(k)).
  const be = breakEvenReliability(m, plan.analysis.tolerableBiasShare);
  const k = be.alreadyMet ? 1 : (be.parallelForms ?? 2);
  const mk = modelWithSem(m, m.sem / Math.sqrt(k));
  const biasK = matchedDifferenceEstimate(mk) - tau;
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
    discardedShare: 1 - expectedMatchedShare(mk, matching),
    assumption: 'The forms are parallel (same true score, independent errors of equal size) and the extra testing is feasible.',
  });

  // 2. Reliability-corrected ANCOVA with the true pooled reliability.
  const rhoTrue = m.reliability.pooled;
  const biasCorr = correctedAncovaEstimate(m, rhoTrue) - tau;
  const rhoOff = Math.min(1, rhoTrue + 0.05);
  const biasOff = correctedAncovaEstimate(m, rhoOff) - tau;
  remedies.push({
    id: 'corrected-ancova',
    title: 'Reliability-corrected ANCOVA on the full sample',
    summary:
      `With the true within-group reliability (${rel(rhoTrue)}) the artefact is ${pts(biasCorr)} points; ` +
      `it is sensitive to that figure: assuming ${rel(rhoOff)} instead leaves ${pts(biasOff)} points.`,
    remainingBias: biasCorr,
    remainingBiasShare: shareOf(biasCorr),
    discardedShare: 0,
    assumption: 'The within-group reliability is known accurately for these groups, not only for a norm sample.',
  });

  // 3. Gain score.
  const biasGain = gainScoreEstimate(m) - tau;
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
    const share = expectedMatchedShare(m, { ...matching, caliper });
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
  const biasPool = matchedDifferenceEstimate(mPool) - tau;
  const sharePool = expectedMatchedShare(mPool, matching);
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

  const tol = 1e-9 * Math.max(1, Math.abs(tau), Math.abs(matchedBias));
  return remedies.sort((a, b) => {
    const d = Math.abs(a.remainingBias) - Math.abs(b.remainingBias);
    if (Math.abs(d) > tol) return d;
    return (a.discardedShare ?? 0) - (b.discardedShare ?? 0);
  });
}
