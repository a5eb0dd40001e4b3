import type { AssignmentBasis, AssignmentRule, MatchingDistance, MatchingMethod, MatchingOrder, Plan, ProvenanceSource, StudyShape } from '../core/plan';
import { MATCHING_WORDS } from '../core/matchingWords';
import { isSelectionDesign, studyDesign } from '../core/design/studyDesign';
import { DEMO_PLAN } from '../io/demoPlan';
import { EXAMPLE_PLANS } from '../io/examplePlans';
import { formatInput } from './format';
import { CALIPER_UNIT_WORDS, DISTANCE_WORDS } from './reportCovariates';

/** Where an input value came from. */
export type InputSource = 'entered' | 'example' | 'pilot data';

/** One row of the assumptions table: an input as the researcher gave it. */
export interface PlanInputRow {
  /** Dotted path in the plan file, e.g. "groups.programme.poolSize". */
  path: string;
  label: string;
  value: string;
  unit: string;
  source: InputSource;
  /** Where the value came from in plain words, when the plan records it (e.g. the pilot file's estimate and n). */
  note?: string;
}

const FROM_PLAN: Record<ProvenanceSource, InputSource> = {
  entered: 'entered',
  example: 'example',
  pilot: 'pilot data',
};

function at(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}

const DESIGN_WORDS: Record<StudyShape, string> = {
  'two-groups': 'two groups compared',
  'one-group': 'one group, measured before and after (no comparison group)',
};
const RULE_WORDS: Record<AssignmentRule, string> = {
  'existing-groups': 'existing groups (no written rule)',
  'cut-off': 'a sharp cut-off',
  probability: 'a chance of selection that changes across the cut-off',
};
const BASIS_WORDS: Record<AssignmentBasis, string> = {
  pretest: 'the pretest',
  screener: 'a separate screening test',
  'true-score': 'staff judgement of real need (true score)',
};

/**
 * Every input of the plan, with its unit and source, in the order of the
 * planner's form. Values are shown as entered (no statistic is computed).
 * Source: the `provenance` map when given; else the plan's own provenance
 * record (`plan.provenance`, e.g. "pilot data" with its note, which is added
 * to the row's label on a line of its own so the PDF shows it); otherwise,
 * when the plan carries the title of the built-in demo or one of the invented
 * example plans, "example" for each value still equal to that example's,
 * else "entered".
 */
export function planInputRows(plan: Plan, provenance?: Partial<Record<string, InputSource>>): PlanInputRow[] {
  const example: Plan | undefined = [DEMO_PLAN, ...EXAMPLE_PLANS.map((e) => e.plan)].find((p) => p.title === plan.title);
  const rows: Omit<PlanInputRow, 'source'>[] = [];
  const add = (path: string, label: string, unit: string, display?: (v: unknown) => string) => {
    const v = at(plan, path);
    if (v === undefined) return;
    rows.push({ path, label, unit, value: display ? display(v) : formatInput(v as number | string | boolean) });
  };
  const selection = isSelectionDesign(plan);
  const oneGroup = studyDesign(plan).shape === 'one-group';
  if (selection) {
    // Who gets the programme: the rule and the population; the groups' sizes and means follow from them
    // (the report's derived table), so only their names are inputs.
    add('design', 'Study design', '', (v) => DESIGN_WORDS[v as StudyShape] ?? String(v));
    add('assignment.rule', 'How people got into the programme', '', (v) => RULE_WORDS[v as AssignmentRule] ?? String(v));
    add('assignment.basis', 'What the rule looked at', '', (v) => BASIS_WORDS[v as AssignmentBasis] ?? String(v));
    add('assignment.cutOff', 'Cut-off', 'pretest points');
    add('assignment.side', 'Who is selected', '', (v) => (v === 'above' ? 'those above the cut-off' : 'those below the cut-off'));
    add('assignment.spread', 'Spread of the chance of selection', 'pretest points');
    add('assignment.screenerReliability', 'Screener reliability (in the population)', 'coefficient, 0–1');
    add('population.label', 'Population: name', '');
    add('population.poolSize', 'Population: people', 'people');
    add('population.pretestMean', 'Population: pretest mean', 'test points');
    add('population.pretestSD', 'Population: pretest SD', 'test points');
    add('groups.programme.label', oneGroup ? 'Selected group: name' : 'Programme group: name', '');
    if (!oneGroup) add('groups.comparison.label', 'Comparison group: name', '');
  } else {
    add('design', 'Study design', '', (v) => DESIGN_WORDS[v as StudyShape] ?? String(v));
    add('assignment.rule', 'How people got into the programme', '', (v) => RULE_WORDS[v as AssignmentRule] ?? String(v));
    for (const g of ['programme', 'comparison'] as const) {
      const name = g === 'programme' ? 'Programme group' : 'Comparison group';
      add(`groups.${g}.label`, `${name}: name`, '');
      add(`groups.${g}.poolSize`, `${name}: people available`, 'people');
      add(`groups.${g}.pretestMean`, `${name}: pretest mean`, 'test points');
      add(`groups.${g}.pretestSD`, `${name}: pretest SD (within group)`, 'test points');
    }
  }
  // People in clusters: the pool sizes above count people.
  add('clusters.size', 'People tested per cluster', 'people');
  add('clusters.pretestICC', 'Pretest ICC (within a group)', 'coefficient, 0–1');
  add('clusters.posttestICC', 'Posttest ICC (comparison group)', 'coefficient, 0–1');
  add('clusters.cohort', 'Who sits the posttest', '', (v) => (v === 'same' ? 'the same people, retested' : 'a new cohort of the same clusters'));
  add('pretest.reliability', 'Pretest reliability (as published)', 'coefficient, 0–1');
  add('pretest.referenceSD', 'SD of the population that reliability was estimated in', 'test points');
  add('pretest.sem', 'Standard error of measurement (SEM)', 'test points');
  add('outcome.posttestSD', selection ? 'Post-test SD (in the population)' : 'Post-test SD (within group)', 'post-test points');
  add('outcome.prePostCorrelation', selection ? 'Pre–post correlation (in the population)' : 'Pre–post correlation (within group)', 'correlation');
  add('outcome.growthGap', oneGroup ? 'Change everyone shows anyway, not due to the programme' : 'Growth gap not due to the programme (δ)', 'post-test points');
  add('outcome.hypothesisedEffect', 'Hoped-for programme effect (τ)', plan.outcome.effectScale === 'sd' ? 'post-test SDs' : 'post-test points');
  add('outcome.effectScale', 'Effect expressed in', '', (v) => (v === 'sd' ? 'post-test SDs (standardised)' : 'post-test points'));
  // A one-group study matches nobody: its matching settings are kept in the file but not listed.
  if (!oneGroup) {
    const clusterLevel = plan.clusters !== undefined && plan.matching.level === 'clusters';
    const methodWords = MATCHING_WORDS.method[plan.matching.distance === undefined || plan.matching.distance === 'pretest' ? 'pretest' : 'distance'];
    add('matching.method', MATCHING_WORDS.methodQuestion(clusterLevel), '', (v) => methodWords[v as MatchingMethod] ?? String(v));
    add('matching.distance', 'Matching distance', '', (v) => DISTANCE_WORDS[v as MatchingDistance] ?? String(v));
    add('matching.level', 'What is matched', '', (v) => (v === 'clusters' ? 'clusters, on their observed pretest means' : 'people, across clusters'));
    add(
      'matching.caliper',
      'Caliper',
      clusterLevel
        ? 'SDs of the cluster means'
        : plan.matching.distance === undefined || plan.matching.distance === 'pretest'
          ? 'SDs of the pooled pretest'
          : CALIPER_UNIT_WORDS[plan.matching.distance],
    );
    add('matching.ratio', MATCHING_WORDS.ratioLabel(clusterLevel), clusterLevel ? 'clusters' : 'people');
    add('matching.replacement', MATCHING_WORDS.replacementQuestion(clusterLevel), '');
    add('matching.order', MATCHING_WORDS.orderQuestion, '', (v) => MATCHING_WORDS.order[v as MatchingOrder] ?? String(v));
  }
  add('analysis.alpha', 'Significance level (two-sided)', 'probability');
  if (!oneGroup) add('analysis.assumedReliability', 'Reliability assumed by the corrected ANCOVA (ρ′)', 'coefficient, 0–1');
  add('analysis.tolerableBiasShare', 'Tolerable artefact, as a share of the effect', 'share');
  add('analysis.targetPower', 'Target power', 'probability');
  add('simulation.replications', 'Simulated studies (replications)', 'count');
  add('simulation.seed', 'Random seed', '');
  return rows.map((r) => {
    const recorded = plan.provenance?.[r.path];
    const given = provenance?.[r.path] ?? (recorded ? FROM_PLAN[recorded.source] : undefined);
    const source: InputSource =
      given ?? (example && JSON.stringify(at(plan, r.path)) === JSON.stringify(at(example, r.path)) ? 'example' : 'entered');
    if (!recorded || recorded.note.trim() === '') return { ...r, source };
    // A reliability estimated from pilot data is not "as published".
    const label = recorded.source === 'pilot' ? r.label.replace(' (as published)', '') : r.label;
    return { ...r, label: `${label}\n${recorded.note}`, source, note: recorded.note };
  });
}
