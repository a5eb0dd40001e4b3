// People in clusters, in the draft and the store: the clusters section and the
// matching level survive every way a plan travels (draft, plan file, share
// link, autosave, undo), hidden fields are kept, never lost, ICC presets go in
// as starting values labelled with their source, and bad input gets a plain
// message while the typed text is kept. Store logic only: the figures
// themselves come from core and are tested in test/core/clusters.test.ts.
import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/plan';
import { ICC_PRESETS } from '../../src/core/clusters/iccPresets';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { AFTER_SCHOOL_MATHS, SCHOOLS_MATCHED_ON_MEANS } from '../../src/io/examplePlans';
import { parsePlanText, serializePlan } from '../../src/io/planFile';
import { decodePlanFromLink, encodePlanForLink } from '../../src/io/shareLink';
import { AUTOSAVE_KEY, readStoredDraft } from '../../src/state/persistenceSlice';
import { draftToCandidate, draftUsesClusters, isPlanDraft, planToDraft, withDraftDefaults, type PlanDraft } from '../../src/state/planDraft';
import { samePlan } from '../../src/state/samePlan';
import { makeStore, memoryStorage } from './helpers';

function planOf(draft: PlanDraft): Plan {
  const { candidate, problems } = draftToCandidate(draft);
  expect(problems).toEqual([]);
  const v = validatePlan(candidate);
  if (!v.ok) throw new Error(v.problems.map((p) => `${p.field}: ${p.message}`).join('\n'));
  return v.plan;
}

/** The invented schools example with people matched across clusters and the same pupils retested (so both settings travel). */
const PEOPLE_LEVEL: Plan = {
  ...structuredClone(SCHOOLS_MATCHED_ON_MEANS),
  matching: { ...SCHOOLS_MATCHED_ON_MEANS.matching, level: 'people' },
  clusters: { size: 25, pretestICC: 0.2, cohort: 'same' },
};

describe('clustered plans round trip', () => {
  for (const [name, plan] of [
    ['schools matched on their means', SCHOOLS_MATCHED_ON_MEANS],
    ['pupils matched across schools, no posttest ICC', PEOPLE_LEVEL],
  ] as [string, Plan][]) {
    it(`${name}: plan → draft → plan, plan file and share link keep clusters and the matching level`, () => {
      expect(validatePlan(plan).ok).toBe(true);
      const draft = planToDraft(plan);
      expect(draftUsesClusters(draft)).toBe(true);
      expect(samePlan(planOf(draft), plan)).toBe(true);
      const text = serializePlan(plan);
      expect(text).toContain('"clusters"');
      expect(text).toContain(`"level": "${plan.matching.level}"`);
      const fromFile = parsePlanText(text);
      expect(fromFile.ok && samePlan(fromFile.plan, plan)).toBe(true);
      const fromLink = decodePlanFromLink(encodePlanForLink(plan));
      expect(fromLink.ok && samePlan(fromLink.plan, plan)).toBe(true);
    });
  }

  it('a plan without clusters gives a draft with clusters off and exactly the plan back (no level, no clusters)', () => {
    const back = planOf(planToDraft(demoPlan()));
    expect(samePlan(back, demoPlan())).toBe(true);
    expect(back.clusters).toBeUndefined();
    expect(back.matching.level).toBeUndefined();
  });
});

describe('hidden cluster fields are kept, never lost', () => {
  it('switching clusters off and on restores what was typed; the plan drops and regains them', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(SCHOOLS_MATCHED_ON_MEANS));
    store.getState().setField('clusters.inClusters', false);
    expect(store.getState().problems).toEqual([]);
    expect(store.getState().validPlan.clusters).toBeUndefined();
    expect(store.getState().validPlan.matching.level).toBeUndefined();
    expect(store.getState().draft.clusters).toMatchObject({ size: '25', pretestICC: '0.2', posttestICC: '0.25', cohort: 'new' });
    store.getState().setField('clusters.inClusters', true);
    expect(samePlan(store.getState().validPlan, SCHOOLS_MATCHED_ON_MEANS)).toBe(true);
  });

  it('covariates are set aside while clusters are on and come back when they are off', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(AFTER_SCHOOL_MATHS));
    const before = store.getState().validPlan;
    const people = before.groups.programme.poolSize;
    store.getState().setField('clusters.inClusters', true);
    store.getState().setField('clusters.size', '5');
    store.getState().setField('clusters.pretestICC', '0.1');
    store.getState().setField('groups.programme.poolSize', String(people - (people % 5)));
    store.getState().setField('groups.comparison.poolSize', String(before.groups.comparison.poolSize - (before.groups.comparison.poolSize % 5)));
    expect(store.getState().problems).toEqual([]);
    expect(store.getState().validPlan.covariates).toBeUndefined();
    expect(store.getState().validPlan.matching.distance).toBeUndefined();
    expect(store.getState().draft.covariates).toHaveLength(4);
    store.getState().setField('clusters.inClusters', false);
    expect(store.getState().validPlan.covariates).toHaveLength(4);
    expect(store.getState().validPlan.matching.distance).toBe(before.matching.distance);
  });

  it('a pool that is not a whole number of clusters gets a plain message naming the numbers that would do, and the typed text stays', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(SCHOOLS_MATCHED_ON_MEANS));
    store.getState().setField('groups.programme.poolSize', '760');
    const p = store.getState().problems.find((x) => x.field === 'groups.programme.poolSize');
    expect(p?.message).toMatch(/whole number of clusters of 25; got 760 \(750 or 775 would do\)/);
    expect(store.getState().draft.groups.programme.poolSize).toBe('760');
    // The results on screen stay those of the last complete plan.
    expect(store.getState().analyticStale).toBe(true);
    expect(store.getState().validPlan.groups.programme.poolSize).toBe(750);
  });

  it('an ICC that is not a number, and matching people with a new cohort, each get a plain message', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(SCHOOLS_MATCHED_ON_MEANS));
    store.getState().setField('clusters.pretestICC', '.2o');
    expect(store.getState().problems.find((x) => x.field === 'clusters.pretestICC')?.message).toBe('Pretest ICC must be a number; got ".2o".');
    store.getState().setField('clusters.pretestICC', '0.2');
    store.getState().setField('matching.level', 'people');
    const p = store.getState().problems.find((x) => /new cohort/.test(x.message));
    expect(p?.message).toMatch(/Matching people needs the same people at the posttest/);
    // An empty posttest ICC is allowed: it follows the pretest ICC.
    store.getState().setField('matching.level', 'clusters');
    store.getState().setField('clusters.posttestICC', '');
    expect(store.getState().problems).toEqual([]);
    expect(store.getState().validPlan.clusters?.posttestICC).toBeUndefined();
  });
});

describe('ICC presets', () => {
  it('put the preset value in the chosen field, labelled with its source; typing over it drops the label', () => {
    const store = makeStore();
    store.getState().replacePlan(structuredClone(SCHOOLS_MATCHED_ON_MEANS));
    const preset = ICC_PRESETS.find((p) => p.conditioning === 'unconditional' && p.icc !== 0.2)!;
    store.getState().applyIccPreset('clusters.pretestICC', preset.id);
    expect(store.getState().draft.clusters.pretestICC).toBe(String(preset.icc));
    expect(store.getState().validPlan.clusters?.pretestICC).toBe(preset.icc);
    const note = store.getState().validPlan.provenance?.['clusters.pretestICC'];
    expect(note?.source).toBe('entered');
    expect(note?.note).toContain(preset.label);
    expect(note?.note).toMatch(/Hedges & Hedberg \(2007\)/);
    expect(note?.note).toMatch(/from memory/);
    // The label travels in the plan file.
    expect(serializePlan(store.getState().validPlan)).toContain('Starting value from a preset');
    store.getState().setField('clusters.pretestICC', '0.18');
    expect(store.getState().validPlan.provenance?.['clusters.pretestICC']).toBeUndefined();
    // An unknown preset changes nothing.
    const draft = store.getState().draft;
    store.getState().applyIccPreset('clusters.posttestICC', 'no-such-preset');
    expect(store.getState().draft).toBe(draft);
  });
});

describe('autosave and undo', () => {
  it('autosave keeps a clusters draft exactly; a draft saved before clusters existed still opens, clusters off', () => {
    const storage = memoryStorage();
    const store = makeStore({ storage });
    store.getState().replacePlan(structuredClone(SCHOOLS_MATCHED_ON_MEANS));
    store.getState().setField('clusters.inClusters', false); // kept, though set aside
    store.getState().autosave();
    expect(readStoredDraft(storage, AUTOSAVE_KEY)).toEqual({ status: 'ok', draft: store.getState().draft });
    const reopened = makeStore({ storage });
    expect(reopened.getState().draft.clusters).toEqual(store.getState().draft.clusters);

    const old = structuredClone(planToDraft(demoPlan())) as Partial<PlanDraft>;
    delete old.clusters;
    delete (old.matching as Partial<PlanDraft['matching']>).level;
    expect(isPlanDraft(old)).toBe(true);
    const filled = withDraftDefaults(old as PlanDraft);
    expect(filled.clusters.inClusters).toBe(false);
    expect(filled.matching.level).toBe('people');
    expect(samePlan(planOf(filled), demoPlan())).toBe(true);
    expect(isPlanDraft({ ...filled, clusters: { ...filled.clusters, size: 25 } })).toBe(false);
    expect(isPlanDraft({ ...filled, matching: { ...filled.matching, level: 'schools' } })).toBe(false);
  });

  it('Undo after loading the schools example brings back the previous draft exactly', () => {
    const store = makeStore();
    store.getState().setField('groups.comparison.label', 'Typed before');
    const before = store.getState().draft;
    store.getState().loadExample('schools-matched-on-means');
    expect(store.getState().validPlan.clusters?.cohort).toBe('new');
    store.getState().undoReplace();
    expect(store.getState().draft).toEqual(before);
  });
});
