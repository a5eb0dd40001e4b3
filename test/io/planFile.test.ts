import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { validatePlan } from '../../src/core/validatePlan';
import { DEMO_PLAN, demoPlan } from '../../src/io/demoPlan';
import { parsePlanText, serializePlan } from '../../src/io/planFile';
import { validPlanArb } from './planArbitrary';

describe('plan file round trip', () => {
  it('the generator only makes valid plans (guards the properties below)', () => {
    fc.assert(fc.property(validPlanArb, (plan) => validatePlan(plan).ok === true), { numRuns: 300 });
  });
  it('any valid plan survives serialize → parse unchanged (exact equality)', () => {
    // Exact: JSON.stringify writes the shortest text that reads back to the same double (ECMA-262 Number::toString).
    fc.assert(
      fc.property(validPlanArb, (plan) => {
        const back = parsePlanText(serializePlan(plan));
        expect(back).toEqual({ ok: true, plan });
      }),
      { numRuns: 300 },
    );
  });
  it('writes a stable key order, two-space indent and a trailing newline', () => {
    const shuffled = {
      simulation: DEMO_PLAN.simulation,
      analysis: DEMO_PLAN.analysis,
      matching: { order: 'random', replacement: false, ratio: 1, caliper: 0.2, method: 'nearest' },
      outcome: DEMO_PLAN.outcome,
      pretest: { referenceSD: 10, reliability: 0.75 },
      groups: DEMO_PLAN.groups,
      title: DEMO_PLAN.title,
      version: 1,
      format: 'meanward-plan',
    } as typeof DEMO_PLAN;
    const text = serializePlan(shuffled);
    expect(text).toBe(serializePlan(demoPlan()));
    expect(text.startsWith('{\n  "format": "meanward-plan",\n  "version": 1,\n  "title": ')).toBe(true);
    expect(text.endsWith('}\n')).toBe(true);
    expect(text).toContain('"pretest": {\n    "reliability": 0.75,\n    "referenceSD": 10\n  }');
  });
  it('leaves out optional fields that are absent rather than writing null', () => {
    const p = demoPlan();
    p.pretest = { sem: 5 };
    const text = serializePlan(p);
    expect(text).not.toContain('null');
    expect(text).not.toContain('reliability"');
  });
});

describe('bad plan files', () => {
  it('text that is not JSON, with the line and column', () => {
    // Line 3 is '  "version": 1,,': the stray second comma is its 16th character.
    const r = parsePlanText('{\n  "format": "meanward-plan",\n  "version": 1,,\n}');
    expect(r).toEqual({
      ok: false,
      problems: [{ field: '', message: 'This file is not a plan file: it is not valid JSON (line 3, column 16).' }],
    });
  });
  it('JSON cut short', () => {
    const text = serializePlan(demoPlan());
    const r = parsePlanText(text.slice(0, 100));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems[0]!.message).toMatch(/^This file is not a plan file: it is not valid JSON \(line \d+, column \d+\): the text ends too soon\.$/);
  });
  it('an empty file', () => {
    expect(parsePlanText(' \n')).toEqual({
      ok: false,
      problems: [{ field: '', message: 'This file is empty: a plan file holds the plan as JSON text.' }],
    });
  });
  it('JSON that is not a Meanward plan', () => {
    expect(parsePlanText('{"name": "survey", "rows": 12}')).toEqual({
      ok: false,
      problems: [
        {
          field: 'format',
          message: 'This is not a Meanward plan: it has no "format" field (a plan file says "format": "meanward-plan").',
        },
      ],
    });
  });
  it('a plan file with bad fields reports each of them', () => {
    const p = demoPlan() as unknown as Record<string, any>;
    p.pretest.reliability = 1.4;
    p.matching.caliper = -1;
    const r = parsePlanText(JSON.stringify(p));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map((x) => x.field)).toEqual(['pretest.reliability', 'matching.caliper']);
  });
  it('reads a file that starts with a byte-order mark', () => {
    expect(parsePlanText(`\uFEFF${serializePlan(demoPlan())}`)).toEqual({ ok: true, plan: DEMO_PLAN });
  });
});

describe('optional parts of the plan survive files and links', () => {
  it('covariates, their correlations, the matching distance and provenance round-trip exactly', async () => {
    const { AFTER_SCHOOL_MATHS } = await import('../../src/io/examplePlans');
    const { encodePlanForLink, decodePlanFromLink } = await import('../../src/io/shareLink');
    const plan = structuredClone(AFTER_SCHOOL_MATHS);
    plan.matching.distance = 'mahalanobis';
    plan.provenance = {
      'pretest.reliability': {
        source: 'pilot',
        note: 'from pilot file invented-pilot-cohort.csv, alpha = .81, n = 240',
        interval: { lower: 0.77, upper: 0.85, level: 0.95 },
      },
      'groups.programme.pretestMean': { source: 'pilot', note: 'from pilot file invented-pilot-cohort.csv, n = 118' },
    };
    const back = parsePlanText(serializePlan(plan));
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(back.plan).toEqual(plan);
    // The same plan always gives the same text (provenance keys sorted).
    expect(serializePlan(back.plan)).toBe(serializePlan(plan));
    const linked = decodePlanFromLink(encodePlanForLink(plan));
    expect(linked.ok && linked.plan).toEqual(plan);
  });
});
