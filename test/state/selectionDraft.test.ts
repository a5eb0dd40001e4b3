// Who gets the programme, in the draft and the store: the new fields survive
// every way a plan travels (draft, plan file, share link, autosave, undo),
// fields a rule does not read are hidden but never lost, and bad input gets a
// plain message while the typed text is kept. Store logic only (no numeric
// result is checked here: those come from core and are tested there).
import { describe, expect, it } from 'vitest';
import { validatePlan } from '../../src/core/validatePlan';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { AFTER_SCHOOL_MATHS, CLINIC_HIGH_READINGS, EXAMPLE_PLANS, SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';
import { parsePlanText, serializePlan } from '../../src/io/planFile';
import { decodePlanFromLink, encodePlanForLink } from '../../src/io/shareLink';
import { AUTOSAVE_KEY, readStoredDraft } from '../../src/state/persistenceSlice';
import { draftToCandidate, draftUsesSelection, isPlanDraft, planToDraft, withDraftDefaults, type PlanDraft } from '../../src/state/planDraft';
import { samePlan } from '../../src/state/samePlan';
import { makeStore, memoryStorage } from './helpers';

const SELECTION_EXAMPLES: [string, Plan][] = [
  ['cut-off on a screener', SCREENED_READING_SUPPORT],
  ['one group picked for high readings', CLINIC_HIGH_READINGS],
];

/** The plan a draft stands for (validated), or the problems. */
function planOf(draft: PlanDraft): Plan {
  const { candidate, problems } = draftToCandidate(draft);
  expect(problems).toEqual([]);
  const v = validatePlan(candidate);
  if (!v.ok) throw new Error(v.problems.map((p) => `${p.field}: ${p.message}`).join('\n'));
  return v.plan;
}

describe('selection plans round trip', () => {
  for (const [name, plan] of SELECTION_EXAMPLES) {
    it(`${name}: plan → draft → plan is the same plan`, () => {
      const draft = planToDraft(plan);
      expect(draftUsesSelection(draft)).toBe(true);
      expect(samePlan(planOf(draft), plan)).toBe(true);
    });
    it(`${name}: plan file and share link carry design, rule and population`, () => {
      const text = serializePlan(plan);
      for (const key of ['"design"', '"assignment"', '"population"']) expect(text).toContain(key);
      const fromFile = parsePlanText(text);
      expect(fromFile.ok && samePlan(fromFile.plan, plan)).toBe(true);
      const fromLink = decodePlanFromLink(encodePlanForLink(plan));
      expect(fromLink.ok && samePlan(fromLink.plan, plan)).toBe(true);
    });
  }

  it('group names equal to the rule\u2019s defaults follow the rule; names the researcher typed are kept', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(CLINIC_HIGH_READINGS));
    // The comparison name in the file is the default for a one-group study: the draft leaves it empty.
    expect(store.getState().draft.selectionLabels).toEqual({ programme: 'Patients invited to the course', comparison: '' });
    store.getState().setField('selectionLabels.programme', '');
    store.getState().setField('assignment.cutOff', '155');
    expect(store.getState().validPlan.groups.programme.label).toMatch(/155/);
    store.getState().setField('selectionLabels.programme', 'Course group');
    expect(store.getState().validPlan.groups.programme.label).toBe('Course group');
  });

  it('existing plans are untouched: their draft gives exactly the plan, with no design fields', () => {
    for (const ex of EXAMPLE_PLANS.filter((e) => e.plan.assignment === undefined)) {
      const back = planOf(planToDraft(ex.plan));
      expect(samePlan(back, ex.plan)).toBe(true);
      expect(back.design).toBeUndefined();
      expect(back.assignment).toBeUndefined();
      expect(back.population).toBeUndefined();
    }
  });
});

describe('hidden fields are kept, never lost', () => {
  it('choosing a rule and going back to existing groups restores the two groups as typed', () => {
    const store = makeStore();
    const demo = store.getState().validPlan;
    store.getState().setField('groups.programme.label', 'Typed name');
    const typedGroups = store.getState().draft.groups;
    store.getState().setField('assignment.rule', 'cut-off');
    // A rule with nothing typed yet for it: plain messages for the fields it needs, the groups kept.
    const fields = store.getState().problems.map((p) => p.field);
    expect(fields).toEqual(expect.arrayContaining(['assignment.cutOff', 'population.poolSize', 'population.pretestMean', 'population.pretestSD']));
    expect(store.getState().problems.find((p) => p.field === 'assignment.cutOff')?.message).toBe('Cut-off is required.');
    expect(store.getState().draft.groups).toEqual(typedGroups);
    store.getState().setField('assignment.rule', 'existing-groups');
    expect(store.getState().problems).toEqual([]);
    expect(store.getState().validPlan.groups.programme.label).toBe('Typed name');
    expect(samePlan({ ...store.getState().validPlan, groups: demo.groups }, demo)).toBe(true);
  });

  it('the spread and the screener reliability are kept while the rule or basis does not read them', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(SCREENED_READING_SUPPORT));
    store.getState().setField('assignment.rule', 'probability');
    store.getState().setField('assignment.spread', '3');
    expect(store.getState().validPlan.assignment).toMatchObject({ rule: 'probability', spread: 3, screenerReliability: 0.7 });
    store.getState().setField('assignment.rule', 'cut-off');
    store.getState().setField('assignment.basis', 'pretest');
    expect(store.getState().validPlan.assignment).toEqual({ rule: 'cut-off', basis: 'pretest', cutOff: 85, side: 'below' });
    expect(store.getState().draft.assignment).toMatchObject({ spread: '3', screenerReliability: '0.7' });
    store.getState().setField('assignment.basis', 'screener');
    store.getState().setField('assignment.rule', 'probability');
    expect(store.getState().validPlan.assignment).toMatchObject({ spread: 3, screenerReliability: 0.7 });
  });

  it('covariates and a multivariate distance are set aside under a rule and come back with existing groups', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(AFTER_SCHOOL_MATHS));
    const before = store.getState().validPlan;
    store.getState().setField('assignment.rule', 'cut-off');
    store.getState().setField('assignment.cutOff', '85');
    store.getState().setField('population.label', 'All pupils');
    store.getState().setField('population.poolSize', '2250');
    store.getState().setField('population.pretestMean', '100');
    store.getState().setField('population.pretestSD', '15');
    expect(store.getState().problems).toEqual([]);
    const ruled = store.getState().validPlan;
    expect(ruled.covariates).toBeUndefined();
    expect(ruled.matching.distance).toBeUndefined();
    expect(store.getState().draft.covariates).toHaveLength(4);
    store.getState().setField('assignment.rule', 'existing-groups');
    expect(samePlan(store.getState().validPlan, before)).toBe(true);
  });

  it('choosing a one-group design with existing groups moves the rule to a cut-off', () => {
    const store = makeStore();
    store.getState().setField('design', 'one-group');
    expect(store.getState().draft.assignment.rule).toBe('cut-off');
    store.getState().setField('design', 'two-groups');
    expect(store.getState().draft.assignment.rule).toBe('cut-off');
  });
});

describe('bad input and keeping work', () => {
  it('a cut-off that is not a number gets a plain message and stays as typed', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(SCREENED_READING_SUPPORT));
    store.getState().typeField('assignment.cutOff', '8O');
    expect(store.getState().draft.assignment.cutOff).toBe('8O');
    expect(store.getState().problems).toEqual([{ field: 'assignment.cutOff', message: 'Cut-off must be a number; got "8O".' }]);
    expect(store.getState().validPlan.assignment?.cutOff).toBe(85);
  });

  it('a cut-off that leaves too few people selected is explained under the cut-off', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(SCREENED_READING_SUPPORT));
    store.getState().setField('assignment.cutOff', '20');
    const p = store.getState().problems.find((x) => x.field === 'assignment.cutOff');
    expect(p?.message).toMatch(/Move the cut-off toward the population mean, or enlarge the population\./);
    expect(store.getState().draft.assignment.cutOff).toBe('20');
  });

  it('autosave keeps a selection draft exactly, and a draft saved before rules existed still opens (as existing groups)', () => {
    const storage = memoryStorage();
    const store = makeStore({ storage });
    store.getState().replacePlan(structuredClone(SCREENED_READING_SUPPORT));
    store.getState().typeField('assignment.spread', '2.5'); // typed for a rule not chosen: kept
    store.getState().autosave();
    const stored = readStoredDraft(storage, AUTOSAVE_KEY);
    expect(stored).toEqual({ status: 'ok', draft: store.getState().draft });
    const reopened = makeStore({ storage });
    expect(samePlan(reopened.getState().validPlan, store.getState().validPlan)).toBe(true);

    const old = structuredClone(planToDraft(demoPlan())) as Partial<PlanDraft>;
    delete old.design;
    delete old.assignment;
    delete old.population;
    delete old.selectionLabels;
    expect(isPlanDraft(old)).toBe(true);
    const filled = withDraftDefaults(old as PlanDraft);
    expect(filled.assignment.rule).toBe('existing-groups');
    expect(samePlan(planOf(filled), demoPlan())).toBe(true);
    // A stored draft whose selection part is damaged is not read as a draft.
    expect(isPlanDraft({ ...filled, assignment: { ...filled.assignment, side: 'sideways' } })).toBe(false);
    expect(isPlanDraft({ ...filled, population: { ...filled.population, poolSize: 3000 } })).toBe(false);
  });

  it('Undo after loading a selection example brings back the previous draft exactly', () => {
    const store = makeStore();
    store.getState().setField('groups.comparison.label', 'Typed before');
    const before = store.getState().draft;
    store.getState().loadExample('screened-reading-support');
    expect(store.getState().validPlan.assignment?.basis).toBe('screener');
    store.getState().undoReplace();
    expect(store.getState().draft).toEqual(before);
  });
});
