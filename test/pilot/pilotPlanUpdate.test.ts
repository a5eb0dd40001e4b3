import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/plan';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { pessimisticPlan, pessimisticPlanResult } from '../../src/pilot/pessimisticPlan';
import { pilotPlanUpdate } from '../../src/pilot/pilotPlanUpdate';
import type { PilotEstimates } from '../../src/pilot/types';
import { pilotFixtureMapping, pilotFixtureTable, type PilotFixture } from './pilotFixtures';

// The plan rules are validatePlan's (src/core): reliability in (0, 1), SEM below each group's SD,
// |pre–post r| ≤ √(comparison reliability) (Spearman 1904). Values are copied, so checks are exact.

const full: PilotFixture = { seed: 21, nProgramme: 110, nComparison: 130, items: 8, interItem: 0.35, gap: -0.6, retest: true, posttest: true };
const fullEstimates = (): PilotEstimates => estimatePilot(pilotFixtureTable(full), pilotFixtureMapping(full), 'cohort.csv');

describe('pilotPlanUpdate', () => {
  it('writes means, SDs, alpha with the pooled within-group SD as reference (no SEM), posttest SD and pre–post r of the comparison group', () => {
    const est = fullEstimates();
    const before = demoPlan();
    before.pretest = { sem: 5 };
    before.provenance = { 'pretest.sem': { source: 'entered', note: 'from the manual' } };
    const copy = structuredClone(before);
    const { plan, applied, skipped } = pilotPlanUpdate(before, est);
    expect(before).toEqual(copy); // the input plan is untouched
    expect(skipped).toEqual([]);
    expect(validatePlan(plan).ok).toBe(true);
    expect(plan.groups.programme.pretestMean).toBe(est.groups.programme.pretestMean);
    expect(plan.groups.comparison.pretestMean).toBe(est.groups.comparison.pretestMean);
    expect(plan.groups.programme.pretestSD).toBe(est.groups.programme.pretestSD);
    expect(plan.groups.comparison.pretestSD).toBe(est.groups.comparison.pretestSD);
    expect(plan.pretest).toEqual({ reliability: est.reliability.alpha!.value, referenceSD: est.pooledWithinSD });
    expect(plan.outcome.posttestSD).toBe(est.groups.comparison.posttestSD);
    expect(plan.outcome.prePostCorrelation).toBe(est.groups.comparison.prePostCorrelation);
    // Fields the pilot does not inform stay as they were.
    expect(plan.groups.programme.poolSize).toBe(copy.groups.programme.poolSize);
    expect(plan.outcome.hypothesisedEffect).toBe(copy.outcome.hypothesisedEffect);
    expect(plan.analysis).toEqual(copy.analysis);

    expect(applied.map((a) => a.path)).toEqual([
      'groups.programme.pretestMean',
      'groups.comparison.pretestMean',
      'groups.programme.pretestSD',
      'groups.comparison.pretestSD',
      'pretest.reliability',
      'pretest.referenceSD',
      'outcome.posttestSD',
      'outcome.prePostCorrelation',
    ]);
    const prov = plan.provenance!;
    expect(prov['pretest.sem']).toBeUndefined();
    const a = est.reliability.alpha!;
    const two = (x: number) => x.toFixed(2).replace(/^0/, '');
    expect(prov['pretest.reliability']).toEqual({
      source: 'pilot',
      note: `from pilot file cohort.csv, Cronbach's alpha within groups = ${two(a.value)} (95% CI ${two(a.lower)} to ${two(a.upper)}, Feldt), n = 240, 8 items`,
      interval: { lower: a.lower, upper: a.upper, level: 0.95 },
    });
    expect(prov['groups.comparison.pretestSD']).toEqual({ source: 'pilot', note: 'from pilot file cohort.csv, comparison group pretest SD, n = 130' });
    expect(prov['outcome.prePostCorrelation']!.note).toBe(
      `from pilot file cohort.csv, comparison group pre–post correlation = ${two(est.groups.comparison.prePostCorrelation!)}, n = ${est.groups.comparison.nPrePost}`,
    );
    for (const x of applied) expect(prov[x.path]!.note).toBe(x.note);
  });

  it('uses the test–retest correlation (with its Fisher z interval) when there are no items', () => {
    const t = pilotFixtureTable({ ...full, posttest: false });
    // q1 as a one-column "total" score, with the retest column; no file name given.
    const est = estimatePilot(t, { group: 'group', programmeValue: 'programme', pretest: { kind: 'total', column: 'q1' }, retest: 'retest' });
    const { plan } = pilotPlanUpdate(demoPlan(), est);
    const tr = est.reliability.testRetest!;
    expect(plan.pretest.reliability).toBe(tr.value);
    expect(plan.provenance!['pretest.reliability']!.note).toMatch(/^from the pilot file, test–retest correlation within groups = \.\d\d \(95% CI \.\d\d to \.\d\d, Fisher z\), n = \d+$/);
    expect(plan.provenance!['pretest.reliability']!.interval).toEqual({ lower: tr.lower, upper: tr.upper, level: 0.95 });
  });

  it('a total score without items or retest leaves the reliability as it was', () => {
    const t = pilotFixtureTable(full);
    const est = estimatePilot(t, { group: 'group', programmeValue: 'programme', pretest: { kind: 'total', column: 'q1' } });
    const { plan, applied } = pilotPlanUpdate(demoPlan(), est);
    expect(plan.pretest).toEqual(demoPlan().pretest);
    expect(applied.map((a) => a.path)).not.toContain('pretest.reliability');
  });

  it('skips a pre–post correlation above the root of the reliability, with the rule and the values, and writes the rest', () => {
    const est = fullEstimates();
    est.groups.comparison.prePostCorrelation = 0.97; // impossible with alpha ≈ .8
    const { plan, applied, skipped } = pilotPlanUpdate(demoPlan(), est);
    expect(validatePlan(plan).ok).toBe(true);
    expect(skipped).toHaveLength(1);
    expect(skipped[0]!.path).toBe('outcome.prePostCorrelation');
    expect(skipped[0]!.value).toBe(0.97);
    expect(skipped[0]!.reason).toMatch(/^Not written: Pre–post correlation must be at most 0\.\d+ .*cannot exceed the square root of its within-group reliability .*got 0\.97\.$/);
    expect(plan.outcome.prePostCorrelation).toBe(demoPlan().outcome.prePostCorrelation);
    expect(plan.provenance!['outcome.prePostCorrelation']).toBeUndefined();
    expect(applied.map((a) => a.path)).toContain('pretest.reliability');
  });

  it('skips a reliability outside (0, 1) (e.g. a negative alpha), saying so', () => {
    const est = fullEstimates();
    est.reliability.alpha = { ...est.reliability.alpha!, value: -0.1, lower: -0.3, upper: 0.05 };
    // A plan whose SEM (.75 reliability in a population with SD 2: SEM 1) fits the pilot SDs (about 5).
    const before: Plan = { ...demoPlan(), pretest: { reliability: 0.75, referenceSD: 2 } };
    const { plan, skipped } = pilotPlanUpdate(before, est);
    expect(validatePlan(plan).ok).toBe(true);
    expect(skipped.map((s) => s.path)).toEqual(['pretest.reliability']);
    expect(skipped[0]!.reason).toMatch(/Pretest reliability must be a number between 0 and 1 \(exclusive\); got -0\.1\./);
    expect(plan.pretest).toEqual(before.pretest);
    expect(plan.groups.comparison.pretestSD).toBe(est.groups.comparison.pretestSD);
  });

  it('skips group SDs that an SEM given in the plan would swamp (SEM must be below each SD)', () => {
    const t = pilotFixtureTable(full);
    const est = estimatePilot(t, { group: 'group', programmeValue: 'programme', pretest: { kind: 'total', column: 'q1' } });
    const before: Plan = { ...demoPlan(), pretest: { sem: 5 } }; // pilot SDs are about 1
    const { plan, skipped } = pilotPlanUpdate(before, est);
    expect(validatePlan(plan).ok).toBe(true);
    expect(skipped.map((s) => s.path)).toEqual(['groups.programme.pretestSD', 'groups.comparison.pretestSD']);
    expect(skipped[0]!.reason).toMatch(/SEM must be smaller than each group's pretest SD/);
    expect(plan.groups.programme.pretestMean).toBe(est.groups.programme.pretestMean);
  });

  it('refuses a plan that is not valid to begin with, listing its problems', () => {
    const bad = demoPlan();
    bad.pretest = { reliability: 1.4 };
    expect(() => pilotPlanUpdate(bad, fullEstimates())).toThrow(/only be written into a valid plan.*Pretest reliability must be a number between 0 and 1 \(exclusive\); got 1\.4/);
  });
});

describe('pessimisticPlan', () => {
  it('sets the reliability to the lower end of its interval, says so, keeps the interval, and is idempotent', () => {
    const { plan } = pilotPlanUpdate(demoPlan(), fullEstimates());
    const lower = plan.provenance!['pretest.reliability']!.interval!.lower;
    const p = pessimisticPlan(plan)!;
    expect(p.pretest.reliability).toBe(lower);
    expect(p.pretest.referenceSD).toBe(plan.pretest.referenceSD);
    expect(validatePlan(p).ok).toBe(true);
    const note = p.provenance!['pretest.reliability']!;
    expect(note.note).toBe(`pessimistic (lower end of the 95% CI): ${plan.provenance!['pretest.reliability']!.note}`);
    expect(note.interval).toEqual(plan.provenance!['pretest.reliability']!.interval);
    expect(pessimisticPlan(p)).toEqual(p);
  });
  it('is undefined without an interval (the demo plan), with the reason from pessimisticPlanResult', () => {
    expect(pessimisticPlan(demoPlan())).toBeUndefined();
    const r = pessimisticPlanResult(demoPlan());
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/no confidence interval/);
  });
  it('refuses a lower end at or below 0, and one that would break the pre–post rule, saying why', () => {
    const plan = demoPlan();
    plan.provenance = { 'pretest.reliability': { source: 'pilot', note: 'x', interval: { lower: -0.05, upper: 0.9, level: 0.95 } } };
    const r1 = pessimisticPlanResult(plan);
    expect(r1.ok).toBe(false);
    if (!r1.ok) expect(r1.reason).toMatch(/lower end of the reliability's 95% CI is −\.05, not a usable reliability/);
    plan.provenance['pretest.reliability']!.interval!.lower = 0.3; // √.3 = .548 < demo pre–post r .6
    const r2 = pessimisticPlanResult(plan);
    expect(r2.ok).toBe(false);
    if (!r2.ok) expect(r2.reason).toMatch(/^At the lower end of its 95% CI \(\.30\) the reliability breaks a plan rule: Pre–post correlation must be at most/);
    expect(pessimisticPlan(plan)).toBeUndefined();
  });
});
