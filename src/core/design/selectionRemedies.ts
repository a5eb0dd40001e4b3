import type { Remedy } from '../analyticResults';
import { formatPointsText } from '../inputChecks';
import { shareOfEffect } from '../shareOfEffect';
import { globalLinearDiscontinuity, selectionArtefact } from './selectionEstimates';
import { selectionMatchedFigures } from './selectionMatching';
import type { SelectionModel } from './selectionModel';
import { modelWith, populationWithSem, withBasis } from './selectionVariants';

const pts = formatPointsText;
const rel = (x: number): string => x.toFixed(2);

/** What the selection remedies read from the plan. */
export interface SelectionRemedyInputs {
  /** Hoped-for effect, posttest points. */
  tau: number;
  /** outcome.growthGap, posttest points. */
  growth: number;
  /** Share of |tau| an artefact may reach (≥ 0). */
  tolerableShare: number;
  /** ρ′ of the corrected ANCOVA (only passed through). */
  assumedReliability: number;
}

/** null instead of an exception: a changed design may leave too few people in a group, and is then not offered. */
function attempt<T>(f: () => T): T | null {
  try {
    return f();
  } catch {
    return null;
  }
}

/**
 * Design changes for a selection plan, each computed by re-running the
 * selection model with the change, ranked like rankRemedies (by the expected
 * artefact left, |remaining bias| in points, then the share discarded).
 * Remaining bias includes the growth gap where the change leaves it in place.
 *
 * Two groups:
 * - the rule used the pretest: adjust for it (regression discontinuity, Thistlethwaite & Campbell 1960);
 * - the rule used a screener: record the screener scores and adjust for them;
 * - the rule used judgement (true score): write it down as a scored rule and use it (modelled as a
 *   screener as reliable as the pretest, adjusted for by regression discontinuity);
 * - a more reliable pretest: the average of k parallel forms (k up to 4; Spearman 1910, Brown 1910),
 *   judged on ANCOVA on the pretest.
 * One group (Barnett, van der Pols & Dobson 2005):
 * - select on one measurement and use a second, separate baseline as the pretest (modelled as a
 *   screener as reliable as the pretest): what is left is (beta − 1) times the selected group's
 *   true-score shift, plus growth;
 * - select on and measure from the average of m baseline measurements (m up to 4, the practical limit);
 * - add a comparison group from the same population, such as the people just beyond the cut-off,
 *   analysed by regression discontinuity (with its variance inflation; Goldberger 1972).
 *
 * @param m the plan's selection model. @param inputs tau, growth, tolerable share, ρ′.
 * @returns the remedies, best first (at least one).
 * @throws never for a valid model (a change that cannot be computed is left out).
 * @example lowest fifth on a screener → "Record the screener scores and adjust for them" first (0 left)
 */
export function selectionRemedies(m: SelectionModel, inputs: SelectionRemedyInputs): Remedy[] {
  const { tau, growth } = inputs;
  const share = (b: number): number | null => shareOfEffect(b, tau);
  const tolerable = inputs.tolerableShare * Math.abs(tau);
  const d = m.design;
  const out: Remedy[] = [];
  const push = (r: Omit<Remedy, 'remainingBiasShare'>): void => {
    out.push({ ...r, remainingBiasShare: share(r.remainingBias) });
  };
  const rho = m.population.reliability;

  if (d.shape === 'two-groups') {
    const ancovaNow = selectionArtefact('ancova', m, inputs.assumedReliability) + growth;
    if (d.basis === 'pretest' || d.basis === 'screener') {
      const bias = globalLinearDiscontinuity.expectedArtefact(m) + growth;
      const vif = globalLinearDiscontinuity.precision(m, m.programme.n + m.comparison.n).varianceInflation;
      push(
        d.basis === 'pretest'
          ? {
              id: 'adjust-for-rule-score',
              title: 'Adjust for the pretest the rule used (regression discontinuity)',
              summary:
                `The rule looked only at the pretest, so regressing the posttest on group and the pretest leaves ${pts(bias)} points of bias; ` +
                `its variance is ${vif.toFixed(2)} times that of a randomised study of the same size and split.`,
              remainingBias: bias,
              discardedShare: 0,
              assumption:
                'The cut-off was applied to the pretest exactly as stated, the relation of posttest to pretest is correctly modelled (a straight line here), and nobody\u2019s score was moved to get in or out.',
            }
          : {
              id: 'record-screener',
              title: 'Record the screener scores and adjust for them (regression discontinuity)',
              summary:
                `ANCOVA on the pretest is biased by ${pts(ancovaNow)} points because the rule looked at the screener. ` +
                `Regressing the posttest on group and the screener score leaves ${pts(bias)} points; its variance is ${vif.toFixed(2)} times that of a randomised study of the same size and split.`,
              remainingBias: bias,
              discardedShare: 0,
              assumption:
                'Every screener score is kept, the cut-off was applied to it exactly as stated, its relation to the posttest is correctly modelled (a straight line here), and nobody\u2019s score was moved.',
            },
      );
    } else {
      const scored = attempt(() => {
        const v = withBasis(d, m.population, 'screener', rho);
        return modelWith(m, v);
      });
      if (scored) {
        const bias = globalLinearDiscontinuity.expectedArtefact(scored) + growth;
        const vif = globalLinearDiscontinuity.precision(scored, scored.programme.n + scored.comparison.n).varianceInflation;
        push({
          id: 'scored-rule',
          title: 'Write the judgement down as a scored rule, and use it',
          summary:
            `Judged need is not measured, so every analysis on the pretest stays biased (ANCOVA ${pts(ancovaNow)} points). ` +
            `If staff scored need on a written scale (about as reliable as the pretest, ${rel(rho)}) and the programme took everyone beyond the cut-off on that score, ` +
            `adjusting for the recorded score (regression discontinuity) would leave ${pts(bias)} points, with ${vif.toFixed(2)} times the variance of a randomised study.`,
          remainingBias: bias,
          discardedShare: 0,
          assumption: 'The scored rule is what actually decides who takes part, every score is recorded, and nobody\u2019s score is moved to get them in or out.',
        });
      }
    }
    // A more reliable pretest: judged on ANCOVA on the pretest (the full-sample analysis it changes).
    const atForms = (k: number): SelectionModel | null =>
      attempt(() => modelWith(m, { population: populationWithSem(m.population, m.population.sem / Math.sqrt(k)) }));
    const biasAt = (mk: SelectionModel): number => selectionArtefact('ancova', mk, inputs.assumedReliability) + growth;
    let k = 1;
    if (Math.abs(ancovaNow) > tolerable) {
      k = 4;
      for (let j = 2; j <= 4; j++) {
        const mj = atForms(j);
        if (mj && Math.abs(biasAt(mj)) <= tolerable) {
          k = j;
          break;
        }
      }
    }
    const mk = k === 1 ? m : atForms(k);
    if (mk) {
      const bias = biasAt(mk);
      const matched = selectionMatchedFigures(mk);
      push({
        id: 'more-reliable-pretest',
        title: k === 1 ? 'Keep the pretest: ANCOVA on it is within the tolerable share' : `Average ${k} parallel pretests`,
        summary:
          k === 1
            ? `ANCOVA on the current pretest is expected to be off by ${pts(bias)} points.`
            : `Averaging ${k} parallel forms raises the pretest's reliability in the population from ${rel(rho)} to ${rel(mk.population.reliability)} ` +
              `and changes the ANCOVA bias from ${pts(ancovaNow)} to ${pts(bias)} points` +
              (matched.overlap ? ` (the matched difference: ${pts(matched.artefact + growth)}).` : '.') +
              (d.basis === 'pretest' ? ' The rule then looks at the averaged score.' : ''),
        remainingBias: bias,
        discardedShare: 0,
        assumption: 'The forms are parallel (same true score, independent errors of equal size), the extra testing is feasible, and the cut-off stays where it is.',
      });
    }
  } else {
    const now = selectionArtefact('prePostChange', m, inputs.assumedReliability) + growth;
    if (d.basis === 'pretest') {
      const separate = attempt(() => modelWith(m, withBasis(d, m.population, 'screener', rho)));
      if (separate) {
        const bias = selectionArtefact('prePostChange', separate, inputs.assumedReliability) + growth;
        push({
          id: 'separate-baseline',
          title: 'Select on one measurement; use a second, separate baseline as the pretest',
          summary:
            `Measuring the selected people again before the programme starts, and taking the change from that second baseline, ` +
            `changes the expected change with no programme from ${pts(now)} to ${pts(bias)} points` +
            (growth !== 0 ? ' (growth included).' : '.') +
            ' What is left is regression of the true scores themselves (slope on the true score below 1).',
          remainingBias: bias,
          discardedShare: 0,
          assumption: 'The second baseline has its own, independent measurement error (a separate occasion), and nothing changes scores between the two baselines.',
        });
      }
      const byM = [2, 3, 4].map((mm) => ({
        mm,
        model: attempt(() => modelWith(m, { population: populationWithSem(m.population, m.population.sem / Math.sqrt(mm)) })),
      }));
      const usable = byM.filter((x) => x.model !== null) as { mm: number; model: SelectionModel }[];
      if (usable.length > 0) {
        const bias = (x: { model: SelectionModel }): number => selectionArtefact('prePostChange', x.model, inputs.assumedReliability) + growth;
        const pick = usable.find((x) => Math.abs(bias(x)) <= tolerable) ?? (usable[usable.length - 1] as { mm: number; model: SelectionModel });
        push({
          id: 'average-baselines',
          title: `Select on, and measure change from, the average of ${pick.mm} baseline measurements`,
          summary:
            `Averaging baseline measurements shrinks the measurement error selection picks up: the expected change with no programme is ` +
            usable.map((x) => `${pts(bias(x))} points with ${x.mm}`).join(', ') +
            ` (now ${pts(now)}). Three or four baselines are about the practical limit.`,
          remainingBias: bias(pick),
          discardedShare: 0,
          assumption: 'The baseline measurements are parallel (independent errors of equal size) and taken before anything changes; the cut-off stays where it is.',
        });
      }
    }
    const twoGroups = attempt(() => modelWith(m, { design: { shape: 'two-groups' } }));
    if (twoGroups) {
      const observed = d.basis !== 'true-score';
      const bias = observed ? globalLinearDiscontinuity.expectedArtefact(twoGroups) : selectionArtefact('ancova', twoGroups, inputs.assumedReliability);
      const vif = globalLinearDiscontinuity.precision(twoGroups, twoGroups.programme.n + twoGroups.comparison.n).varianceInflation;
      push({
        id: 'comparison-group',
        title: 'Add a comparison group, such as the people just beyond the cut-off',
        summary: observed
          ? `Measuring the people the rule did not select as well, and regressing the posttest on group and the ${d.basis} score ` +
            `(regression discontinuity), leaves ${pts(bias)} points instead of ${pts(now)}; growth both groups share cancels. ` +
            `Its variance is ${vif.toFixed(2)} times that of a randomised study of the same size and split.`
          : `A comparison group from the same population removes shared growth, but the rule used judged need, which is not measured: ANCOVA on the pretest ` +
            `would still be off by ${pts(bias)} points (now ${pts(now)}). Write the judgement down as a scored rule to make it adjustable.`,
        remainingBias: bias,
        discardedShare: 0,
        assumption: observed
          ? 'The cut-off is applied exactly as stated, the relation of posttest to the selection score is correctly specified (a straight line here), nobody\u2019s score is manipulated to get in or out, and both groups would grow alike.'
          : 'Both groups would grow alike without the programme.',
      });
    }
  }
  const tol = 1e-9 * Math.max(1, Math.abs(tau));
  return out.sort((a, b) => {
    const diff = Math.abs(a.remainingBias) - Math.abs(b.remainingBias);
    if (Math.abs(diff) > tol) return diff;
    return (a.discardedShare ?? 0) - (b.discardedShare ?? 0);
  });
}
