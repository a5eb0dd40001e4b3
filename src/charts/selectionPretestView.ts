import { isSelectionDesign } from '../core/design/studyDesign';
import {
  selectedDensity,
  selectionModel,
  selectionProbabilityGiven,
  SEL_OUTCOME,
  SEL_PRETEST,
} from '../core/design/selectionModel';
import { observedPretestDensity } from '../core/observedPretestDensity';
import type { Plan } from '../core/plan';

/** A curve drawn on the pretest's scale: density per point (already scaled for the picture; see SelectionPretestView). */
export type DensityPoint = { x: number; density: number };

/**
 * The pretest chart of a plan whose groups a rule forms: the population's
 * observed pretest, the rule on it, the selected people's part of it at the
 * pretest, and the same people re-measured with no programme, drifting back
 * toward the population mean. Every figure comes from core's selection model
 * (selectedDensity, selectionProbabilityGiven, the group means); the selected
 * group's curves are drawn as its share of the population (core's group
 * density times core's share), so their area is the share selected.
 */
export interface SelectionPretestView {
  shape: 'two-groups' | 'one-group';
  populationLabel: string;
  programmeLabel: string;
  /** Words for what the rule looked at: "pretest", "screener", "judged need". */
  basisWords: string;
  cutOff: number;
  side: 'below' | 'above';
  /** 'cut-line' when the rule is a sharp cut-off on the pretest itself; else the chance of selection is drawn as a curve. */
  ruleShape: 'cut-line' | 'probability-curve';
  /** Share of the population selected (core). */
  share: number;
  population: DensityPoint[];
  selectedPretest: DensityPoint[];
  selectedRemeasured: DensityPoint[];
  /** P(selected | observed pretest = x), 0 to 1, for the right-hand scale; null with a cut line. */
  probability: { x: number; p: number }[] | null;
  means: { population: number; selectedPretest: number; selectedRemeasured: number };
  /** Largest density on the curves (for the y scale). */
  yMax: number;
  xDomain: [number, number];
}

const GRID = 161;
const BASIS_WORDS = { pretest: 'pretest', screener: 'screener', 'true-score': 'judged need' } as const;

/**
 * The selection view of the pretest chart, or null for existing groups.
 * Pure and deterministic; plotting only (no statistic computed here).
 * @throws Error from core when the plan's rule cannot be modelled (validatePlan rejects such plans first).
 */
export function selectionPretestView(plan: Plan): SelectionPretestView | null {
  if (!isSelectionDesign(plan)) return null;
  const m = selectionModel(plan);
  const pop = m.population;
  const spread = Math.max(pop.observedSD, pop.posttestSD);
  const lo = pop.mean - 3.6 * spread;
  const hi = pop.mean + 3.6 * spread;
  const xs = Array.from({ length: GRID }, (_, i) => lo + ((hi - lo) * i) / (GRID - 1));
  const share = m.programme.share;
  const population = xs.map((x) => ({ x, density: observedPretestDensity(x, pop.mean, pop.observedSD) }));
  const selectedPretest = xs.map((x) => ({ x, density: share * selectedDensity(m, SEL_PRETEST, x, 'programme') }));
  const selectedRemeasured = xs.map((x) => ({ x, density: share * selectedDensity(m, SEL_OUTCOME, x, 'programme') }));
  const sharpOnPretest = m.design.basis === 'pretest' && m.design.spread === 0;
  const probability = sharpOnPretest ? null : xs.map((x) => ({ x, p: selectionProbabilityGiven(m, SEL_PRETEST, x) }));
  let yMax = 0;
  for (const c of [population, selectedPretest, selectedRemeasured]) for (const p of c) yMax = Math.max(yMax, p.density);
  return {
    shape: m.design.shape,
    populationLabel: pop.label,
    programmeLabel: plan.groups.programme.label,
    basisWords: BASIS_WORDS[m.design.basis],
    cutOff: m.design.cutOff,
    side: m.design.side,
    ruleShape: sharpOnPretest ? 'cut-line' : 'probability-curve',
    share,
    population,
    selectedPretest,
    selectedRemeasured,
    probability,
    means: {
      population: pop.mean,
      selectedPretest: m.programme.mean[SEL_PRETEST] as number,
      selectedRemeasured: m.programme.mean[SEL_OUTCOME] as number,
    },
    yMax,
    xDomain: [lo, hi],
  };
}
