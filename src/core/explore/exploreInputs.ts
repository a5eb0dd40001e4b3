import type { Plan } from '../plan';
import type { ExploreInput } from './exploreTypes';
import { designAnalysisIds, studyDesign } from '../design/studyDesign';
import { PLAN_LIMITS } from '../planSchema';
import { semToReliability } from '../semToReliability';

/**
 * What the design explorer can vary in one plan: for each input, whether it
 * applies to the plan's design, its plain label and unit, the plan's current
 * value, the range the plan file allows (docs/plan-file.md; the explorer keeps
 * strictly inside open bounds) and a sensible first grid.
 */
export interface ExploreInputInfo {
  input: ExploreInput;
  /** Whether the input means something for this plan's design. */
  applies: boolean;
  /** Why not, in plain words, when it does not apply. */
  notApplicableReason?: string;
  /** Plain label, e.g. "Pretest reliability". */
  label: string;
  /** Short label for chart axes and variant names, e.g. "reliability". */
  shortLabel: string;
  /** Unit in plain words ('' for a pure number). */
  unit: string;
  /** Whether values are whole numbers (rounded; pool sizes with clusters to whole clusters). */
  wholeNumber: boolean;
  /** The plan's current value (null when the input does not apply). */
  current: number | null;
  /** The range the explorer accepts (inside the plan file's range). */
  allowed: { min: number; max: number };
  /** A first grid: from, to and steps (includes the current value). */
  defaultRange: { from: number; to: number; steps: number };
  /** What else changes with it, or what is kept, in one or two sentences (shown beside the input). */
  note: string;
}

/** Every input the explorer knows, in the order the page and the CLI list them. */
export const EXPLORE_INPUTS: readonly ExploreInput[] = [
  'reliability',
  'caliper',
  'ratio',
  'programmePool',
  'comparisonPool',
  'groupGap',
  'cutOff',
  'clusterSize',
];

const LABELS: Record<ExploreInput, { label: string; shortLabel: string; unit: string; wholeNumber: boolean }> = {
  reliability: { label: 'Pretest reliability', shortLabel: 'reliability', unit: '', wholeNumber: false },
  caliper: { label: 'Matching caliper', shortLabel: 'caliper', unit: 'SDs', wholeNumber: false },
  ratio: { label: 'Comparison partners per programme member', shortLabel: 'ratio', unit: 'people', wholeNumber: true },
  programmePool: { label: 'Programme pool size', shortLabel: 'programme pool', unit: 'people', wholeNumber: true },
  comparisonPool: { label: 'Comparison pool size', shortLabel: 'comparison pool', unit: 'people', wholeNumber: true },
  groupGap: { label: 'Pretest gap, programme minus comparison', shortLabel: 'group gap', unit: 'points', wholeNumber: false },
  cutOff: { label: 'Cut-off of the selection rule', shortLabel: 'cut-off', unit: 'points', wholeNumber: false },
  clusterSize: { label: 'People per cluster', shortLabel: 'cluster size', unit: 'people', wholeNumber: true },
};

/** The explorer's own bounds for the pretest's reliability, inside the plan file's (0, 1). */
export const EXPLORE_RELIABILITY_BOUNDS = { min: 0.01, max: 0.99 } as const;
/** Cut-offs stay within this many population SDs of the population mean (both groups keep people). */
export const EXPLORE_CUT_OFF_SDS = 3;

/** The SD a plan's reliability refers to: referenceSD, else the population's (selection) or the comparison group's pretest SD. */
function reliabilityReferenceSD(plan: Plan): number {
  if (plan.pretest.referenceSD !== undefined) return plan.pretest.referenceSD;
  if (studyDesign(plan).kind === 'selection' && plan.population !== undefined) return plan.population.pretestSD;
  return plan.groups.comparison.pretestSD;
}

/**
 * The pretest reliability a plan states: its `reliability`, or, when it gives
 * an SEM, 1 − SEM²/SD² at the SD the reliability would refer to (classical
 * test theory, Lord & Novick 1968, ch. 3).
 */
export function planReliability(plan: Plan): number {
  if (plan.pretest.reliability !== undefined) return plan.pretest.reliability;
  return semToReliability(plan.pretest.sem as number, reliabilityReferenceSD(plan));
}

/** Clusters per group of a clusters plan (pool size ÷ cluster size). */
function clusterCounts(plan: Plan): { programme: number; comparison: number } | null {
  const d = studyDesign(plan);
  return d.kind === 'clusters' ? d.clusterCount : null;
}

/** The plan's current value of one input (null when it does not apply). */
export function currentExploreValue(plan: Plan, input: ExploreInput): number | null {
  const d = studyDesign(plan);
  switch (input) {
    case 'reliability':
      return planReliability(plan);
    case 'caliper':
      return plan.matching.caliper;
    case 'ratio':
      return plan.matching.ratio;
    case 'programmePool':
      return d.kind === 'selection' ? null : plan.groups.programme.poolSize;
    case 'comparisonPool':
      return d.kind === 'selection' ? null : plan.groups.comparison.poolSize;
    case 'groupGap':
      return d.kind === 'selection' ? null : plan.groups.programme.pretestMean - plan.groups.comparison.pretestMean;
    case 'cutOff':
      return d.kind === 'selection' ? d.cutOff : null;
    case 'clusterSize':
      return d.kind === 'clusters' ? d.clusterSize.comparison : null;
  }
}

/** Why an input does not apply to this plan, or null when it does. */
function notApplicable(plan: Plan, input: ExploreInput): string | null {
  const d = studyDesign(plan);
  const matches = designAnalysisIds(plan).includes('matchedDifference');
  switch (input) {
    case 'reliability':
      return null;
    case 'caliper':
    case 'ratio':
      return matches ? null : 'This design has no matching (a one-group study compares the selected people with themselves).';
    case 'programmePool':
    case 'comparisonPool':
    case 'groupGap':
      return d.kind === 'selection'
        ? 'With a selection rule the groups follow from the population and the rule; vary the cut-off instead.'
        : null;
    case 'cutOff':
      return d.kind === 'selection' ? null : 'Only a plan whose groups a cut-off rule forms has a cut-off.';
    case 'clusterSize':
      return d.kind === 'clusters' ? null : 'Only a plan whose people sit in clusters has a cluster size.';
  }
}

const roundTo = (x: number, digits: number): number => Number(x.toFixed(digits));

/** The explorer's range for one input (inside the plan file's range). */
function allowedRange(plan: Plan, input: ExploreInput): { min: number; max: number } {
  const L = PLAN_LIMITS;
  switch (input) {
    case 'reliability':
      return { ...EXPLORE_RELIABILITY_BOUNDS };
    case 'caliper':
      return { min: L.caliperMin, max: plan.matching.method === 'random-within-caliper' ? L.randomCaliperMax : L.caliperMax };
    case 'ratio': {
      const counts = clusterCounts(plan);
      const partners = counts !== null && (plan.matching.level ?? 'people') === 'clusters' ? counts.comparison : plan.groups.comparison.poolSize;
      return { min: 1, max: Math.max(1, Math.min(L.ratioMax, partners)) };
    }
    case 'programmePool':
    case 'comparisonPool': {
      const size = plan.clusters?.size;
      if (size !== undefined) return { min: size * L.clustersPerGroupMin, max: Math.floor(L.poolSizeMax / size) * size };
      return { min: L.poolSizeMin, max: L.poolSizeMax };
    }
    case 'groupGap':
      return { min: -L.pointsMax, max: L.pointsMax };
    case 'cutOff': {
      const pop = plan.population;
      if (pop === undefined) return { min: -L.pointsMax, max: L.pointsMax };
      return { min: pop.pretestMean - EXPLORE_CUT_OFF_SDS * pop.pretestSD, max: pop.pretestMean + EXPLORE_CUT_OFF_SDS * pop.pretestSD };
    }
    case 'clusterSize': {
      const counts = clusterCounts(plan);
      const most = counts === null ? L.clusterSizeMax : Math.floor(L.poolSizeMax / Math.max(counts.programme, counts.comparison));
      return { min: L.clusterSizeMin, max: Math.max(L.clusterSizeMin, Math.min(L.clusterSizeMax, most)) };
    }
  }
}

/** A first grid around the current value, inside the allowed range. */
function defaultRange(plan: Plan, input: ExploreInput, current: number, allowed: { min: number; max: number }): { from: number; to: number; steps: number } {
  const clamp = (x: number) => Math.min(allowed.max, Math.max(allowed.min, x));
  const around = (from: number, to: number, steps: number, digits = 2) => ({
    from: roundTo(clamp(Math.min(from, current)), digits),
    to: roundTo(clamp(Math.max(to, current)), digits),
    steps,
  });
  switch (input) {
    case 'reliability':
      return around(0.6, 0.95, 8);
    case 'caliper':
      return (plan.matching.distance ?? 'pretest') === 'mahalanobis' ? around(current / 2, current * 2, 4) : around(0.05, 0.5, 4);
    case 'ratio':
      return { from: 1, to: Math.min(allowed.max, 4), steps: Math.min(allowed.max, 4) };
    case 'programmePool':
    case 'comparisonPool': {
      const unit = plan.clusters?.size ?? 1;
      const r = around(Math.round(current / 2 / unit) * unit, Math.round((current * 2) / unit) * unit, 5, 0);
      return r.from === r.to ? { ...r, to: clamp(r.from + unit * 4) } : r;
    }
    case 'groupGap': {
      const sd = plan.groups.comparison.pretestSD;
      if (current === 0) return around(-sd, sd, 5);
      return around(Math.min(0, current * 1.5), Math.max(0, current * 1.5), 6);
    }
    case 'cutOff': {
      const pop = plan.population as NonNullable<Plan['population']>;
      return around(pop.pretestMean - pop.pretestSD, pop.pretestMean + pop.pretestSD, 5);
    }
    case 'clusterSize':
      return around(Math.max(2, Math.round(current / 2)), current * 2, 4, 0);
  }
}

const NOTES: Record<ExploreInput, string> = {
  reliability:
    "Sets the pretest's reliability (at the SD it refers to); the observed SDs and the pre–post correlation are kept, so the true scores change. " +
    "The corrected ANCOVA keeps the reliability you assumed for it, as when a remedy is applied: it is your assumption, not the test's.",
  caliper: "The caliper's unit is the plan's own (SDs of the pretest, of the logit of the propensity score, or Mahalanobis-distance units).",
  ratio: 'Comparison partners per programme member (whole numbers).',
  programmePool: 'People available for the programme group; with clusters, rounded to whole clusters.',
  comparisonPool: 'People available for the comparison group; with clusters, rounded to whole clusters.',
  groupGap: "Moves the programme group's pretest mean; the comparison group's mean is kept.",
  cutOff: 'Moves the cut-off; the groups (sizes, means and SDs) follow from the population and the rule.',
  clusterSize: 'People tested per cluster; the number of clusters in each pool is kept, so the pool sizes follow.',
};

/**
 * Every explorer input with whether it applies to this plan's design (via
 * studyDesign: caliper and ratio need matching, the pools and the group gap
 * need two existing groups, the cut-off a selection rule, the cluster size
 * clusters), its label, unit, current value, allowed range and first grid.
 * Reference: none (plan reading; ranges from docs/plan-file.md).
 * @param plan a validated plan. @returns one entry per input, in EXPLORE_INPUTS order.
 * @throws never for a validated plan.
 * @example exploreInputs(demoPlan()).find((i) => i.input === 'cutOff')?.applies // false
 */
export function exploreInputs(plan: Plan): ExploreInputInfo[] {
  return EXPLORE_INPUTS.map((input) => {
    const reason = notApplicable(plan, input);
    const allowed = allowedRange(plan, input);
    const current = reason === null ? currentExploreValue(plan, input) : null;
    const base = { input, ...LABELS[input], allowed, note: NOTES[input] };
    if (reason !== null || current === null) {
      return { ...base, applies: false, notApplicableReason: reason ?? 'Not available for this plan.', current: null, defaultRange: { from: allowed.min, to: allowed.max, steps: 2 } };
    }
    return { ...base, applies: true, current, defaultRange: defaultRange(plan, input, current, allowed) };
  });
}

/** The label, unit and whole-number flag of one input (for every plan). */
export function exploreInputWords(input: ExploreInput): { label: string; shortLabel: string; unit: string; wholeNumber: boolean } {
  return LABELS[input];
}

/**
 * The plan with one input set (a new object; the plan is not changed). Not
 * validated: exploreCells validates every variant.
 *  - reliability: pretest.reliability = value (an SEM given instead is
 *    replaced by the reliability; referenceSD kept); the observed SDs, the
 *    pre–post correlation and analysis.assumedReliability are kept;
 *  - caliper, ratio: matching.caliper, matching.ratio;
 *  - programmePool, comparisonPool: groups.<g>.poolSize;
 *  - groupGap: groups.programme.pretestMean = comparison mean + value;
 *  - cutOff: assignment.cutOff (the groups are derived again by validatePlan);
 *  - clusterSize: clusters.size, and each pool = its clusters × the new size.
 * Provenance notes of changed fields are dropped (they no longer describe them).
 * @example withExploreInput(demoPlan(), 'caliper', 0.1).matching.caliper // 0.1
 */
export function withExploreInput(plan: Plan, input: ExploreInput, value: number): Plan {
  const next = structuredClone(plan);
  const dropped: string[] = [];
  switch (input) {
    case 'reliability': {
      const { sem: _sem, ...rest } = next.pretest;
      next.pretest = { ...rest, reliability: value };
      dropped.push('pretest.reliability', 'pretest.sem');
      break;
    }
    case 'caliper':
      next.matching.caliper = value;
      dropped.push('matching.caliper');
      break;
    case 'ratio':
      next.matching.ratio = value;
      dropped.push('matching.ratio');
      break;
    case 'programmePool':
      next.groups.programme.poolSize = value;
      dropped.push('groups.programme.poolSize');
      break;
    case 'comparisonPool':
      next.groups.comparison.poolSize = value;
      dropped.push('groups.comparison.poolSize');
      break;
    case 'groupGap':
      next.groups.programme.pretestMean = next.groups.comparison.pretestMean + value;
      dropped.push('groups.programme.pretestMean');
      break;
    case 'cutOff':
      if (next.assignment !== undefined) next.assignment.cutOff = value;
      dropped.push('assignment.cutOff');
      break;
    case 'clusterSize': {
      const counts = clusterCounts(plan);
      if (next.clusters !== undefined && counts !== null) {
        next.clusters.size = value;
        next.groups.programme.poolSize = counts.programme * value;
        next.groups.comparison.poolSize = counts.comparison * value;
      }
      dropped.push('clusters.size', 'groups.programme.poolSize', 'groups.comparison.poolSize');
      break;
    }
  }
  if (next.provenance !== undefined) {
    next.provenance = Object.fromEntries(Object.entries(next.provenance).filter(([path]) => !dropped.includes(path)));
  }
  return next;
}
