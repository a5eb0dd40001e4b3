// The pilot slice on a plain store (no React): read an invented pilot file,
// map its columns, estimate, and write the estimates into the plan through
// the draft. Every estimate is src/pilot's; the checks here are that the
// store passes them on unchanged, that the plan then holds exactly the values
// pilotPlanUpdate chose (with their provenance), that results follow, and
// that a bad file leaves the plan untouched. Group sizes and the plain means
// are also checked against an independent library (simple-statistics).
import { mean } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import { pilotPlanUpdate } from '../../src/pilot/pilotPlanUpdate';
import { defaultDeps } from '../../src/state/defaultDeps';
import { draftProvenance } from '../../src/state/draftSlice';
import { PILOT_MAPPING_KEY } from '../../src/state/pilotSlice';
import { createMeanwardStore } from '../../src/state/store';
import type { SimulationResult } from '../../src/sim/types';
import { controlledRunner, memoryStorage } from './helpers';
import { inventedPilot } from './pilotTestData';

function store(
  opts: { session?: ReturnType<typeof memoryStorage>; storage?: ReturnType<typeof memoryStorage>; simulation?: ReturnType<typeof controlledRunner>['runner'] } = {},
) {
  const deps = { ...defaultDeps(opts.simulation ?? null), storage: opts.storage ?? null };
  return createMeanwardStore({ deps, demo: demoPlan, pilot: { session: opts.session ?? memoryStorage() } });
}

/**
 * Estimates are typed into the form with 6 significant digits (PILOT_DRAFT_DIGITS), so a plan
 * value may differ from the estimate by at most half a unit in the 6th digit: relative 5e-6.
 */
function expectWritten(planValue: number | undefined, estimate: number) {
  expect(planValue).toBeDefined();
  expect(Math.abs(planValue! - estimate)).toBeLessThanOrEqual(5e-6 * Math.abs(estimate));
}

/** Every number in `actual` within 5e-6 (relative) of `expected`, same shape otherwise. */
function expectSameWithin(actual: unknown, expected: unknown, path = ''): void {
  if (typeof expected === 'number') return expectWritten(actual as number, expected);
  if (expected && typeof expected === 'object') {
    expect(Object.keys(actual as object).sort(), path).toEqual(Object.keys(expected).sort());
    for (const [k, v] of Object.entries(expected)) expectSameWithin((actual as Record<string, unknown>)[k], v, `${path}.${k}`);
    return;
  }
  expect(actual, path).toEqual(expected);
}

const DATA = inventedPilot({ seed: 2026, programme: 80, comparison: 120, items: 6, retest: true, posttest: true });

async function readAndEstimate(s: ReturnType<typeof store>, text = DATA.text, name = 'wave1-invented.csv') {
  await s.getState().readPilotFile(text, name);
  await s.getState().estimateFromPilot();
}

describe('pilot slice: reading and mapping', () => {
  it('reads the file, guesses the mapping from the column names, and leaves the plan alone', async () => {
    const s = store();
    const draftBefore = s.getState().draft;
    await s.getState().readPilotFile(DATA.text, 'wave1-invented.csv');
    const p = s.getState().pilot;
    expect(p.status).toBe('mapping');
    expect(p.summary?.rowCount).toBe(200);
    expect(p.mapping).toMatchObject({
      group: 'group',
      programmeValue: 'programme',
      pretestKind: 'items',
      itemColumns: ['item1', 'item2', 'item3', 'item4', 'item5', 'item6'],
      combine: 'sum',
      retest: 'retest',
      posttest: 'posttest',
    });
    expect(p.announcement).toMatch(/^Read “wave1-invented\.csv”: 200 rows and 10 columns\./);
    expect(s.getState().draft).toBe(draftBefore);
  });

  it('says what is still to choose instead of estimating from an incomplete mapping', async () => {
    const s = store();
    await s.getState().readPilotFile(DATA.text, 'x.csv');
    s.getState().setPilotMapping({ pretestKind: 'total', pretestColumn: '' });
    await s.getState().estimateFromPilot();
    expect(s.getState().pilot.problem).toEqual({ stage: 'map', message: 'Choose the pretest column (the total score).' });
    expect(s.getState().pilot.estimates).toBeNull();
  });

  it('remembers the mapping for the session (by column names, never rows) and restores it for the same layout', async () => {
    const session = memoryStorage();
    const a = store({ session });
    await a.getState().readPilotFile(DATA.text, 'x.csv');
    a.getState().setPilotMapping({ combine: 'mean', itemColumns: ['item1', 'item2', 'item3'] });
    await a.getState().estimateFromPilot();
    const saved = session.data.get(PILOT_MAPPING_KEY)!;
    expect(saved).toContain('"combine":"mean"');
    expect(saved).not.toContain(String(DATA.rows[0]!.items[0])); // no data values
    const b = store({ session });
    const other = inventedPilot({ seed: 7, programme: 30, comparison: 30, items: 6, retest: true, posttest: true });
    await b.getState().readPilotFile(other.text, 'y.csv');
    expect(b.getState().pilot.mappingRemembered).toBe(true);
    expect(b.getState().pilot.mapping).toMatchObject({ combine: 'mean', itemColumns: ['item1', 'item2', 'item3'] });
  });

  it('reads the file again when the delimiter or header is overridden', async () => {
    const s = store();
    await s.getState().readPilotFile(DATA.text, 'x.csv');
    await s.getState().setPilotReadOptions({ header: false });
    const p = s.getState().pilot;
    expect(p.summary?.hasHeader).toBe(false);
    expect(p.summary?.rowCount).toBe(201); // the header row is now data
    expect(p.summary?.columns[0]?.name).toBe('column 1');
  });
});

describe('pilot slice: estimates', () => {
  it('passes estimatePilot’s result on unchanged; n and means agree with an independent library', async () => {
    const s = store();
    await readAndEstimate(s);
    const e = s.getState().pilot.estimates!;
    const mapping = {
      group: 'group',
      programmeValue: 'programme',
      pretest: { kind: 'items' as const, columns: ['item1', 'item2', 'item3', 'item4', 'item5', 'item6'], combine: 'sum' as const },
      retest: 'retest',
      posttest: 'posttest',
    };
    expect(e).toEqual(estimatePilot(parseDelimitedText(DATA.text), mapping, 'wave1-invented.csv'));
    expect(s.getState().pilot.status).toBe('estimated');
    // Group sizes are known by construction (80 and 120 invented people).
    expect(e.groups.programme.n).toBe(80);
    expect(e.groups.comparison.n).toBe(120);
    // Programme pretest mean = mean of the item sums (simple-statistics `mean`; tolerance 1e-9, rounding only).
    const sums = DATA.rows.filter((r) => r.group === 'programme').map((r) => r.items.reduce((a, b) => a + b, 0));
    expect(Math.abs(e.groups.programme.pretestMean - mean(sums))).toBeLessThan(1e-9);
  });

  it('a changed mapping drops the estimates (they belonged to the old mapping)', async () => {
    const s = store();
    await readAndEstimate(s);
    s.getState().setPilotMapping({ posttest: '' });
    expect(s.getState().pilot.estimates).toBeNull();
    expect(s.getState().pilot.status).toBe('mapping');
  });

  it('a non-numeric cell is reported with its column and spreadsheet row, and the plan is untouched', async () => {
    const s = store();
    s.getState().setField('groups.programme.poolSize', '25x'); // an unfinished value the researcher is typing
    const draftBefore = s.getState().draft;
    const planBefore = s.getState().validPlan;
    // Data row 13 is line 15 of the file (a comment line and the header come first).
    const bad = inventedPilot({ seed: 1, programme: 20, comparison: 20, items: 6, posttest: true, badCell: { row: 13, column: 'item4', text: '3.5kg' } });
    await readAndEstimate(s, bad.text, 'bad-invented.csv');
    const p = s.getState().pilot;
    expect(p.estimates).toBeNull();
    expect(p.problem).toMatchObject({ stage: 'estimate', column: 'item4', row: 15 });
    expect(p.problem?.message).toContain('3.5kg');
    expect(p.announcement).toMatch(/^No estimates; your plan is unchanged\./);
    expect(s.getState().draft).toBe(draftBefore);
    expect(s.getState().validPlan).toBe(planBefore);
  });

  it('a row with more cells than the header is reported when read (a comma inside an unquoted cell)', async () => {
    const s = store();
    const bad = inventedPilot({ seed: 1, programme: 20, comparison: 20, items: 6, badCell: { row: 13, column: 'item4', text: '3,5' } });
    await s.getState().readPilotFile(bad.text, 'ragged-invented.csv');
    expect(s.getState().pilot.problem).toMatchObject({ stage: 'read', row: 15 });
    expect(s.getState().pilot.status).toBe('empty');
  });

  it('an empty file is reported when read, and the plan is untouched', async () => {
    const s = store();
    const draftBefore = s.getState().draft;
    await s.getState().readPilotFile('# only a comment\n', 'empty.csv');
    const p = s.getState().pilot;
    expect(p.status).toBe('empty');
    expect(p.problem).toMatchObject({ stage: 'read' });
    expect(p.problem?.message).toMatch(/comment line/);
    expect(s.getState().draft).toBe(draftBefore);
  });
});

describe('pilot slice: into the plan', () => {
  it('"Use these values" writes exactly pilotPlanUpdate’s values with their notes; results follow; autosave keeps them', async () => {
    const storage = memoryStorage();
    const s = store({ storage });
    await readAndEstimate(s);
    // With a retest mapped, the suggested reliability is the test–retest correlation (the researcher may choose alpha).
    const expected = pilotPlanUpdate(s.getState().validPlan, s.getState().pilot.estimates!, { reliability: 'test-retest' });
    s.getState().applyPilotEstimates();
    const st = s.getState();
    expect(st.problems).toEqual([]);
    expectSameWithin(st.validPlan.groups, expected.plan.groups);
    expectSameWithin(st.validPlan.pretest, expected.plan.pretest);
    expectSameWithin(st.validPlan.outcome, expected.plan.outcome);
    // The box shows the value without floating-point noise (6 significant digits).
    expect(st.draft.groups.programme.pretestMean).toMatch(/^\d+(\.\d{1,4})?$/);
    expect(st.validPlan.provenance).toEqual(expected.plan.provenance);
    expect(st.pilot.lastApply).toEqual({ applied: expected.applied, skipped: expected.skipped, pessimistic: false });
    // The closed-form results are those of the new plan (no separate computation in the store).
    expect(st.analytic).toEqual(analysePlan(st.validPlan));
    expect(st.analyticStale).toBe(false);
    // Autosave holds the draft with its provenance: a new session shows the same notes.
    const again = store({ storage });
    expect(again.getState().validPlan.provenance).toEqual(expected.plan.provenance);
    expect(st.pilot.announcement).toMatch(/plan fields filled from “wave1-invented\.csv”/);
  });

  it('marks a finished simulation out of date when the pilot values go in', async () => {
    const c = controlledRunner();
    const s = store({ simulation: c.runner });
    const run = s.getState().runSimulation();
    // Only the fields the store reads; the figures themselves are not under test here.
    c.runs[0]!.resolve({ plan: c.runs[0]!.plan, seed: 1, replications: 1 } as unknown as SimulationResult);
    await run;
    expect(s.getState().simulation.stale).toBe(false);
    await readAndEstimate(s);
    expect(s.getState().simulation.stale).toBe(false); // estimating alone changes nothing
    s.getState().applyPilotEstimates();
    expect(s.getState().simulation.stale).toBe(true);
  });

  it('previews exactly what the buttons would write, without writing it', async () => {
    const s = store();
    await readAndEstimate(s);
    const draft = s.getState().draft;
    const preview = s.getState().previewPilotUpdate()!;
    expect(preview.update).toEqual(pilotPlanUpdate(s.getState().validPlan, s.getState().pilot.estimates!, { reliability: 'test-retest' }));
    expect(preview.pessimistic.ok && preview.pessimistic.reliability).toBe(s.getState().pilot.estimates!.reliability.testRetest!.lower);
    s.getState().setPilotReliabilitySource('alpha');
    expect(s.getState().previewPilotUpdate()!.update).toEqual(pilotPlanUpdate(s.getState().validPlan, s.getState().pilot.estimates!, { reliability: 'alpha' }));
    expect(s.getState().draft).toBe(draft);
  });

  it('keeps text the researcher is typing in a field the pilot does not fill', async () => {
    const s = store();
    await readAndEstimate(s);
    s.getState().setField('matching.caliper', '0.');
    s.getState().applyPilotEstimates();
    expect(s.getState().draft.matching.caliper).toBe('0.');
    expectWritten(Number(s.getState().draft.groups.programme.pretestMean), s.getState().pilot.estimates!.groups.programme.pretestMean);
  });

  it('switches an SEM-mode plan to the reliability the pilot gives', async () => {
    const s = store();
    s.getState().setPretestMode('sem');
    s.getState().setField('pretest.sem', '5');
    await readAndEstimate(s);
    s.getState().setPilotReliabilitySource('alpha');
    s.getState().applyPilotEstimates();
    expect(s.getState().draft.pretest.mode).toBe('reliability');
    expectWritten(s.getState().validPlan.pretest.reliability, s.getState().pilot.estimates!.reliability.alpha!.value);
    expect(s.getState().validPlan.pretest.sem).toBeUndefined();
  });

  it('the pessimistic button plans with the lower end of alpha’s Feldt interval and says so in the note', async () => {
    const s = store();
    await readAndEstimate(s);
    s.getState().setPilotReliabilitySource('alpha');
    s.getState().applyPessimisticPilotEstimates();
    const alpha = s.getState().pilot.estimates!.reliability.alpha!;
    const plan = s.getState().validPlan;
    expectWritten(plan.pretest.reliability, alpha.lower);
    expect(plan.provenance?.['pretest.reliability']?.note).toMatch(/^pessimistic \(lower end of the 95% CI\): from pilot file wave1-invented\.csv/);
    expect(s.getState().pilot.lastApply?.pessimistic).toBe(true);
    expect(s.getState().pilot.lastApply?.applied.find((a) => a.path === 'pretest.reliability')?.value).toBe(alpha.lower);
    expect(s.getState().analytic).toEqual(analysePlan(plan));
  });

  it('without a reliability interval the pessimistic button explains why and changes nothing', async () => {
    const s = store();
    const totalOnly = inventedPilot({ seed: 4, programme: 40, comparison: 40, items: 0, posttest: true });
    await s.getState().readPilotFile(totalOnly.text, 'totals.csv');
    expect(s.getState().pilot.mapping).toMatchObject({ pretestKind: 'total', pretestColumn: 'pretest' });
    await s.getState().estimateFromPilot();
    const draftBefore = s.getState().draft;
    s.getState().applyPessimisticPilotEstimates();
    expect(s.getState().draft).toBe(draftBefore);
    expect(s.getState().pilot.problem?.message).toMatch(/no confidence interval/);
  });

  it('a value that breaks a plan rule is left out with its reason (pre–post correlation above √reliability)', async () => {
    // Posttest = pretest total + tiny noise: r ≈ 1 > √alpha, impossible under classical test theory (Spearman 1904).
    const base = inventedPilot({ seed: 9, programme: 60, comparison: 60, items: 4 });
    const lines = base.text.trimEnd().split('\n');
    const text = [lines[0], `${lines[1]},posttest`, ...lines.slice(2).map((l, i) => `${l},${(base.rows[i]!.total + (i % 3) * 0.01).toFixed(2)}`)].join('\n');
    const s = store();
    await readAndEstimate(s, text, 'too-close.csv');
    const before = s.getState().validPlan.outcome.prePostCorrelation;
    s.getState().applyPilotEstimates();
    const skipped = s.getState().pilot.lastApply!.skipped;
    expect(skipped.map((k) => k.path)).toEqual(['outcome.prePostCorrelation']);
    expect(skipped[0]!.reason).toMatch(/^Not written: /);
    expect(s.getState().validPlan.outcome.prePostCorrelation).toBe(before);
    expect(draftProvenance(s.getState().draft)?.['outcome.prePostCorrelation']).toBeUndefined();
    expect(s.getState().problems).toEqual([]);
  });

  it('closing the file forgets it and its estimates; the plan keeps what was used', async () => {
    const s = store();
    await readAndEstimate(s);
    s.getState().applyPilotEstimates();
    const plan = s.getState().validPlan;
    s.getState().clearPilot();
    expect(s.getState().pilot).toMatchObject({ status: 'empty', summary: null, estimates: null, fileName: null });
    expect(s.getState().validPlan).toBe(plan);
  });
});
