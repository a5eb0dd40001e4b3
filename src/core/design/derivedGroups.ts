import type { GroupSpec, Plan } from '../plan';
import { formatNumber } from '../inputChecks';
import { selectionModel, SEL_PRETEST } from './selectionModel';

const BASIS_WORDS = { pretest: 'the pretest', screener: 'the screener', 'true-score': 'judged need (true score)' } as const;

/**
 * The two groups a selection rule forms, as GroupSpec for every part of the
 * planner that names or sizes the groups: expected size (rounded), and the
 * observed pretest's mean and SD in each (selectionModel). Labels come from
 * the file when it gives them, else plain defaults that state the rule.
 * @param plan a plan with a selection rule and a population (range-valid).
 * @param labels labels the file gave, if any.
 * @throws Error with a researcher-readable message from selectionModel.
 * @example a cut-off at 41.6 below on the pretest of a population of 20,000
 *   → programme { label: 'Selected: pretest below 41.6', poolSize: 4000, pretestMean: 36.0, … }
 */
export function derivedGroups(plan: Plan, labels: { programme?: string; comparison?: string } | null): { programme: GroupSpec; comparison: GroupSpec } {
  const m = selectionModel(plan);
  const d = m.design;
  const where = `${BASIS_WORDS[d.basis]} ${d.side} ${formatNumber(d.cutOff)}`;
  const group = (g: typeof m.programme, label: string): GroupSpec => ({
    label,
    poolSize: Math.max(2, Math.round(g.n)),
    pretestMean: g.mean[SEL_PRETEST] as number,
    pretestSD: Math.sqrt((g.cov[SEL_PRETEST] as number[])[SEL_PRETEST] as number),
  });
  return {
    programme: group(m.programme, labels?.programme ?? `Selected: ${where}`.slice(0, 80)),
    comparison: group(m.comparison, labels?.comparison ?? (d.shape === 'one-group' ? 'Not selected (not re-measured)' : 'Not selected')),
  };
}
