// The assumptions table lists every input of the plan file (checked against the
// plan file's own leaves, as serializePlan writes them), with a unit column and
// where each value came from.
import { describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/io/demoPlan';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { serializePlan } from '../../src/io/planFile';
import { planInputRows } from '../../src/report/planInputRows';

function leafPaths(obj: unknown, prefix = ''): string[] {
  if (obj === null || typeof obj !== 'object') return [prefix];
  return Object.entries(obj as Record<string, unknown>).flatMap(([k, v]) => leafPaths(v, prefix ? `${prefix}.${k}` : k));
}

describe('planInputRows', () => {
  it('covers every input in the plan file except its format marker, version and title', () => {
    const plan = demoPlan();
    const expected = leafPaths(JSON.parse(serializePlan(plan))).filter((p) => !['format', 'version', 'title'].includes(p));
    expect(planInputRows(plan).map((r) => r.path).sort()).toEqual(expected.sort());
  });

  it('also covers a plan given by its SEM', () => {
    const plan = demoPlan();
    plan.pretest = { sem: 5 };
    const rows = planInputRows(plan);
    expect(rows.find((r) => r.path === 'pretest.sem')).toMatchObject({ value: '5', unit: 'test points' });
    expect(rows.some((r) => r.path === 'pretest.reliability')).toBe(false);
  });

  it('marks untouched example values "example", changed ones "entered", and honours a given provenance', () => {
    const plan = demoPlan();
    plan.groups.programme.poolSize = 250;
    const rows = planInputRows(plan, { 'outcome.prePostCorrelation': 'pilot data' });
    const source = (p: string) => rows.find((r) => r.path === p)?.source;
    expect(source('groups.programme.poolSize')).toBe('entered');
    expect(source('groups.comparison.poolSize')).toBe('example');
    expect(source('outcome.prePostCorrelation')).toBe('pilot data');
    const other = EXAMPLE_PLANS[0]!.plan;
    expect(planInputRows(other).every((r) => r.source === 'example')).toBe(true);
    const own = { ...demoPlan(), title: 'My own study' };
    expect(planInputRows(own).every((r) => r.source === 'entered')).toBe(true);
  });

  it('reads the plan’s own provenance: pilot values say "pilot data" and carry their note on a line of the label', () => {
    const plan = demoPlan();
    plan.pretest.reliability = 0.81;
    const note = 'from pilot file wave1.csv (invented), alpha = .81 (95% CI .76–.85), n = 212';
    plan.provenance = {
      'pretest.reliability': { source: 'pilot', note, interval: { lower: 0.76, upper: 0.85, level: 0.95 } },
      'outcome.posttestSD': { source: 'entered', note: '' },
    };
    const rows = planInputRows(plan);
    const rel = rows.find((r) => r.path === 'pretest.reliability')!;
    expect(rel).toMatchObject({ source: 'pilot data', note, value: '0.81' });
    // A pilot estimate is not "as published"; the note is the label's second line (the PDF wraps on it).
    expect(rel.label).toBe(`Pretest reliability\n${note}`);
    expect(rows.find((r) => r.path === 'outcome.posttestSD')).toMatchObject({ source: 'entered', label: 'Post-test SD (within group)' });
    expect(rows.find((r) => r.path === 'outcome.posttestSD')?.note).toBeUndefined();
    // Values without a record keep the example/entered rule.
    expect(rows.find((r) => r.path === 'groups.comparison.poolSize')?.source).toBe('example');
    // An explicit provenance argument still wins over the plan's record.
    expect(planInputRows(plan, { 'pretest.reliability': 'entered' }).find((r) => r.path === 'pretest.reliability')?.source).toBe('entered');
  });

  it('gives each numeric input a unit', () => {
    for (const r of planInputRows(demoPlan())) {
      if (/^\d/.test(r.value) && !['simulation.seed'].includes(r.path)) expect(r.unit, r.path).not.toBe('');
    }
  });
});
