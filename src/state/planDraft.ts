import type {
  AssignmentBasis,
  AssignmentRule,
  ClusterCohort,
  EffectScale,
  MatchingLevel,
  MatchingDistance,
  MatchingMethod,
  MatchingOrder,
  Plan,
  SelectionSide,
  StudyShape,
} from '../core/plan';
import { derivedGroups } from '../core/design/derivedGroups';
import { covariatesToCandidate, covariatesToDraft, isCovariatesPart, type CovariateDraft } from './covariateDraft';

/**
 * The plan as the researcher typed it. Every numeric field is kept as the raw
 * text from its input box, so an invalid or half-typed value ("0.", "1.4",
 * "abc") is never replaced or erased; only a valid draft becomes a Plan.
 * Field paths are the Plan's dotted paths ("pretest.reliability").
 */
export interface GroupDraft {
  label: string;
  poolSize: string;
  pretestMean: string;
  pretestSD: string;
}

/** Whether the pretest's precision is given as a reliability or as an SEM. */
export type PretestMode = 'reliability' | 'sem';

/**
 * Who gets the programme, as typed. Every field is kept whatever the rule, so
 * switching the rule or the design and back restores what was typed; only the
 * fields the chosen rule reads go into the plan.
 */
export interface AssignmentDraft {
  rule: AssignmentRule;
  basis: AssignmentBasis;
  cutOff: string;
  side: SelectionSide;
  /** Read with rule 'probability' only. */
  spread: string;
  /** Read with basis 'screener' only. */
  screenerReliability: string;
}

/** The one population a rule picks from, as typed (read when a rule forms the groups). */
export type PopulationDraft = GroupDraft;

/**
 * People in clusters, as typed. Kept whatever the switch says, so turning
 * clusters off and on again restores what was typed; read only when
 * `inClusters` is on and the groups are existing groups.
 */
export interface ClusterDraft {
  /** Whether people are sampled in clusters (schools, classes, clinics). */
  inClusters: boolean;
  /** People tested per cluster. */
  size: string;
  pretestICC: string;
  /** Empty = the pretest ICC (the plan then omits it). */
  posttestICC: string;
  cohort: ClusterCohort;
}

export interface PlanDraft {
  title: string;
  groups: { programme: GroupDraft; comparison: GroupDraft };
  /** Two groups compared, or one group re-measured. */
  design: StudyShape;
  assignment: AssignmentDraft;
  population: PopulationDraft;
  /**
   * Names for the groups a rule forms; empty = the plain default that states
   * the rule ("Selected: the screener below 85"). Kept apart from the two
   * existing groups' names, so switching back restores those.
   */
  selectionLabels: { programme: string; comparison: string };
  pretest: { mode: PretestMode; reliability: string; referenceSD: string; sem: string };
  outcome: {
    posttestSD: string;
    prePostCorrelation: string;
    growthGap: string;
    hypothesisedEffect: string;
    effectScale: EffectScale;
  };
  matching: {
    method: MatchingMethod;
    caliper: string;
    ratio: string;
    replacement: boolean;
    order: MatchingOrder;
    /** What matching measures closeness on; 'pretest' is left out of the plan (the default). */
    distance: MatchingDistance;
    /** With clusters: match whole clusters on their means, or people across clusters (written only with clusters). */
    level: MatchingLevel;
  };
  analysis: { alpha: string; assumedReliability: string; tolerableBiasShare: string; targetPower: string };
  simulation: { replications: string; seed: string };
  /** Covariates beyond the pretest, as typed (see covariateDraft.ts); empty = none. */
  covariates: CovariateDraft[];
  /** Their observed correlation matrix as typed, pretest first: (1 + k) × (1 + k) texts. */
  covariateCorrelations: string[][];
  /** People in clusters, as typed (see ClusterDraft). */
  clusters: ClusterDraft;
}

/** A problem with one field (dotted path, or '' for the plan as a whole). */
export interface FieldProblem {
  field: string;
  message: string;
}

const str = (v: number | undefined): string => (v === undefined || !Number.isFinite(v) ? '' : String(v));

/** The assignment, population and group names of a draft for a plan that says nothing about them (existing groups). */
export function emptySelectionDraft(): Pick<PlanDraft, 'design' | 'assignment' | 'population' | 'selectionLabels'> {
  return {
    design: 'two-groups',
    assignment: { rule: 'existing-groups', basis: 'pretest', cutOff: '', side: 'below', spread: '', screenerReliability: '' },
    population: { label: '', poolSize: '', pretestMean: '', pretestSD: '' },
    selectionLabels: { programme: '', comparison: '' },
  };
}

/** The clusters part of a draft for a plan without clusters (switched off, nothing typed). */
export function emptyClusterDraft(): ClusterDraft {
  // Same people and (the plan's default) people matched across clusters: a combination that is valid as it stands.
  return { inClusters: false, size: '', pretestICC: '', posttestICC: '', cohort: 'same' };
}

/**
 * Whether a draft's people sit in clusters that go into the plan: the switch
 * is on and the groups are existing groups (a rule or a one-group study sets
 * the clusters aside, kept in the draft). Covariates and a multivariate
 * distance are then set aside too (they cannot yet be combined with clusters).
 */
export function draftUsesClusters(draft: Pick<PlanDraft, 'design' | 'assignment' | 'clusters'>): boolean {
  return draft.clusters.inClusters && !draftUsesSelection(draft);
}

/**
 * Whether a draft forms its groups by a rule (or re-measures one group):
 * then the population replaces the two groups, and covariates and a
 * multivariate matching distance are set aside (kept in the draft, left out of the plan).
 */
export function draftUsesSelection(draft: Pick<PlanDraft, 'design' | 'assignment'>): boolean {
  return draft.design === 'one-group' || draft.assignment.rule !== 'existing-groups';
}

/** The selection part of the draft that shows a plan exactly. */
function selectionToDraft(plan: Plan): Pick<PlanDraft, 'design' | 'assignment' | 'population' | 'selectionLabels'> {
  const empty = emptySelectionDraft();
  const a = plan.assignment;
  const pop = plan.population;
  const selection = (plan.design ?? 'two-groups') === 'one-group' || (a !== undefined && a.rule !== 'existing-groups');
  // Group names equal to the rule's defaults are left empty, so they follow the rule when it changes.
  let labels = empty.selectionLabels;
  if (selection && pop) {
    let defaults: { programme: string; comparison: string } | null = null;
    try {
      const d = derivedGroups(plan, null);
      defaults = { programme: d.programme.label, comparison: d.comparison.label };
    } catch {
      defaults = null;
    }
    labels = {
      programme: plan.groups.programme.label === defaults?.programme ? '' : plan.groups.programme.label,
      comparison: plan.groups.comparison.label === defaults?.comparison ? '' : plan.groups.comparison.label,
    };
  }
  return {
    design: plan.design ?? 'two-groups',
    assignment: {
      rule: a?.rule ?? 'existing-groups',
      basis: a?.basis ?? 'pretest',
      cutOff: str(a?.cutOff),
      side: a?.side ?? 'below',
      spread: str(a?.spread),
      screenerReliability: str(a?.screenerReliability),
    },
    population: pop
      ? { label: pop.label, poolSize: str(pop.poolSize), pretestMean: str(pop.pretestMean), pretestSD: str(pop.pretestSD) }
      : empty.population,
    selectionLabels: labels,
  };
}

/** The draft that shows a plan exactly (numbers printed in full, no rounding). */
export function planToDraft(plan: Plan): PlanDraft {
  const g = (x: Plan['groups']['programme']): GroupDraft => ({
    label: x.label,
    poolSize: str(x.poolSize),
    pretestMean: str(x.pretestMean),
    pretestSD: str(x.pretestSD),
  });
  const semMode = plan.pretest.sem !== undefined && plan.pretest.reliability === undefined;
  const selection = selectionToDraft(plan);
  return {
    title: plan.title,
    // A rule's groups are derived, not typed: the two group columns stay empty, ready for existing groups.
    groups:
      selection.design === 'one-group' || selection.assignment.rule !== 'existing-groups'
        ? { programme: emptyGroup(), comparison: emptyGroup() }
        : { programme: g(plan.groups.programme), comparison: g(plan.groups.comparison) },
    ...selection,
    pretest: {
      mode: semMode ? 'sem' : 'reliability',
      reliability: str(plan.pretest.reliability),
      referenceSD: str(plan.pretest.referenceSD),
      sem: str(plan.pretest.sem),
    },
    outcome: {
      posttestSD: str(plan.outcome.posttestSD),
      prePostCorrelation: str(plan.outcome.prePostCorrelation),
      growthGap: str(plan.outcome.growthGap),
      hypothesisedEffect: str(plan.outcome.hypothesisedEffect),
      effectScale: plan.outcome.effectScale,
    },
    matching: {
      method: plan.matching.method,
      caliper: str(plan.matching.caliper),
      ratio: str(plan.matching.ratio),
      replacement: plan.matching.replacement,
      order: plan.matching.order ?? 'random',
      distance: plan.matching.distance ?? 'pretest',
      level: plan.matching.level ?? 'people',
    },
    analysis: {
      alpha: str(plan.analysis.alpha),
      assumedReliability: str(plan.analysis.assumedReliability),
      tolerableBiasShare: str(plan.analysis.tolerableBiasShare),
      targetPower: str(plan.analysis.targetPower),
    },
    simulation: { replications: str(plan.simulation.replications), seed: str(plan.simulation.seed) },
    ...covariatesToDraft(plan),
    clusters: plan.clusters
      ? {
          inClusters: true,
          size: str(plan.clusters.size),
          pretestICC: str(plan.clusters.pretestICC),
          posttestICC: str(plan.clusters.posttestICC),
          cohort: plan.clusters.cohort,
        }
      : emptyClusterDraft(),
  };
}

function emptyGroup(): GroupDraft {
  return { label: '', poolSize: '', pretestMean: '', pretestSD: '' };
}

/** Plain names of the numeric fields, used in "must be a number" messages. */
export const FIELD_NAMES: Record<string, string> = {
  title: 'Plan title',
  'groups.programme.label': 'Programme group name',
  'groups.comparison.label': 'Comparison pool name',
  'outcome.effectScale': 'Effect expressed in',
  'matching.method': 'How a partner is chosen',
  'matching.replacement': 'Using a comparison person more than once',
  'matching.order': 'Who picks first',
  'groups.programme.poolSize': 'Programme pool size',
  'groups.programme.pretestMean': 'Programme pretest mean',
  'groups.programme.pretestSD': 'Programme pretest SD',
  'groups.comparison.poolSize': 'Comparison pool size',
  'groups.comparison.pretestMean': 'Comparison pretest mean',
  'groups.comparison.pretestSD': 'Comparison pretest SD',
  design: 'Study design',
  'assignment.rule': 'How people got into the programme',
  'assignment.basis': 'What the rule looked at',
  'assignment.cutOff': 'Cut-off',
  'assignment.side': 'Who is selected',
  'assignment.spread': 'Spread of the chance',
  'assignment.screenerReliability': 'Screener reliability',
  'population.label': 'Population name',
  'population.poolSize': 'Population size',
  'population.pretestMean': 'Pretest mean in the population',
  'population.pretestSD': 'Pretest SD in the population',
  'selectionLabels.programme': 'Programme group name',
  'selectionLabels.comparison': 'Name of the people not selected',
  'clusters.inClusters': 'People sampled in clusters',
  'clusters.size': 'People tested per cluster',
  'clusters.pretestICC': 'Pretest ICC',
  'clusters.posttestICC': 'Posttest ICC',
  'clusters.cohort': 'Who sits the posttest',
  'matching.level': 'What is matched',
  'pretest.reliability': 'Reliability',
  'pretest.referenceSD': 'Reference SD',
  'pretest.sem': 'SEM',
  'outcome.posttestSD': 'Posttest SD',
  'outcome.prePostCorrelation': 'Pre–post correlation',
  'outcome.growthGap': 'Growth gap',
  'outcome.hypothesisedEffect': 'Hypothesised effect',
  'matching.caliper': 'Caliper',
  'matching.ratio': 'Ratio',
  'analysis.alpha': 'Significance level (alpha)',
  'analysis.assumedReliability': 'Assumed reliability',
  'analysis.tolerableBiasShare': 'Tolerable share',
  'analysis.targetPower': 'Target power',
  'simulation.replications': 'Replications',
  'simulation.seed': 'Seed',
};

/** Fields that may be left empty (the plan then omits them). */
const OPTIONAL = new Set(['pretest.referenceSD', 'analysis.targetPower', 'clusters.posttestICC']);

/**
 * Read one numeric text box. Accepts ordinary decimal notation with an
 * optional sign and exponent, and a decimal comma ("0,8") since many
 * researchers type one. Returns a problem message instead of a number when
 * the text is not a number; range checks are left to validatePlan.
 */
export function readNumber(field: string, raw: string, label?: string): { value: number | undefined; problem?: string } {
  const name = label ?? FIELD_NAMES[field] ?? field;
  const text = raw.trim();
  if (text === '') {
    return OPTIONAL.has(field) ? { value: undefined } : { value: undefined, problem: `${name} is required.` };
  }
  const normalised = /^[+-]?\d+,\d+$/.test(text) ? text.replace(',', '.') : text;
  if (!/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(normalised)) {
    return { value: undefined, problem: `${name} must be a number; got "${raw}".` };
  }
  const value = Number(normalised);
  if (!Number.isFinite(value)) return { value: undefined, problem: `${name} is too large; got "${raw}".` };
  return { value };
}

/**
 * Turn a draft into a candidate plan object for validatePlan, collecting
 * "not a number" problems on the way. Fields that could not be read are left
 * out of the candidate (validatePlan may then report them as well; the
 * caller keeps the first message per field).
 */
export function draftToCandidate(draft: PlanDraft): { candidate: unknown; problems: FieldProblem[] } {
  const problems: FieldProblem[] = [];
  const num = (field: string, raw: string): number | undefined => {
    const r = readNumber(field, raw);
    if (r.problem) problems.push({ field, message: r.problem });
    return r.value;
  };
  const group = (key: 'programme' | 'comparison') => {
    const d = draft.groups[key];
    return {
      label: d.label,
      poolSize: num(`groups.${key}.poolSize`, d.poolSize),
      pretestMean: num(`groups.${key}.pretestMean`, d.pretestMean),
      pretestSD: num(`groups.${key}.pretestSD`, d.pretestSD),
    };
  };
  const pretest =
    draft.pretest.mode === 'reliability'
      ? {
          reliability: num('pretest.reliability', draft.pretest.reliability),
          referenceSD: num('pretest.referenceSD', draft.pretest.referenceSD),
        }
      : { sem: num('pretest.sem', draft.pretest.sem) };
  const selection = draftUsesSelection(draft);
  const clustered = draftUsesClusters(draft);
  const candidate = {
    format: 'meanward-plan',
    version: 1,
    title: draft.title,
    // With a rule the groups follow from the population: only names the researcher typed are passed on.
    ...(selection ? selectionCandidate(draft, num) : { groups: { programme: group('programme'), comparison: group('comparison') } }),
    pretest: dropUndefined(pretest),
    outcome: {
      posttestSD: num('outcome.posttestSD', draft.outcome.posttestSD),
      prePostCorrelation: num('outcome.prePostCorrelation', draft.outcome.prePostCorrelation),
      growthGap: num('outcome.growthGap', draft.outcome.growthGap),
      hypothesisedEffect: num('outcome.hypothesisedEffect', draft.outcome.hypothesisedEffect),
      effectScale: draft.outcome.effectScale,
    },
    matching: {
      method: draft.matching.method,
      caliper: num('matching.caliper', draft.matching.caliper),
      ratio: num('matching.ratio', draft.matching.ratio),
      replacement: draft.matching.replacement,
      order: draft.matching.order,
      // The default distance is left out, so a plan without covariates is exactly as before.
      // With a rule, matching is on the pretest alone: a multivariate distance stays in the draft for existing groups.
      // With clusters, matching is on the pretest too (cluster means or people's own scores), and the level is always written.
      ...(!selection && !clustered && draft.matching.distance !== undefined && draft.matching.distance !== 'pretest' ? { distance: draft.matching.distance } : {}),
      ...(clustered ? { level: draft.matching.level } : {}),
    },
    analysis: dropUndefined({
      alpha: num('analysis.alpha', draft.analysis.alpha),
      assumedReliability: num('analysis.assumedReliability', draft.analysis.assumedReliability),
      tolerableBiasShare: num('analysis.tolerableBiasShare', draft.analysis.tolerableBiasShare),
      targetPower: num('analysis.targetPower', draft.analysis.targetPower),
    }),
    simulation: {
      replications: num('simulation.replications', draft.simulation.replications),
      seed: num('simulation.seed', draft.simulation.seed),
    },
    ...(clustered ? { clusters: clustersCandidate(draft.clusters, num) } : {}),
    // Covariates cannot yet be combined with a rule or with clusters: they stay in the draft, out of the plan.
    ...(selection || clustered
      ? {}
      : covariatesToCandidate(draft, (field, raw, label) => {
          const r = readNumber(field, raw, label);
          if (r.problem) problems.push({ field, message: r.problem });
          return r.value;
        })),
  };
  return { candidate, problems };
}

/** The design, rule, population and typed group names of a draft whose groups a rule forms. */
function selectionCandidate(draft: PlanDraft, num: (field: string, raw: string) => number | undefined): Record<string, unknown> {
  const a = draft.assignment;
  const p = draft.population;
  const names = draft.selectionLabels;
  const groups: Record<string, { label: string }> = {};
  if (names.programme.trim() !== '') groups.programme = { label: names.programme };
  if (names.comparison.trim() !== '') groups.comparison = { label: names.comparison };
  return {
    ...(Object.keys(groups).length > 0 ? { groups } : {}),
    // The design is always written with a rule, so a saved plan says plainly which it is.
    design: draft.design,
    assignment: dropUndefined({
      rule: a.rule,
      basis: a.basis,
      cutOff: num('assignment.cutOff', a.cutOff),
      side: a.side,
      spread: a.rule === 'probability' ? num('assignment.spread', a.spread) : undefined,
      screenerReliability: a.basis === 'screener' ? num('assignment.screenerReliability', a.screenerReliability) : undefined,
    }),
    population: {
      label: p.label,
      poolSize: num('population.poolSize', p.poolSize),
      pretestMean: num('population.pretestMean', p.pretestMean),
      pretestSD: num('population.pretestSD', p.pretestSD),
    },
  };
}

/** The clusters section of a draft whose people sit in clusters (an empty posttest ICC is left out: it follows the pretest's). */
function clustersCandidate(c: ClusterDraft, num: (field: string, raw: string) => number | undefined): Record<string, unknown> {
  return dropUndefined({
    size: num('clusters.size', c.size),
    pretestICC: num('clusters.pretestICC', c.pretestICC),
    posttestICC: num('clusters.posttestICC', c.posttestICC),
    cohort: c.cohort,
  });
}

function dropUndefined<T extends Record<string, unknown>>(o: T): Partial<T> {
  const out: Partial<T> = {};
  for (const [k, v] of Object.entries(o)) if (v !== undefined) (out as Record<string, unknown>)[k] = v;
  return out;
}

/** Set one field of a draft by dotted path, returning a new draft (the input is not mutated). */
export function setDraftField(draft: PlanDraft, path: string, value: string | boolean): PlanDraft {
  const next = structuredClone(draft) as unknown as Record<string, unknown>;
  const keys = path.split('.');
  let node: Record<string, unknown> = next;
  for (const k of keys.slice(0, -1)) {
    const child = node[k];
    if (typeof child !== 'object' || child === null) throw new Error(`Unknown plan field "${path}".`);
    node = child as Record<string, unknown>;
  }
  const last = keys[keys.length - 1]!;
  if (!(last in node)) throw new Error(`Unknown plan field "${path}".`);
  const current = node[last];
  if (typeof current !== typeof value) throw new Error(`Plan field "${path}" expects a ${typeof current}.`);
  node[last] = value;
  return next as unknown as PlanDraft;
}

/** Whether a stored object looks like a PlanDraft (used when restoring an autosave). */
export function isPlanDraft(x: unknown): x is PlanDraft {
  if (typeof x !== 'object' || x === null) return false;
  const d = x as Record<string, unknown>;
  const obj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null;
  if (typeof d.title !== 'string' || !obj(d.groups) || !obj(d.pretest) || !obj(d.outcome) || !obj(d.matching)) return false;
  if (!obj(d.analysis) || !obj(d.simulation)) return false;
  const g = d.groups;
  for (const k of ['programme', 'comparison']) {
    const grp = g[k];
    if (!obj(grp)) return false;
    for (const f of ['label', 'poolSize', 'pretestMean', 'pretestSD']) if (typeof grp[f] !== 'string') return false;
  }
  const strings: [Record<string, unknown>, string[]][] = [
    [d.pretest, ['reliability', 'referenceSD', 'sem']],
    [d.outcome, ['posttestSD', 'prePostCorrelation', 'growthGap', 'hypothesisedEffect']],
    [d.matching, ['caliper', 'ratio']],
    [d.analysis, ['alpha', 'assumedReliability', 'tolerableBiasShare', 'targetPower']],
    [d.simulation, ['replications', 'seed']],
  ];
  for (const [o, fs] of strings) for (const f of fs) if (typeof o[f] !== 'string') return false;
  // Drafts saved before covariates existed have no covariate part (withDraftDefaults adds it).
  if ((d.covariates !== undefined || d.covariateCorrelations !== undefined) && !isCovariatesPart(d)) return false;
  if (d.matching.distance !== undefined && typeof d.matching.distance !== 'string') return false;
  // Drafts saved before assignment rules existed have none of these parts (withDraftDefaults adds them).
  const selectionParts = [d.design, d.assignment, d.population, d.selectionLabels];
  if (selectionParts.some((x) => x !== undefined) && !isSelectionPart(d)) return false;
  // Drafts saved before clusters existed have no clusters part and no matching level (withDraftDefaults adds them).
  if (d.clusters !== undefined && !isClustersPart(d.clusters)) return false;
  if (d.matching.level !== undefined && d.matching.level !== 'clusters' && d.matching.level !== 'people') return false;
  return (
    (d.pretest.mode === 'reliability' || d.pretest.mode === 'sem') &&
    (d.outcome.effectScale === 'points' || d.outcome.effectScale === 'sd') &&
    typeof d.matching.replacement === 'boolean' &&
    typeof d.matching.method === 'string' &&
    typeof d.matching.order === 'string'
  );
}

/** Whether a stored draft's design, assignment, population and group names have the right shapes. */
function isSelectionPart(d: Record<string, unknown>): boolean {
  const obj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null;
  const { design, assignment: a, population: p, selectionLabels: l } = d;
  if (design !== 'two-groups' && design !== 'one-group') return false;
  if (!obj(a) || !obj(p) || !obj(l)) return false;
  if (!['existing-groups', 'cut-off', 'probability'].includes(a.rule as string)) return false;
  if (!['pretest', 'screener', 'true-score'].includes(a.basis as string)) return false;
  if (a.side !== 'below' && a.side !== 'above') return false;
  for (const f of ['cutOff', 'spread', 'screenerReliability']) if (typeof a[f] !== 'string') return false;
  for (const f of ['label', 'poolSize', 'pretestMean', 'pretestSD']) if (typeof p[f] !== 'string') return false;
  return typeof l.programme === 'string' && typeof l.comparison === 'string';
}

/** Whether a stored draft's clusters part has the right shape. */
function isClustersPart(c: unknown): boolean {
  if (typeof c !== 'object' || c === null) return false;
  const x = c as Record<string, unknown>;
  if (typeof x.inClusters !== 'boolean' || (x.cohort !== 'same' && x.cohort !== 'new')) return false;
  return ['size', 'pretestICC', 'posttestICC'].every((f) => typeof x[f] === 'string');
}

/**
 * Fill in the parts a draft saved by an earlier version lacks (no covariates,
 * distance "pretest", existing groups); a complete draft is returned unchanged.
 */
export function withDraftDefaults(draft: PlanDraft): PlanDraft {
  const d = draft as Partial<PlanDraft> &
    Omit<PlanDraft, 'covariates' | 'covariateCorrelations' | 'design' | 'assignment' | 'population' | 'selectionLabels' | 'clusters' | 'matching'> & {
      matching: Omit<PlanDraft['matching'], 'distance' | 'level'> & Partial<Pick<PlanDraft['matching'], 'distance' | 'level'>>;
    };
  if (
    d.covariates !== undefined &&
    d.covariateCorrelations !== undefined &&
    d.matching.distance !== undefined &&
    d.matching.level !== undefined &&
    d.clusters !== undefined &&
    d.design !== undefined &&
    d.assignment !== undefined &&
    d.population !== undefined &&
    d.selectionLabels !== undefined
  ) {
    return draft;
  }
  const empty = emptySelectionDraft();
  return {
    ...d,
    matching: { ...d.matching, distance: d.matching.distance ?? 'pretest', level: d.matching.level ?? 'people' },
    covariates: d.covariates ?? [],
    covariateCorrelations: d.covariateCorrelations ?? [['1']],
    design: d.design ?? empty.design,
    assignment: d.assignment ?? empty.assignment,
    population: d.population ?? empty.population,
    selectionLabels: d.selectionLabels ?? empty.selectionLabels,
    clusters: d.clusters ?? emptyClusterDraft(),
  };
}
