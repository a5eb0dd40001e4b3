import { describe, expect, it } from 'vitest';
import { validatePlan, type PlanProblem } from '../../src/core/validatePlan';
import { DEMO_PLAN } from '../../src/io/demoPlan';
import { covariate as inventedCovariate } from '../fixtures/covariatePlans';

// Messages are compared exactly (tolerance: none) because they are the
// product here: each must name the field in plain words, its valid range and
// the value received.

type Mutable = Record<string, any>;
function demo(): Mutable {
  return structuredClone(DEMO_PLAN) as Mutable;
}
function problemsOf(input: unknown): PlanProblem[] {
  const r = validatePlan(input);
  if (r.ok) throw new Error('expected the plan to be rejected');
  return r.problems;
}
function only(input: unknown): PlanProblem {
  const ps = problemsOf(input);
  expect(ps).toHaveLength(1);
  return ps[0]!;
}

describe('validatePlan accepts good plans and fills defaults', () => {
  it('accepts the demo plan unchanged', () => {
    const r = validatePlan(demo());
    expect(r).toEqual({ ok: true, plan: DEMO_PLAN });
  });
  it('fills matching.order, tolerableBiasShare and targetPower when left out', () => {
    const p = demo();
    delete p.matching.order;
    delete p.analysis.tolerableBiasShare;
    delete p.analysis.targetPower;
    const r = validatePlan(p);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.plan.matching.order).toBe('random');
    expect(r.plan.analysis.tolerableBiasShare).toBe(0.25);
    expect(r.plan.analysis.targetPower).toBe(0.8);
  });
  it('ignores unknown extra fields (forward compatibility) and drops them', () => {
    const p = demo();
    p.notes = 'from a later version';
    p.groups.programme.colour = 'teal';
    const r = validatePlan(p);
    expect(r).toEqual({ ok: true, plan: DEMO_PLAN });
  });
  it('accepts an SEM instead of a reliability', () => {
    const p = demo();
    p.pretest = { sem: 5 };
    expect(validatePlan(p).ok).toBe(true);
  });
});

describe('one message per bad field', () => {
  const cases: Array<[string, (p: Mutable) => void, string, string]> = [
    ['title too long', (p) => (p.title = 'x'.repeat(201)), 'title', 'Title must be text of at most 200 characters; got 201 characters.'],
    ['empty group name', (p) => (p.groups.programme.label = ''), 'groups.programme.label', 'Programme group name must be text of 1 to 80 characters; got 0 characters.'],
    ['fractional pool', (p) => (p.groups.programme.poolSize = 12.5), 'groups.programme.poolSize', 'Programme group pool size must be a whole number from 2 to 100000; got 12.5.'],
    ['pool of one', (p) => (p.groups.comparison.poolSize = 1), 'groups.comparison.poolSize', 'Comparison group pool size must be a whole number from 2 to 100000; got 1.'],
    ['mean infinite', (p) => (p.groups.programme.pretestMean = Number.POSITIVE_INFINITY), 'groups.programme.pretestMean', 'Programme group pretest mean must be a number from -1000000 to 1000000; got an infinitely large number.'],
    ['mean as text', (p) => (p.groups.comparison.pretestMean = '54'), 'groups.comparison.pretestMean', 'Comparison group pretest mean must be a number from -1000000 to 1000000; got "54".'],
    ['negative SD', (p) => (p.groups.programme.pretestSD = -3), 'groups.programme.pretestSD', 'Programme group pretest SD must be a number from 0.000001 to 1000000; got -3.'],
    ['reliability 1.4', (p) => (p.pretest.reliability = 1.4), 'pretest.reliability', 'Pretest reliability must be a number between 0 and 1 (exclusive); got 1.4.'],
    ['reliability 0', (p) => (p.pretest.reliability = 0), 'pretest.reliability', 'Pretest reliability must be a number between 0 and 1 (exclusive); got 0.'],
    ['reference SD 0', (p) => (p.pretest.referenceSD = 0), 'pretest.referenceSD', 'Reference SD of the pretest must be a number from 0.000001 to 1000000; got 0.'],
    ['SEM negative', (p) => (p.pretest = { sem: -1 }), 'pretest.sem', 'Pretest SEM must be a number from 0.000001 to 1000000; got -1.'],
    ['posttest SD 0', (p) => (p.outcome.posttestSD = 0), 'outcome.posttestSD', 'Posttest SD must be a number from 0.000001 to 1000000; got 0.'],
    ['correlation 1', (p) => (p.outcome.prePostCorrelation = 1), 'outcome.prePostCorrelation', 'Pre–post correlation must be a number between -1 and 1 (exclusive); got 1.'],
    ['growth gap missing', (p) => delete p.outcome.growthGap, 'outcome.growthGap', 'Growth gap is missing; it must be a number from -1000000 to 1000000.'],
    ['effect null', (p) => (p.outcome.hypothesisedEffect = null), 'outcome.hypothesisedEffect', 'Hypothesised effect must be a number from -1000000 to 1000000; got null.'],
    ['effect scale', (p) => (p.outcome.effectScale = 'percent'), 'outcome.effectScale', 'Effect scale must be "points" or "sd"; got "percent".'],
    ['method', (p) => (p.matching.method = 'closest'), 'matching.method', 'Matching method must be "nearest" or "random-within-caliper"; got "closest".'],
    ['caliper 6', (p) => (p.matching.caliper = 6), 'matching.caliper', 'Caliper must be a number from 0.0001 to 5; got 6.'],
    ['ratio 6', (p) => (p.matching.ratio = 6), 'matching.ratio', 'Matching ratio must be a whole number from 1 to 5; got 6.'],
    ['replacement text', (p) => (p.matching.replacement = 'no'), 'matching.replacement', 'Matching with replacement must be true or false; got "no".'],
    ['order', (p) => (p.matching.order = 'alphabetical'), 'matching.order', 'Matching order must be one of "random", "lowest-first", "highest-first"; got "alphabetical".'],
    ['alpha 0.5', (p) => (p.analysis.alpha = 0.5), 'analysis.alpha', 'Significance level (alpha) must be a number at least 0.000001 and less than 0.5; got 0.5.'],
    ['assumed reliability 1.2', (p) => (p.analysis.assumedReliability = 1.2), 'analysis.assumedReliability', 'Assumed reliability for the corrected ANCOVA must be a number from 0.01 to 1; got 1.2.'],
    ['assumed reliability 0', (p) => (p.analysis.assumedReliability = 0), 'analysis.assumedReliability', 'Assumed reliability for the corrected ANCOVA must be a number from 0.01 to 1; got 0.'],
    ['tolerable share 0', (p) => (p.analysis.tolerableBiasShare = 0), 'analysis.tolerableBiasShare', 'Tolerable bias share must be a number greater than 0 and at most 1; got 0.'],
    ['target power 0.3', (p) => (p.analysis.targetPower = 0.3), 'analysis.targetPower', 'Target power must be a number from 0.5 to 0.99; got 0.3.'],
    ['replications 0', (p) => (p.simulation.replications = 0), 'simulation.replications', 'Number of simulated replications must be a whole number from 2 to 100000; got 0.'],
    ['replications 1', (p) => (p.simulation.replications = 1), 'simulation.replications', 'Number of simulated replications must be a whole number from 2 to 100000; got 1.'],
    ['seed negative', (p) => (p.simulation.seed = -1), 'simulation.seed', 'Simulation seed must be a whole number from 0 to 4294967295; got -1.'],
    ['seed too big', (p) => (p.simulation.seed = 2 ** 32), 'simulation.seed', 'Simulation seed must be a whole number from 0 to 4294967295; got 4294967296.'],
    ['section missing', (p) => delete p.outcome, 'outcome', 'The outcome section is missing; it must be a section of named fields.'],
    ['section wrong kind', (p) => (p.simulation = 5), 'simulation', 'The simulation section must be a section of named fields; got the value 5.'],
  ];
  for (const [name, mutate, field, message] of cases) {
    it(name, () => {
      const p = demo();
      mutate(p);
      expect(only(p)).toEqual({ field, message });
    });
  }
});

describe('cross-field problems', () => {
  it('both reliability and SEM', () => {
    const p = demo();
    p.pretest = { reliability: 0.8, sem: 4 };
    expect(only(p)).toEqual({
      field: 'pretest',
      message: 'Give the pretest either a reliability or an SEM, not both; got reliability 0.8 and SEM 4.',
    });
  });
  it('neither reliability nor SEM', () => {
    const p = demo();
    p.pretest = {};
    expect(only(p)).toEqual({
      field: 'pretest',
      message:
        'Give the pretest either a reliability (a number between 0 and 1, exclusive) or an SEM (in test points, from 0.000001 to 1000000); neither was given.',
    });
  });
  it('SEM not smaller than a group SD (one message per group that fails)', () => {
    const p = demo();
    p.pretest = { sem: 12 };
    p.groups.comparison.pretestSD = 15;
    expect(only(p)).toEqual({
      field: 'pretest.sem',
      message:
        "The pretest's SEM must be smaller than each group's pretest SD, or the pretest would measure nothing but error in that group; got an SEM of 12 points against the programme group's pretest SD of 10.",
    });
  });
  it('SEM derived from a reliability in a wider population, too large for a narrow group', () => {
    // sem = referenceSD * sqrt(1 - reliability) (Lord & Novick 1968, eq. 3.8.4, from memory):
    // 30 * sqrt(0.8) = 26.833 > programme SD 10 and comparison SD 10.
    const p = demo();
    p.pretest = { reliability: 0.2, referenceSD: 30 };
    const ps = problemsOf(p);
    expect(ps.map((x) => x.field)).toEqual(['pretest.reliability', 'pretest.reliability']);
    expect(ps[0]!.message).toBe(
      "The pretest's SEM must be smaller than each group's pretest SD, or the pretest would measure nothing but error in that group; got an SEM of 26.833 points (from reliability 0.2 in a population with SD 30) against the programme group's pretest SD of 10.",
    );
  });
  it('pre–post correlation larger than the root of the within-group reliability', () => {
    // Attenuation (Spearman 1904): |r_XY| <= sqrt(rho_X). Demo: sem 5, comparison SD 10,
    // rho = 1 - 25/100 = 0.75, sqrt = 0.866 (computed).
    const p = demo();
    p.outcome.prePostCorrelation = -0.9;
    expect(only(p)).toEqual({
      field: 'outcome.prePostCorrelation',
      message:
        'Pre–post correlation must be at most 0.866 in size with this pretest: a correlation with a fallible pretest cannot exceed the square root of its within-group reliability (0.75 in the comparison group); got -0.9.',
    });
  });
  it('accepts a correlation just inside the attenuation bound', () => {
    const p = demo();
    p.outcome.prePostCorrelation = 0.866; // 0.866^2 = 0.749956 < 0.75
    expect(validatePlan(p).ok).toBe(true);
  });
  it('an SD-unit effect beyond 3 SDs', () => {
    const p = demo();
    p.outcome.effectScale = 'sd';
    p.outcome.hypothesisedEffect = 12;
    expect(only(p)).toEqual({
      field: 'outcome.hypothesisedEffect',
      message:
        'Hypothesised effect in posttest-SD units must be between -3 and 3; got 12. If it is in posttest points, set the effect scale to "points".',
    });
  });
  it('a ratio larger than the comparison pool', () => {
    const p = demo();
    p.groups.comparison.poolSize = 3;
    p.matching.ratio = 4;
    expect(only(p)).toEqual({
      field: 'matching.ratio',
      message:
        'Matching ratio must be at most the comparison pool size (3 people), or not even one programme member can get their partners; got 4.',
    });
  });
  it('a very wide caliper with random choice within it', () => {
    const p = demo();
    p.matching.method = 'random-within-caliper';
    p.matching.caliper = 3;
    expect(only(p)).toEqual({
      field: 'matching.caliper',
      message:
        'With a random partner within the caliper, the caliper must be at most 2 SDs of the pretest, or partners are barely matched at all; got 3.',
    });
    p.matching.method = 'nearest'; // nearest partner: a wide caliper only stops gross mismatches
    expect(validatePlan(p).ok).toBe(true);
  });
});

describe('format, version and non-plans', () => {
  it('wrong format is reported alone', () => {
    expect(only({ format: 'spreadsheet', version: 1 })).toEqual({
      field: 'format',
      message: 'This is not a Meanward plan: its "format" must be "meanward-plan"; got "spreadsheet".',
    });
  });
  it('no format', () => {
    expect(only({ title: 'x' }).message).toBe(
      'This is not a Meanward plan: it has no "format" field (a plan file says "format": "meanward-plan").',
    );
  });
  it('a newer version', () => {
    const p = demo();
    p.version = 2;
    expect(only(p)).toEqual({
      field: 'version',
      message:
        'This plan was written for version 2 of the plan file, newer than this Meanward reads (version 1). Use a newer Meanward, or re-save the plan as version 1.',
    });
  });
  it('a version that is not a version', () => {
    const p = demo();
    p.version = '1';
    expect(only(p)).toEqual({ field: 'version', message: 'Plan file version must be 1; got "1".' });
  });
  it('a list, a number, null', () => {
    expect(only([1, 2]).message).toBe('This is not a Meanward plan: a plan is a set of named fields, but this is a list.');
    expect(only(7).message).toBe('This is not a Meanward plan: a plan is a set of named fields, but this is the value 7.');
    expect(only(null).message).toBe('This is not a Meanward plan: a plan is a set of named fields, but this is null.');
  });
});

describe('every problem at once', () => {
  it('reports schema and cross-field problems together, in field order', () => {
    const p = demo();
    p.title = 'y'.repeat(250);
    p.groups.programme.pretestSD = 0;
    p.pretest = { reliability: 1.4, sem: 3 };
    p.outcome.effectScale = 'pts';
    p.matching.ratio = 0;
    delete p.analysis.alpha;
    const fields = problemsOf(p).map((x) => x.field);
    expect(fields).toEqual([
      'title',
      'groups.programme.pretestSD',
      'pretest.reliability',
      'outcome.effectScale',
      'matching.ratio',
      'analysis.alpha',
      'pretest',
    ]);
  });
  it('never shows a raw zod message (no "Invalid input", "expected", "received")', () => {
    const p = demo();
    p.groups = { programme: { label: 5, poolSize: 'many' }, comparison: [] };
    p.outcome = { posttestSD: Number.NaN };
    const ps = problemsOf(p);
    expect(ps.length).toBeGreaterThanOrEqual(6);
    for (const x of ps) expect(x.message).not.toMatch(/Invalid input|expected|received|Too (big|small)/);
  });
  it('does not change the input it was given', () => {
    const p = demo();
    delete p.matching.order;
    p.extra = 1;
    const before = JSON.stringify(p);
    validatePlan(p);
    expect(JSON.stringify(p)).toBe(before);
  });
});

describe('optional covariate and provenance fields (messages name the item)', () => {
  const covariate = inventedCovariate();
  it('a list item that breaks its rule is named by its number', () => {
    const r = validatePlan({ ...demo(), covariates: [covariate, { ...covariate, sd: -2 }] });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems).toContainEqual({ field: 'covariates.1.sd', message: 'Covariate 2 SD must be a number from 0.000001 to 1000000; got -2.' });
  });
  it('a bad provenance source is reported with the rule', () => {
    const r = validatePlan({ ...demo(), provenance: { 'pretest.reliability': { source: 'guess', note: 'x' } } });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems[0]).toEqual({
      field: 'provenance.pretest.reliability.source',
      message: 'A provenance source must be "entered", "example" or "pilot"; got "guess".',
    });
  });
  it('a plan without the optional fields is unchanged by validation', () => {
    const r = validatePlan(demo());
    expect(r).toEqual({ ok: true, plan: DEMO_PLAN });
    if (r.ok) expect('covariates' in r.plan || 'provenance' in r.plan || 'distance' in r.plan.matching).toBe(false);
  });
});
