import type { AnalyticAnalysis, DesignSummary } from '../analyticResults';
import type { AnalysisId, AnalysisRecord } from '../plan';
import { formatNumber, formatPointsText } from '../inputChecks';
import { presentAnalyses } from '../presentAnalyses';
import type { SelectionModel } from './selectionModel';

const BASIS = { pretest: 'pretest', screener: 'screener', 'true-score': 'judged need (true score, not measured)' } as const;

/** Short names for sentences. */
const SHORT: Record<AnalysisId, string> = {
  matchedDifference: 'the matched difference',
  ancova: 'ANCOVA on the pretest',
  gainScore: 'the gain score',
  correctedAncova: 'the reliability-corrected ANCOVA',
  regressionDiscontinuity: 'regression discontinuity',
  prePostChange: 'the pre–post change',
  personLevelAncova: 'the person-level ANCOVA',
};

/**
 * The rule in plain words: the basis, the side, the cut-off and, for a
 * probability rule, its spread; one-group studies say that only the
 * selected are re-measured.
 * @example sharp cut below 41.6 on the pretest →
 *   "People whose pretest score was below 41.584 were selected (a sharp cut-off)."
 */
export function selectionRuleText(m: SelectionModel): string {
  const d = m.design;
  const basis = BASIS[d.basis];
  const side = d.side === 'below' ? 'below' : 'above';
  const cut = formatNumber(d.cutOff);
  const who =
    d.rule === 'cut-off'
      ? `People whose ${basis} score was ${side} ${cut} were selected (a sharp cut-off).`
      : `People were selected with a probability that ${d.side === 'below' ? 'falls' : 'rises'} smoothly as their ${basis} score rises ` +
        `across ${cut} (half are selected at ${cut}; spread ${formatNumber(d.spread)} points).`;
  return d.shape === 'one-group' ? `${who} Only they are measured again; there is no comparison group.` : who;
}

/**
 * The design summary of a selection plan: the rule in words, what it means
 * for the analyses (derived from their expected estimates: an analysis whose
 * expected estimate equals tau plus the growth gap, within 1e-6 posttest SDs,
 * is free of the regression artefact), the expected share selected and, for a
 * one-group study, the expected change with no programme.
 *
 * Reference: which analysis is unbiased follows the assignment rule (Kenny 1975;
 * Cappelleri, Darlington & Trochim 1994; Barnett, van der Pols & Dobson 2005).
 * @param m the selection model. @param analyses the closed-form records.
 * @param effects tau and growth (outcome.growthGap), points. @param posttestSD the plan's posttest SD (> 0).
 * @returns the DesignSummary.
 * @throws never.
 * @example rule on the pretest → meaning starts "The rule used the pretest itself:"
 */
export function selectionSummary(
  m: SelectionModel,
  analyses: AnalysisRecord<AnalyticAnalysis>,
  effects: { tau: number; growth: number },
  posttestSD: number,
): DesignSummary {
  const d = m.design;
  const free = (a: AnalyticAnalysis): boolean => Math.abs(a.formulaEstimate - effects.tau - effects.growth) <= 1e-6 * posttestSD;
  const growthNote =
    effects.growth !== 0
      ? d.shape === 'one-group'
        ? ` Growth of ${formatPointsText(effects.growth)} points without the programme is part of that change too.`
        : ` The growth gap (${formatPointsText(effects.growth)} points) biases every analysis alike.`
      : '';
  if (d.shape === 'one-group') {
    const a = analyses.prePostChange as AnalyticAnalysis;
    const change = a.formulaEstimate - effects.tau;
    const regression = change - effects.growth;
    return {
      kind: 'selection',
      shape: 'one-group',
      rule: selectionRuleText(m),
      meaning:
        `If the programme did nothing, the selected group would still change by ${formatPointsText(regression)} points on average, ` +
        `from regression toward the mean alone, beside a hoped-for effect of ${formatPointsText(effects.tau)} points.` +
        growthNote +
        ' A pre–post change alone cannot tell the two apart.',
      selectedShare: m.programme.share,
      noProgrammeChange: change,
    };
  }
  // Analyses that cannot be carried out (no overlap to match on) are named in their own sentence, not in these lists.
  const list = presentAnalyses(analyses).filter(([, a]) => a.feasible);
  const unbiased = list.filter(([, a]) => free(a)).map(([id]) => SHORT[id]);
  const biased = list.filter(([, a]) => !free(a)).map(([id]) => SHORT[id]);
  const join = (xs: string[]): string => (xs.length <= 1 ? (xs[0] ?? '') : `${xs.slice(0, -1).join(', ')} and ${xs[xs.length - 1]}`);
  const sharpNote =
    d.basis === 'pretest' && d.rule === 'cut-off'
      ? ' A sharp cut-off on the pretest leaves no overlap: nobody in the comparison group has a programme member\u2019s score, so exact matching is impossible.'
      : '';
  let meaning: string;
  if (d.basis === 'pretest') {
    meaning =
      `The rule used the pretest itself: ${unbiased.length > 0 ? `${join(unbiased)} ${unbiased.length === 1 ? 'is' : 'are'} free of the regression artefact here` : 'no analysis is free of the regression artefact here'}` +
      `${biased.length > 0 ? `; ${join(biased)} ${biased.length === 1 ? 'is' : 'are'} not` : ''}.` +
      sharpNote;
  } else if (d.basis === 'screener') {
    const ancova = analyses.ancova as AnalyticAnalysis;
    const others = biased.filter((x) => x !== SHORT.ancova);
    meaning =
      `The rule used the screener, which this plan does not adjust for: ANCOVA on the pretest is biased (${formatPointsText(ancova.formulaEstimate - effects.tau - effects.growth)} points)` +
      (others.length > 0 ? `, and so ${others.length === 1 ? 'is' : 'are'} ${join(others)}` : '') +
      '; adjusting for the screener (regression discontinuity) is not.';
  } else {
    meaning =
      'Selection used something you did not measure (judged need): every analysis on the pretest is biased' +
      (unbiased.length > 0 ? `, except ${join(unbiased)}.` : '.') +
      ' Write the judgement down as a scored rule to make it adjustable.';
  }
  return {
    kind: 'selection',
    shape: 'two-groups',
    rule: selectionRuleText(m),
    meaning: meaning + growthNote,
    selectedShare: m.programme.share,
    noProgrammeChange: null,
  };
}
