import { describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/io/demoPlan';
import { CLINIC_HIGH_READINGS, SCHOOLS_MATCHED_ON_MEANS, SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';
import { analysePlan } from '../../src/core/analysePlan';
import { validatePlan } from '../../src/core/validatePlan';
import type { Plan } from '../../src/core/plan';
import {
  EXPLORE_TOLERANCE_NOTE,
  axisValues,
  defaultExploreSpec,
  exploreCells,
  exploreInputs,
  exploreResult,
  exploreVariantName,
  parseVary,
  pendingCellSummary,
  summariseExploreCell,
  tolerableRegion,
  validateExploreSpec,
  withExploreInput,
  withExploreClosedForm,
  type ExploreInput,
  type ExploreSimulatedFigures,
  type ExploreSpec,
} from '../../src/core/explore';
import { createPlanSimulation } from '../../src/sim/multivariate/createPlanSimulation';

/** Every leaf path whose value differs between two plans (dotted; arrays by index). */
function changedPaths(a: unknown, b: unknown, path = ''): string[] {
  if (typeof a === 'object' && a !== null && typeof b === 'object' && b !== null) {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
    return [...keys].flatMap((k) => changedPaths((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], path === '' ? k : `${path}.${k}`));
  }
  return Object.is(a, b) ? [] : [path];
}

const applies = (plan: Plan) => Object.fromEntries(exploreInputs(plan).map((i) => [i.input, i.applies]));

describe('exploreInputs: which inputs apply to which design', () => {
  it('two existing groups: everything but the cut-off and the cluster size, at the plan’s current values', () => {
    const infos = exploreInputs(demoPlan());
    expect(applies(demoPlan())).toEqual({
      reliability: true, caliper: true, ratio: true, programmePool: true, comparisonPool: true, groupGap: true, cutOff: false, clusterSize: false,
    });
    const current = Object.fromEntries(infos.map((i) => [i.input, i.current]));
    // The demo plan: reliability .75, caliper 0.2, ratio 1, pools 180 and 1200, programme 44 vs comparison 54.
    expect(current).toMatchObject({ reliability: 0.75, caliper: 0.2, ratio: 1, programmePool: 180, comparisonPool: 1200, groupGap: -10 });
    for (const i of infos.filter((x) => x.applies)) {
      expect(i.defaultRange.from).toBeLessThanOrEqual(i.current as number);
      expect(i.defaultRange.to).toBeGreaterThanOrEqual(i.current as number);
      expect(i.defaultRange.from).toBeGreaterThanOrEqual(i.allowed.min);
      expect(i.defaultRange.to).toBeLessThanOrEqual(i.allowed.max);
    }
    expect(infos.find((i) => i.input === 'cutOff')?.notApplicableReason).toMatch(/cut-off rule/);
  });
  it('a selection rule: the cut-off applies, the pools and the group gap do not (they follow from the rule)', () => {
    const a = applies(SCREENED_READING_SUPPORT);
    expect(a).toMatchObject({ cutOff: true, programmePool: false, comparisonPool: false, groupGap: false, caliper: true, clusterSize: false });
    expect(exploreInputs(SCREENED_READING_SUPPORT).find((i) => i.input === 'cutOff')?.current).toBe(85);
  });
  it('a one-group study has no matching: no caliper, no ratio', () => {
    expect(applies(CLINIC_HIGH_READINGS)).toMatchObject({ caliper: false, ratio: false, cutOff: true, reliability: true });
  });
  it('clusters: the cluster size applies, pools round to whole clusters', () => {
    expect(applies(SCHOOLS_MATCHED_ON_MEANS)).toMatchObject({ clusterSize: true, cutOff: false, programmePool: true });
    const v = axisValues(SCHOOLS_MATCHED_ON_MEANS, { input: 'comparisonPool', from: 260, to: 1010, steps: 4 });
    for (const x of v) expect(x % 25).toBe(0);
  });
  it('the reliability note says the corrected ANCOVA keeps the assumed reliability', () => {
    expect(exploreInputs(demoPlan()).find((i) => i.input === 'reliability')?.note).toMatch(/corrected ANCOVA keeps the reliability you assumed/);
  });
});

describe('withExploreInput / exploreCells: a variant changes exactly the varied field', () => {
  const expected: Record<ExploreInput, [Plan, number, string[]]> = {
    reliability: [demoPlan(), 0.85, ['pretest.reliability']],
    caliper: [demoPlan(), 0.1, ['matching.caliper']],
    ratio: [demoPlan(), 2, ['matching.ratio']],
    programmePool: [demoPlan(), 300, ['groups.programme.poolSize']],
    comparisonPool: [demoPlan(), 800, ['groups.comparison.poolSize']],
    groupGap: [demoPlan(), -5, ['groups.programme.pretestMean']],
    cutOff: [SCREENED_READING_SUPPORT, 80, ['assignment.cutOff']],
    // The number of clusters is kept, so the pools follow the size.
    clusterSize: [SCHOOLS_MATCHED_ON_MEANS, 30, ['clusters.size', 'groups.programme.poolSize', 'groups.comparison.poolSize']],
  };
  for (const [input, [plan, value, paths]] of Object.entries(expected) as [ExploreInput, [Plan, number, string[]]][]) {
    it(`${input}: changes ${paths.join(', ')} and nothing else (before validation)`, () => {
      const before = structuredClone(plan);
      const next = withExploreInput(plan, input, value);
      expect(plan).toEqual(before); // the input plan is not changed
      expect(changedPaths(plan, next).sort()).toEqual([...paths].sort());
    });
  }
  it('the group gap moves the programme mean only: 54 − 5 = 49', () => {
    expect(withExploreInput(demoPlan(), 'groupGap', -5).groups.programme.pretestMean).toBe(49);
  });
  it('an SEM given instead of a reliability is replaced by the reliability; the assumed reliability of the corrected ANCOVA is kept', () => {
    const p = demoPlan();
    p.pretest = { sem: 5 };
    const next = withExploreInput(p, 'reliability', 0.8);
    expect(next.pretest).toEqual({ reliability: 0.8 });
    expect(next.analysis.assumedReliability).toBe(p.analysis.assumedReliability);
    // Current value: 1 − SEM²/SD² = 1 − 25/100 = .75 (classical test theory, Lord & Novick 1968, ch. 3, from memory).
    expect(exploreInputs(p).find((i) => i.input === 'reliability')?.current).toBeCloseTo(0.75, 12);
  });
  it('a selection plan’s cut-off variant gets its groups derived again (validatePlan)', () => {
    const cells = exploreCells(SCREENED_READING_SUPPORT, {
      axes: [{ input: 'cutOff', from: 80, to: 90, steps: 2 }], analysisId: 'ancova', replications: 200, seed: 1,
    });
    expect(cells.every((c) => c.plan !== null)).toBe(true);
    // A higher cut-off on "below" selects more people into the programme.
    expect(cells[1]!.plan!.groups.programme.poolSize).toBeGreaterThan(cells[0]!.plan!.groups.programme.poolSize);
  });
});

describe('exploreCells: the grid and its closed forms', () => {
  const spec: ExploreSpec = {
    axes: [{ input: 'reliability', from: 0.6, to: 0.9, steps: 4 }, { input: 'groupGap', from: -15, to: -5, steps: 3 }],
    analysisId: 'matchedDifference', replications: 1000, seed: 7,
  };
  const cells = exploreCells(demoPlan(), spec);
  it('is row-major with axis 0 slowest', () => {
    expect(cells.map((c) => c.values)).toEqual([0.6, 0.7, 0.8, 0.9].flatMap((r) => [-15, -10, -5].map((g) => [r, g])));
    expect(cells.map((c) => c.index)).toEqual([...Array(12).keys()]);
  });
  it('closed-form share = the published artefact of matching (or ANCOVA) on a fallible pretest: β(1 − ρ)Δ ÷ τ', () => {
    // Thorndike (1942); Lord (1960): matching exactly on the observed pretest leaves β(1 − ρ)Δ, where Δ is the
    // true-score gap (= the observed gap here, equal reliabilities), ρ the within-group reliability, and β the
    // outcome's slope on the true score = r·SD_Y/(ρ·SD_X) (Spearman's disattenuation). Demo: r .6, SDs 10, τ 2.5.
    for (const c of cells) {
      const [rho, gap] = c.values as [number, number];
      const beta = (0.6 * 10) / (rho * 10);
      expect(c.closedFormShare).toBeCloseTo((beta * (1 - rho) * gap) / 2.5, 10);
    }
  });
  it('closed-form share equals analysePlan of the variant, for every analysis (a clusters plan too)', () => {
    for (const [plan, s] of [
      [demoPlan(), { ...spec, analysisId: 'gainScore' }],
      [SCHOOLS_MATCHED_ON_MEANS, { axes: [{ input: 'clusterSize', from: 10, to: 40, steps: 3 }], analysisId: 'matchedDifference', replications: 500, seed: 1 }],
    ] as [Plan, ExploreSpec][]) {
      for (const c of exploreCells(plan, s)) {
        const check = validatePlan(c.plan);
        expect(check.ok).toBe(true);
        if (check.ok) expect(c.closedFormShare).toBe(analysePlan(check.plan).analyses[s.analysisId]!.regressionArtefactShare);
      }
    }
  });
  it('an impossible variant keeps plan null and says why (Spearman 1904: r² may not exceed the reliability)', () => {
    // r = .6, so a reliability of .3 < .36 cannot hold.
    const c = exploreCells(demoPlan(), { ...spec, axes: [{ input: 'reliability', from: 0.3, to: 0.8, steps: 2 }] });
    expect(c[0]!.plan).toBeNull();
    expect(c[0]!.problem).toMatch(/correlation/i);
    expect(c[1]!.plan).not.toBeNull();
    expect(pendingCellSummary(c[0]!).status).toBe('impossible');
    expect(pendingCellSummary(c[1]!).status).toBe('pending');
  });
});

describe('parseVary and validateExploreSpec: plain messages', () => {
  it('parses input=from:to:steps, with other spellings of the input', () => {
    expect(parseVary('reliability=0.6:0.95:8')).toEqual({ ok: true, axis: { input: 'reliability', from: 0.6, to: 0.95, steps: 8 } });
    expect(parseVary('comparison-pool=600:2400:4')).toEqual({ ok: true, axis: { input: 'comparisonPool', from: 600, to: 2400, steps: 4 } });
    expect(parseVary('groupGap=-15:0:4')).toMatchObject({ ok: true, axis: { from: -15, to: 0 } });
  });
  it('names the problem and quotes what was typed', () => {
    expect(parseVary('reliability')).toMatchObject({ ok: false, problem: expect.stringMatching(/needs the form input=from:to:steps/) });
    expect(parseVary('colour=1:2:3')).toMatchObject({ ok: false, problem: expect.stringMatching(/"colour" is not an input/) });
    expect(parseVary('caliper=0.1:0.5')).toMatchObject({ ok: false, problem: expect.stringMatching(/three parts/) });
    expect(parseVary('caliper=0.1:abc:3')).toMatchObject({ ok: false, problem: '--vary caliper: the end "abc" is not a number.' });
    expect(parseVary('caliper=0.1:0.5:2.5')).toMatchObject({ ok: false, problem: expect.stringMatching(/steps "2.5" must be a whole number/) });
  });
  it('accepts the default spec; refuses what cannot run, naming the input', () => {
    const p = demoPlan();
    expect(validateExploreSpec(p, defaultExploreSpec(p, ['reliability', 'caliper']))).toEqual([]);
    const base = { analysisId: 'matchedDifference' as const, replications: 1000, seed: 1 };
    const msgs = (s: Partial<ExploreSpec>) => validateExploreSpec(p, { ...base, axes: [{ input: 'reliability', from: 0.6, to: 0.9, steps: 4 }], ...s } as ExploreSpec);
    expect(msgs({ axes: [{ input: 'cutOff', from: 40, to: 60, steps: 3 }] })).toEqual([
      'Cut-off of the selection rule cannot be varied for this plan: only a plan whose groups a cut-off rule forms has a cut-off.',
    ]);
    expect(msgs({ axes: [{ input: 'caliper', from: 0.1, to: 0.5, steps: 3 }, { input: 'caliper', from: 0.1, to: 0.5, steps: 3 }] })[0]).toMatch(/Matching caliper is chosen twice/);
    expect(msgs({ axes: [{ input: 'reliability', from: 0.6, to: 0.9, steps: 13 }] })).toEqual(['Pretest reliability: the number of steps must be a whole number from 2 to 12; got 13.']);
    expect(msgs({ axes: [{ input: 'reliability', from: 0.6, to: 1, steps: 4 }] })).toEqual(['Pretest reliability: the end must be from 0.01 to 0.99; got 1.']);
    expect(msgs({ axes: [{ input: 'reliability', from: 0.6, to: 0.9, steps: 9 }, { input: 'caliper', from: 0.1, to: 0.5, steps: 8 }] })).toEqual([
      'The grid has 72 cells; at most 64 are allowed (use fewer steps).',
    ]);
    expect(msgs({ axes: [{ input: 'ratio', from: 1, to: 3, steps: 5 }] })[0]).toMatch(/repeat values once rounded to whole numbers/);
    expect(msgs({ replications: 50 })).toEqual(['Replications per cell must be a whole number from 100 to 20,000; got 50.']);
    expect(msgs({ analysisId: 'prePostChange' })[0]).toMatch(/no analysis "prePostChange"/);
    expect(msgs({ axes: [{ input: 'caliper', from: 0.3, to: 0.3, steps: 2 }] })).toEqual(['Matching caliper: the start and the end are the same (0.3); give a range.']);
  });
});

describe('summariseExploreCell: figures from a simulation result, judged on the artefact', () => {
  const spec: ExploreSpec = { axes: [{ input: 'reliability', from: 0.7, to: 0.8, steps: 2 }], analysisId: 'matchedDifference', replications: 1000, seed: 1 };
  const p = demoPlan();
  p.outcome.growthGap = 0.5;
  const [cell] = exploreCells(p, spec);
  const fake = (meanEstimate: number): ExploreSimulatedFigures => ({
    tau: 2.5,
    analyses: { matchedDifference: { meanEstimate, meanEstimateMCSE: 0.05, rejectionRate: 0.4, rejectionRateMCSE: 0.011 } },
    matching: { discardedProgrammeShare: 0.12 },
  });
  it('artefact = mean estimate − τ − growth gap; share ÷ τ; the MC SE scales alike; the discarded share and power pass through', () => {
    const s = summariseExploreCell(cell!, fake(2.5 + 0.5 - 0.5), spec);
    expect(s.status).toBe('done');
    expect(s.artefact).toBeCloseTo(-0.5, 12);
    expect(s.artefactShare).toBeCloseTo(-0.2, 12);
    expect(s.artefactShareMCSE).toBeCloseTo(0.02, 12);
    expect(s.discardedShare).toBe(0.12);
    expect(s.power).toBe(0.4);
    // 20% ≤ 25%: tolerable on the artefact, and the reason says which checks are not simulated.
    expect(s.tolerable).toBe(true);
    expect(s.tolerableReason).toContain(EXPLORE_TOLERANCE_NOTE);
    expect(s.tolerableReason).not.toContain("cannot be carried out as planned"); // the analysis can: only the error rates are not simulated
    expect(summariseExploreCell(cell!, fake(2.5 + 0.5 - 1), spec).tolerable).toBe(false); // 40% > 25%
  });
  it('the wrong-sign share inside power passes through when the simulation has it (Morris, White & Crowther 2019: a rejection-rate share with its MC SE)', () => {
    const f = fake(-1.5);
    const md = f.analyses.matchedDifference as { wrongSignRate?: number; wrongSignRateMCSE?: number };
    md.wrongSignRate = 0.37;
    md.wrongSignRateMCSE = 0.015;
    const s = summariseExploreCell(cell!, f, spec);
    expect(s.power).toBe(0.4);
    expect(s.wrongSignRate).toBe(0.37);
    expect(s.wrongSignRateMCSE).toBe(0.015);
    expect(summariseExploreCell(cell!, fake(2.5), spec).wrongSignRate).toBeUndefined();
  });
  it('an analysis the simulation could not compute fails with its reason; full-sample analyses discard nobody', () => {
    const infeasible = { tau: 2.5, analyses: { matchedDifference: { feasible: false as const, reason: 'Nobody matched.' } }, matching: { discardedProgrammeShare: 1 } };
    expect(summariseExploreCell(cell!, infeasible, spec)).toMatchObject({ status: 'failed', failure: 'Nobody matched.' });
    const anc = { ...spec, analysisId: 'ancova' as const };
    const r = { ...fake(2), analyses: { ancova: fake(2).analyses.matchedDifference } };
    expect(summariseExploreCell(cell!, r, anc).discardedShare).toBe(0);
  });
  it('names a candidate plan from a cell', () => {
    expect(exploreVariantName({ ...spec, axes: [spec.axes[0], { input: 'caliper', from: 0.1, to: 0.2, steps: 2 }] }, { values: [0.8, 0.2] })).toBe(
      'Explorer: reliability 0.80, caliper 0.20',
    );
    expect(exploreVariantName({ ...spec, axes: [{ input: 'comparisonPool', from: 600, to: 900, steps: 2 }] }, { values: [900] })).toBe('Explorer: comparison pool 900');
  });
});

describe('simulated cells agree with the closed form (seeded, small)', () => {
  it('2 × 2 grid of the demo plan, ANCOVA, 1,000 replications per cell: within 4 MC SE of Lord (1960)', () => {
    // ANCOVA uses the full pools, so its closed form is the planned procedure (no finite-pool matching):
    // β(1 − ρ)Δ (Lord 1960). 4 MC SEs: a false alarm about 6e-5 per check.
    const plan = demoPlan();
    const spec: ExploreSpec = {
      axes: [{ input: 'reliability', from: 0.65, to: 0.9, steps: 2 }, { input: 'groupGap', from: -12, to: -4, steps: 2 }],
      analysisId: 'ancova', replications: 1000, seed: 20261205,
    };
    expect(validateExploreSpec(plan, spec)).toEqual([]);
    const summaries = exploreCells(plan, spec).map((cell) => {
      const run = createPlanSimulation(cell.plan!, { replications: spec.replications, seed: spec.seed });
      run.runChunk(0, spec.replications);
      return summariseExploreCell(cell, run.finish(), spec);
    });
    for (const s of summaries) {
      expect(s.status).toBe('done');
      expect(Math.abs(s.artefactShare! - s.closedFormShare!)).toBeLessThan(4 * s.artefactShareMCSE!);
      expect(s.discardedShare).toBe(0);
    }
    const result = exploreResult(plan, spec, [...summaries].reverse());
    expect(result.cells.map((c) => c.index)).toEqual([0, 1, 2, 3]);
    // Reliability .9 with a gap of −4: β(1 − ρ)Δ/τ = (0.6/0.9)(0.1)(−4)/2.5 ≈ −0.107, within the 25% share.
    const region = tolerableRegion(result);
    expect(region.tolerable).toContain(3);
    expect(region.notTolerable).toContain(0);
  });
});

describe('simulated matched difference agrees with Thorndike (1942) when matching is nearly exact', () => {
  it('a large comparison pool, reused partners, a narrow caliper: within 4 MC SE + 0.03 points of β(1 − ρ)Δ', () => {
    // As in closedFormVsSimulation.test.ts: from a pool of 6,000 with replacement and a caliper of 0.05 SD, partners
    // match on the observed pretest almost exactly, so the closed form's exact matching from an unlimited pool holds up
    // to leftover pretest differences (β·ρ·mean |x − x′| is below 0.03 points here; 0.03 points = 1.2% of the effect).
    const plan = demoPlan();
    plan.groups.comparison.poolSize = 6000;
    plan.matching.replacement = true;
    plan.matching.caliper = 0.05;
    const spec: ExploreSpec = {
      axes: [{ input: 'reliability', from: 0.7, to: 0.9, steps: 2 }], analysisId: 'matchedDifference', replications: 400, seed: 20261205,
    };
    expect(validateExploreSpec(plan, spec)).toEqual([]);
    for (const cell of exploreCells(plan, spec)) {
      const run = createPlanSimulation(cell.plan!, { replications: spec.replications, seed: spec.seed });
      run.runChunk(0, spec.replications);
      const s = summariseExploreCell(cell, run.finish(), spec);
      const rho = cell.values[0]!;
      // β(1 − ρ)Δ / τ with β = r·SD/(ρ·SD) = 0.6/ρ, Δ = −10, τ = 2.5.
      expect(s.closedFormShare).toBeCloseTo(((0.6 / rho) * (1 - rho) * -10) / 2.5, 10);
      expect(Math.abs(s.artefactShare! - s.closedFormShare!)).toBeLessThan(4 * s.artefactShareMCSE! + 0.03 / 2.5);
      expect(s.discardedShare).toBeLessThan(0.05);
    }
  });
});

describe('exploreCells without closed forms, filled in one cell at a time', () => {
  it('gives the same cells as the full grid once each is filled by withExploreClosedForm', () => {
    const spec: ExploreSpec = { axes: [{ input: 'reliability', from: 0.3, to: 0.9, steps: 3 }], analysisId: 'ancova', replications: 100, seed: 1 };
    const quick = exploreCells(demoPlan(), spec, { closedForms: false });
    expect(quick.every((c) => c.closedFormShare === undefined)).toBe(true);
    expect(quick[0]!.plan).toBeNull(); // reliability .3 < r² = .36: impossible without any closed form
    expect(quick.map((c) => withExploreClosedForm(c, spec))).toEqual(exploreCells(demoPlan(), spec));
  });
});
