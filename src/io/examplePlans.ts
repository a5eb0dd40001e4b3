import type { Plan } from '../core/plan';
import { derivedGroups } from '../core/design/derivedGroups';
import { DEMO_PLAN } from './demoPlan';

/** A built-in example plan with a short name and a one-paragraph description. */
export interface ExamplePlan {
  /** File-name-safe id; the plan is also served as public/examples/<id>.json. */
  id: string;
  name: string;
  description: string;
  plan: Plan;
}

/**
 * INVENTED EXAMPLES: every scenario and number below is made up to show how
 * the artefact behaves; none describes a real study.
 */
const VOLUNTEER_MENTORING: Plan = {
  format: 'meanward-plan',
  version: 1,
  title: 'Invented example: volunteer peer-mentoring for newly qualified nurses, matched on a clinical-knowledge quiz',
  groups: {
    programme: { label: 'Nurses who volunteered', poolSize: 150, pretestMean: 66, pretestSD: 12 },
    comparison: { label: 'Nurses who did not', poolSize: 900, pretestMean: 60, pretestSD: 12 },
  },
  pretest: { reliability: 0.7, referenceSD: 12 },
  outcome: { posttestSD: 12, prePostCorrelation: 0.6, growthGap: 0, hypothesisedEffect: 0.2, effectScale: 'sd' },
  matching: { method: 'nearest', caliper: 0.2, ratio: 2, replacement: false, order: 'random' },
  analysis: { alpha: 0.05, assumedReliability: 0.7, tolerableBiasShare: 0.25, targetPower: 0.8 },
  simulation: { replications: 2000, seed: 41729 },
};

const NO_GAP_BACK_CARE: Plan = {
  format: 'meanward-plan',
  version: 1,
  title: 'Invented example: back-care workshops offered at some depots, no baseline gap between sites',
  groups: {
    programme: { label: 'Staff at workshop depots', poolSize: 240, pretestMean: 32, pretestSD: 8 },
    comparison: { label: 'Staff at other depots', poolSize: 480, pretestMean: 32, pretestSD: 8 },
  },
  pretest: { sem: 3.2 },
  outcome: { posttestSD: 8, prePostCorrelation: 0.55, growthGap: 0, hypothesisedEffect: -2, effectScale: 'points' },
  matching: { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random' },
  analysis: { alpha: 0.05, assumedReliability: 0.84, tolerableBiasShare: 0.25, targetPower: 0.8 },
  simulation: { replications: 2000, seed: 7301 },
};

const GAIN_SCORE_READING: Plan = {
  format: 'meanward-plan',
  version: 1,
  title: 'Invented example: an adult evening reading course, words read correctly per minute on the same passage twice',
  groups: {
    programme: { label: 'Course enrolees', poolSize: 120, pretestMean: 95, pretestSD: 20 },
    comparison: { label: 'Library members not enrolled', poolSize: 600, pretestMean: 115, pretestSD: 20 },
  },
  pretest: { reliability: 0.81, referenceSD: 20 },
  // r * posttestSD / (pretestSD * reliability) = 0.72 * 22.5 / (20 * 0.81) = 1: a true-score
  // slope of 1, the condition under which the gain score is unbiased.
  outcome: { posttestSD: 22.5, prePostCorrelation: 0.72, growthGap: 0, hypothesisedEffect: 5, effectScale: 'points' },
  matching: { method: 'random-within-caliper', caliper: 0.25, ratio: 1, replacement: true, order: 'random' },
  analysis: { alpha: 0.05, assumedReliability: 0.81, tolerableBiasShare: 0.25, targetPower: 0.8 },
  simulation: { replications: 2000, seed: 90210 },
};

/**
 * INVENTED EXAMPLE with several covariates (see docs/covariates.md): prior
 * attainment as the pretest, attendance (reliability .7), a deprivation index,
 * a recorded category matched exactly, and an unmeasured family-engagement
 * confounder.
 */
export const AFTER_SCHOOL_MATHS: Plan = {
  format: 'meanward-plan',
  version: 1,
  title: 'Invented example: an after-school maths club, matched on prior attainment and three more covariates, one confounder unmeasured',
  groups: {
    programme: { label: 'Pupils referred to the club', poolSize: 250, pretestMean: 92, pretestSD: 15 },
    comparison: { label: 'Pupils in the same schools not referred', poolSize: 2000, pretestMean: 100, pretestSD: 15 },
  },
  pretest: { reliability: 0.85, referenceSD: 15 },
  outcome: { posttestSD: 15, prePostCorrelation: 0.7, growthGap: 0, hypothesisedEffect: 3, effectScale: 'points' },
  matching: { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random', distance: 'propensity' },
  analysis: { alpha: 0.05, assumedReliability: 0.85, tolerableBiasShare: 0.25, targetPower: 0.8 },
  simulation: { replications: 1000, seed: 5150 },
  covariates: [
    // Share of school sessions attended last year, per cent; registers are kept loosely.
    { name: 'Attendance', programmeMean: 88, comparisonMean: 92, sd: 8, reliability: 0.7, outcomeCorrelation: 0.3, measured: true, exact: false },
    // Neighbourhood deprivation index of the home postcode, 0 to 10.
    { name: 'Deprivation index', programmeMean: 6.5, comparisonMean: 5, sd: 2, reliability: 0.9, outcomeCorrelation: -0.3, measured: true, exact: false },
    // Recorded sex, 1 for girls: recorded without error and matched exactly.
    { name: 'Recorded sex (girl)', programmeMean: 0.45, comparisonMean: 0.5, sd: 0.5, reliability: 1, outcomeCorrelation: 0.05, measured: true, exact: true },
    // How much the family supports homework: known to matter, never recorded.
    { name: 'Family engagement', programmeMean: 4.2, comparisonMean: 5.8, sd: 2, reliability: 0.8, outcomeCorrelation: 0.4, measured: false, exact: false },
  ],
  covariateCorrelations: [
    [1, 0.35, -0.35, 0.05, 0.3],
    [0.35, 1, -0.25, 0, 0.2],
    [-0.35, -0.25, 1, 0, -0.2],
    [0.05, 0, 0, 1, 0.05],
    [0.3, 0.2, -0.2, 0.05, 1],
  ],
};

/**
 * A plan whose groups a rule forms: the groups are the ones core derives from
 * the population and the rule (as validatePlan would), with the given names.
 */
function withRuleGroups(plan: Omit<Plan, 'groups'>, labels: { programme: string; comparison?: string }): Plan {
  const base = plan as Plan;
  return { ...base, groups: derivedGroups(base, labels) };
}

/**
 * INVENTED EXAMPLE of a rule on a separate screener: pupils whose autumn
 * screening score falls below 85 get reading support; the screener
 * (reliability .7) is less reliable than the pretest the evaluation uses (.85).
 */
export const SCREENED_READING_SUPPORT: Plan = withRuleGroups(
  {
    format: 'meanward-plan',
    version: 1,
    title: 'Invented example: reading support for pupils below a cut-off on a short screening test',
    design: 'two-groups',
    assignment: { rule: 'cut-off', basis: 'screener', cutOff: 85, side: 'below', screenerReliability: 0.7 },
    population: { label: 'Year 2 pupils in the district', poolSize: 3000, pretestMean: 100, pretestSD: 15 },
    pretest: { reliability: 0.85, referenceSD: 15 },
    outcome: { posttestSD: 15, prePostCorrelation: 0.7, growthGap: 0, hypothesisedEffect: 4, effectScale: 'points' },
    matching: { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random' },
    analysis: { alpha: 0.05, assumedReliability: 0.85, tolerableBiasShare: 0.25, targetPower: 0.8 },
    simulation: { replications: 1000, seed: 2718 },
  },
  { programme: 'Pupils given reading support', comparison: 'Pupils not selected' },
);

/**
 * INVENTED EXAMPLE of a one-group study: clinic patients whose blood-pressure
 * reading was above 150 mmHg are invited to a lifestyle course and measured
 * again afterwards; one reading has reliability about .7.
 */
export const CLINIC_HIGH_READINGS: Plan = withRuleGroups(
  {
    format: 'meanward-plan',
    version: 1,
    title: 'Invented example: a lifestyle course for clinic patients picked for high blood-pressure readings, re-measured with no comparison group',
    design: 'one-group',
    assignment: { rule: 'cut-off', basis: 'pretest', cutOff: 150, side: 'above' },
    population: { label: 'Adults seen at the health-check clinic', poolSize: 5000, pretestMean: 130, pretestSD: 16 },
    pretest: { reliability: 0.7, referenceSD: 16 },
    outcome: { posttestSD: 16, prePostCorrelation: 0.6, growthGap: 0, hypothesisedEffect: -5, effectScale: 'points' },
    matching: { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random' },
    analysis: { alpha: 0.05, assumedReliability: 0.7, tolerableBiasShare: 0.25, targetPower: 0.8 },
    simulation: { replications: 1000, seed: 1618 },
  },
  { programme: 'Patients invited to the course' },
);

/**
 * Invented: schools that took up a reading programme, matched to comparison
 * schools on last year's mean score. 25 pupils tested per school, ICC about
 * .2, programme schools lower; this year's pupils (a new cohort) sit the
 * posttest, so a school's mean from last year measures what predicts this
 * year's with reliability ICC(2) = .86 whatever the test's own reliability.
 */
export const SCHOOLS_MATCHED_ON_MEANS: Plan = {
  format: 'meanward-plan',
  version: 1,
  title: 'Invented example: a reading programme in 30 schools, matched to comparison schools on last year\u2019s mean score',
  groups: {
    programme: { label: 'Programme schools', poolSize: 750, pretestMean: 92, pretestSD: 15 },
    comparison: { label: 'Comparison schools', poolSize: 2000, pretestMean: 100, pretestSD: 15 },
  },
  pretest: { reliability: 0.8, referenceSD: 15 },
  outcome: { posttestSD: 15, prePostCorrelation: 0.8, growthGap: 0, hypothesisedEffect: 4, effectScale: 'points' },
  matching: { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random', level: 'clusters' },
  analysis: { alpha: 0.05, assumedReliability: 0.8, tolerableBiasShare: 0.25, targetPower: 0.8 },
  simulation: { replications: 1000, seed: 2025 },
  clusters: { size: 25, pretestICC: 0.2, posttestICC: 0.25, cohort: 'new' },
};

/** The built-in examples, the demo first. Callers must copy a plan before changing it. */
export const EXAMPLE_PLANS: readonly ExamplePlan[] = [
  {
    id: 'demo-falls-prevention',
    name: 'Falls prevention (demo)',
    description:
      'Invented. People referred to exercise classes start one SD lower on a balance score; matching on a pretest of reliability .75 leaves them lower in true balance, so the artefact hides most of a 2.5-point benefit.',
    plan: DEMO_PLAN,
  },
  {
    id: 'volunteer-mentoring',
    name: 'Volunteers start higher',
    description:
      'Invented. Nurses who volunteer for mentoring already score higher; after matching they are still higher in true knowledge, so the artefact inflates the effect and a programme that does nothing can look helpful.',
    plan: VOLUNTEER_MENTORING,
  },
  {
    id: 'no-gap-back-care',
    name: 'No baseline gap',
    description:
      'Invented. Workshop and comparison depots have the same mean disability score, so matching on a fallible pretest produces no regression artefact: every analysis is unbiased and the choice is about precision.',
    plan: NO_GAP_BACK_CARE,
  },
  {
    id: 'gain-score-reading',
    name: 'Gain score fits',
    description:
      'Invented. The same reading passage before and after, and everyone improves alike (true-score slope 1): the gain score is unbiased while matching and ANCOVA on the fallible pretest are not.',
    plan: GAIN_SCORE_READING,
  },
  {
    id: 'after-school-maths',
    name: 'Several covariates, one unmeasured',
    description:
      'Invented. Pupils referred to a maths club start lower on prior attainment, attend less and live in more deprived areas; matching on a propensity score of the four measured covariates leaves their measurement error and an unmeasured family-engagement confounder, which no analysis of the measured covariates removes.',
    plan: AFTER_SCHOOL_MATHS,
  },
  {
    id: 'screened-reading-support',
    name: 'Cut-off on a screener',
    description:
      'Invented. Pupils whose score on a short screening test (reliability .7) falls below 85 get reading support, and the evaluation uses a better pretest (reliability .85). The rule looked at the screener, not the pretest, so ANCOVA on the pretest is biased as well as matching; only an analysis on the screener itself, a regression discontinuity, follows the rule.',
    plan: SCREENED_READING_SUPPORT,
  },
  {
    id: 'clinic-high-readings',
    name: 'One group picked for high readings',
    description:
      'Invented. Clinic patients whose blood-pressure reading was above 150 mmHg are invited to a lifestyle course and measured again afterwards, with no comparison group. One reading has reliability about .7, so people picked for high readings are expected to come down on re-measurement even if the course does nothing, and that fall can exceed the 5 mmHg the course hopes for.',
    plan: CLINIC_HIGH_READINGS,
  },
  {
    id: 'schools-matched-on-means',
    name: 'Schools matched on their means',
    description:
      'Invented. Thirty schools that took up a reading programme are matched to comparison schools on last year\u2019s mean score (25 pupils tested per school, ICC .2); this year\u2019s pupils sit the posttest. A school\u2019s mean is a fallible measure of the school, with reliability about .86 from which pupils were tested, so matched programme schools stay lower in truth and the artefact hides part of a 4-point benefit.',
    plan: SCHOOLS_MATCHED_ON_MEANS,
  },
];
