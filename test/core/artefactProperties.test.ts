import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analysePlan } from '../../src/core/analysePlan';
import { modelWithSem } from '../../src/core/adjustModel';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { ancovaEstimate, matchedDifferenceEstimate } from '../../src/core/expectedEstimate';
import { TWO_GROUP_ANALYSIS_IDS, type Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';

// Property tests of the closed forms' qualitative behaviour, which follows from Kelley's (1947)
// regression of true on observed scores: matched people's true scores sit (1 − rho)·Delta apart
// (Thorndike 1942; Campbell & Erlebacher 1970; Lord 1960). Tolerance 1e-9 points: exact algebra.

/** Random valid plans (invented scenarios) built from the demo plan's shape. */
const planArb = fc
  .record({
    gap: fc.double({ min: -20, max: 20, noNaN: true }),
    sdP: fc.double({ min: 5, max: 20, noNaN: true }),
    sdC: fc.double({ min: 5, max: 20, noNaN: true }),
    rel: fc.double({ min: 0.3, max: 0.99, noNaN: true }),
    rFrac: fc.double({ min: -0.95, max: 0.95, noNaN: true }),
    tau: fc.double({ min: -5, max: 5, noNaN: true }),
    growthGap: fc.double({ min: -2, max: 2, noNaN: true }),
    nP: fc.integer({ min: 20, max: 500 }),
    nC: fc.integer({ min: 20, max: 3000 }),
    caliper: fc.double({ min: 0.05, max: 1, noNaN: true }),
    ratio: fc.integer({ min: 1, max: 5 }),
    replacement: fc.boolean(),
    assumed: fc.double({ min: 0.3, max: 1, noNaN: true }),
  })
  .map((o): Plan => {
    const p = demoPlan();
    p.groups.programme = { ...p.groups.programme, pretestMean: 50 + o.gap, pretestSD: o.sdP, poolSize: o.nP };
    p.groups.comparison = { ...p.groups.comparison, pretestMean: 50, pretestSD: o.sdC, poolSize: o.nC };
    // SEM below both SDs: reliability given in a reference population with the smaller SD.
    p.pretest = { reliability: o.rel, referenceSD: Math.min(o.sdP, o.sdC) };
    const rhoC = 1 - (Math.min(o.sdP, o.sdC) ** 2 * (1 - o.rel)) / o.sdC ** 2;
    p.outcome = { ...p.outcome, prePostCorrelation: o.rFrac * Math.sqrt(rhoC), hypothesisedEffect: o.tau, growthGap: o.growthGap };
    p.matching = { ...p.matching, caliper: o.caliper, ratio: o.ratio, replacement: o.replacement };
    p.analysis = { ...p.analysis, assumedReliability: o.assumed };
    return p;
  });

describe('properties of the regression artefact (fast-check)', () => {
  it('analysePlan returns only finite numbers for any valid plan', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const walk = (v: unknown): void => {
          if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true);
          else if (v && typeof v === 'object') Object.values(v).forEach(walk);
        };
        walk(analysePlan(plan));
      }),
      { numRuns: 25 },
    );
  });

  it('no artefact when the true means are equal and growth is parallel', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        plan.groups.programme.pretestMean = plan.groups.comparison.pretestMean;
        plan.outcome.growthGap = 0;
        const r = analysePlan(plan);
        for (const id of TWO_GROUP_ANALYSIS_IDS) expect(Math.abs(r.analyses[id]!.bias)).toBeLessThan(1e-9);
      }),
      { numRuns: 30 },
    );
  });

  it('the matching and ANCOVA artefacts vanish as reliability → 1 (|bias| ≤ |beta·Delta|·(1 − rho))', () => {
    fc.assert(
      fc.property(planArb, fc.double({ min: 1e-6, max: 0.05, noNaN: true }), (plan, eps) => {
        plan.outcome.growthGap = 0;
        const m = deriveModelParameters(plan);
        // SEM giving comparison reliability 1 − eps, true scores unchanged.
        const mm = modelWithSem(m, m.trueSD.comparison * Math.sqrt(eps / (1 - eps)));
        const bound = Math.abs(m.beta * m.pretestGap) * eps + 1e-9;
        expect(Math.abs(matchedDifferenceEstimate(mm) - mm.effect)).toBeLessThanOrEqual(bound);
        expect(Math.abs(matchedDifferenceEstimate(modelWithSem(m, 0)) - m.effect)).toBeLessThan(1e-9);
      }),
      { numRuns: 50 },
    );
  });

  it('for beta > 0 the artefact has the sign of the pretest gap (programme higher → looks better)', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        plan.outcome.growthGap = 0;
        plan.outcome.prePostCorrelation = Math.abs(plan.outcome.prePostCorrelation) + 0.01;
        const m = deriveModelParameters(plan);
        fc.pre(Math.abs(m.pretestGap) > 1e-6);
        const bias = matchedDifferenceEstimate(m) - m.effect;
        expect(Math.sign(bias)).toBe(Math.sign(m.pretestGap));
        expect(Math.sign(ancovaEstimate(m) - m.effect)).toBe(Math.sign(m.pretestGap));
      }),
      { numRuns: 50 },
    );
  });

  it('|artefact| decreases monotonically as reliability rises (smaller SEM, same true scores)', () => {
    fc.assert(
      fc.property(
        planArb,
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (plan, a, b) => {
          plan.outcome.growthGap = 0;
          const m = deriveModelParameters(plan);
          const [lo, hi] = a < b ? [a, b] : [b, a];
          // semSmall ≤ semLarge ⇒ reliability higher with semSmall.
          const semSmall = m.sem * lo;
          const semLarge = m.sem * hi;
          const bias = (sem: number) => Math.abs(matchedDifferenceEstimate(modelWithSem(m, sem)) - m.effect);
          const abias = (sem: number) => Math.abs(ancovaEstimate(modelWithSem(m, sem)) - m.effect);
          expect(bias(semSmall)).toBeLessThanOrEqual(bias(semLarge) + 1e-12);
          expect(abias(semSmall)).toBeLessThanOrEqual(abias(semLarge) + 1e-12);
        },
      ),
      { numRuns: 50 },
    );
  });
});
