// Not losing work, on a plain store (no React): malformed share links are
// reported; an unreadable autosave is reported and kept for download; every
// replace of the whole plan (reset, file, link, example, pilot values) can be
// undone exactly; each tab keeps its own draft; and a half-typed value is
// never adopted as "the last complete plan" (nor sent for quick figures).
import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/plan';
import type { PlannedProcedureEstimates } from '../../src/core/plannedProcedure';
import { demoPlan } from '../../src/io/demoPlan';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { decodePlanFromLink, encodePlanForLink } from '../../src/io/shareLink';
import { defaultDeps } from '../../src/state/defaultDeps';
import { draftProvenance, TYPING_PAUSE_MS } from '../../src/state/draftSlice';
import type { PlannedProcedureRunner } from '../../src/state/deps';
import {
  AUTOSAVE_KEY,
  isShareFragment,
  restoreDrafts,
  TAB_DRAFT_KEY,
  UNREADABLE_KEY,
} from '../../src/state/persistenceSlice';
import { createMeanwardStore } from '../../src/state/store';
import { makeStore, manualClock, memoryStorage } from './helpers';
import { inventedPilot } from './pilotTestData';

const DEMO_R = demoPlan().outcome.prePostCorrelation; // 0.6 in the invented demo

describe('share links that cannot be read', () => {
  it('treats any "#plan…" fragment as a link to read, and other fragments as not links', () => {
    for (const f of ['#plan=abc', '#plan', '#PLAN=abc', '#plan:eyJ', '#plan%3DeyJ', '# plan=', '#view=x&plan=abc', '#plan%']) {
      expect(isShareFragment(f), f).toBe(true);
    }
    for (const f of ['', '#', '#results', '#exports-panel', '#view=report']) expect(isShareFragment(f), f).toBe(false);
  });

  it('says a malformed "#plan" link could not be read, and keeps the current plan (typed text included)', () => {
    const store = makeStore();
    store.getState().setField('outcome.growthGap', '2.5x'); // unfinished text must survive
    const before = store.getState().draft;
    const plan = store.getState().validPlan;
    for (const f of ['#plan', '#PLAN=eyJmb3Jt', '#plan:eyJmb3Jt', '#plan%3DeyJmb3Jt', '#plan%']) {
      store.getState().dismissNotice();
      expect(store.getState().openShareFragment(f), f).toBe(false);
      expect(store.getState().draft, f).toBe(before);
      expect(store.getState().validPlan, f).toBe(plan);
      const notice = store.getState().notice;
      expect(notice?.kind, f).toBe('error');
      expect(notice?.text, f).toMatch(/^The shared link could not be read, so your current plan is unchanged\. This link is garbled/);
    }
    // The message quotes what the address holds (cut to 40 characters, control characters escaped).
    const r = decodePlanFromLink(`#plan\u0007${'x'.repeat(60)}`);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems[0]!.message).toContain('"#plan\\u0007xxxx');
  });
});

describe('an autosave that cannot be read', () => {
  it('is reported, kept under its own key until dismissed, and the planner starts from the demo', () => {
    const storage = memoryStorage();
    const raw = '{"version":1,"draft":{"title":"My study","groups":'; // cut short
    storage.setItem(AUTOSAVE_KEY, raw);
    const a = makeStore({ storage });
    expect(a.getState().unreadableDrafts).toEqual([{ from: 'browser', text: raw }]);
    expect(a.getState().restoredFrom).toBeNull();
    expect(a.getState().validPlan.groups.programme.poolSize).toBe(demoPlan().groups.programme.poolSize);
    expect(a.getState().unreadableDraftFile()).toBe(raw); // downloaded exactly as stored
    // Editing overwrites the autosave, but the unreadable copy stays kept…
    a.getState().setField('title', 'New start');
    expect(storage.getItem(AUTOSAVE_KEY)).not.toBe(raw);
    expect(JSON.parse(storage.getItem(UNREADABLE_KEY)!)).toEqual({ version: 1, drafts: [{ from: 'browser', text: raw }] });
    // …and is still offered on the next visit, until dismissed.
    const b = makeStore({ storage });
    expect(b.getState().unreadableDrafts).toEqual([{ from: 'browser', text: raw }]);
    expect(b.getState().draft.title).toBe('New start');
    b.getState().dismissUnreadableDrafts();
    expect(b.getState().unreadableDrafts).toEqual([]);
    expect(storage.getItem(UNREADABLE_KEY)).toBeNull();
    expect(makeStore({ storage }).getState().unreadableDrafts).toEqual([]);
  });

  it('reports every kind of damage: not JSON, wrong version, wrong shape, a JSON null', () => {
    for (const raw of ['not json', '{"version":2,"draft":{}}', '{"version":1,"draft":{"title":3}}', 'null', '[]', '\u0000\u0001']) {
      const storage = memoryStorage();
      storage.setItem(AUTOSAVE_KEY, raw);
      const s = makeStore({ storage }).getState();
      expect(s.unreadableDrafts, raw).toEqual([{ from: 'browser', text: raw }]);
      expect(s.problems, raw).toEqual([]);
    }
  });

  it("falls back from this tab's unreadable draft to the browser's last draft, and keeps both when both are unreadable", () => {
    const storage = memoryStorage();
    const session = memoryStorage();
    const good = makeStore({ storage });
    good.getState().setField('title', 'Shared draft');
    session.setItem(TAB_DRAFT_KEY, '{"version":1');
    const s = makeStore({ storage, session }).getState();
    expect(s.draft.title).toBe('Shared draft');
    expect(s.restoredFrom).toBe('browser');
    expect(s.unreadableDrafts).toEqual([{ from: 'tab', text: '{"version":1' }]);

    storage.setItem(AUTOSAVE_KEY, 'garbage');
    const both = restoreDrafts({ storage, session });
    expect(both.draft).toBeNull();
    expect(both.unreadable.map((d) => d.text)).toEqual(['{"version":1', 'garbage']);
    const file = makeStore({ storage, session }).getState().unreadableDraftFile();
    expect(file).toContain('{"version":1');
    expect(file).toContain('garbage');
  });
});

describe('undo for every replace of the whole plan', () => {
  /** A draft with typed (invalid) text, provenance and a covariate row: what undo must bring back exactly. */
  function workedOnStore() {
    const store = makeStore();
    store.getState().addCovariate();
    store.getState().setField('covariates.0.name', 'Attendance');
    store.getState().setField('outcome.growthGap', '1.5 pts'); // invalid text, kept as typed
    const d = store.getState().draft;
    store.getState().replaceDraft({ ...d, provenance: { 'pretest.reliability': { source: 'pilot', note: 'from an invented pilot' } } } as typeof d);
    return store;
  }
  const file = makeStore().getState().planFileText();
  const link = encodePlanForLink({ ...demoPlan(), title: 'From a link' });
  const replaces: [string, (s: ReturnType<typeof makeStore>) => void][] = [
    ['reset to the demo', (s) => s.getState().resetToDemo()],
    ['open a plan file', (s) => void s.getState().openPlanText(file, 'colleague.json')],
    ['open a share link', (s) => void s.getState().openShareFragment(link)],
    ['load an example', (s) => s.getState().loadExample(EXAMPLE_PLANS[1]!.id)],
  ];
  for (const [name, replace] of replaces) {
    it(`${name}: Undo brings back the previous draft exactly, Redo puts the replacement back`, () => {
      const store = workedOnStore();
      const before = store.getState().draft;
      const problemsBefore = store.getState().problems;
      replace(store);
      const after = store.getState().draft;
      expect(after).not.toEqual(before);
      expect(store.getState().notice?.action).toBe('undo');
      store.getState().undoReplace();
      expect(store.getState().draft).toEqual(before);
      expect(draftProvenance(store.getState().draft)).toEqual({ 'pretest.reliability': { source: 'pilot', note: 'from an invented pilot' } });
      expect(store.getState().draft.covariates[0]?.name).toBe('Attendance');
      expect(store.getState().problems).toEqual(problemsBefore);
      expect(store.getState().notice).toMatchObject({ kind: 'info', action: 'redo' });
      expect(store.getState().notice?.text).toMatch(/^Brought back your plan from before the /);
      store.getState().undoReplace();
      expect(store.getState().draft).toEqual(after);
      expect(store.getState().notice?.action).toBe('undo');
    });
  }

  it('pilot "Use these values": Undo takes the values out again and says so in the pilot panel', async () => {
    const store = makeStore();
    store.getState().setField('title', 'Before the pilot');
    const before = store.getState().draft;
    const data = inventedPilot({ seed: 7, programme: 40, comparison: 60, items: 4, retest: false, posttest: true });
    await store.getState().readPilotFile(data.text, 'invented.csv');
    await store.getState().estimateFromPilot();
    store.getState().applyPilotEstimates();
    expect(store.getState().draft).not.toEqual(before);
    expect(store.getState().notice).toMatchObject({ kind: 'info', action: 'undo' });
    expect(store.getState().notice?.text).toMatch(/filled from “invented\.csv”/);
    store.getState().undoReplace();
    expect(store.getState().draft).toEqual(before);
    expect(store.getState().pilot.lastApply).toBeNull();
    expect(store.getState().pilot.announcement).toMatch(/taken out of the plan again/);
  });

  it('a failed open offers no undo and changes nothing; dismissing the message drops the undo', () => {
    const store = makeStore();
    store.getState().resetToDemo();
    store.getState().dismissNotice();
    expect(store.getState().undoable).toBeNull();
    const before = store.getState().draft;
    store.getState().undoReplace(); // nothing to undo: no change
    expect(store.getState().draft).toBe(before);
    store.getState().openPlanText('["milk"]', 'shopping.json');
    expect(store.getState().notice?.action).toBeUndefined();
    expect(store.getState().draft).toBe(before);
  });
});

describe('each tab keeps its own draft', () => {
  it("opening a link in a second tab leaves the first tab's autosaved edits alone", () => {
    const shared = memoryStorage();
    const tabA = memoryStorage();
    const a = makeStore({ storage: shared, session: tabA });
    a.getState().setField('title', 'Edits in tab A');
    a.getState().setField('matching.caliper', '0.3x'); // half-typed, kept as typed

    // Tab B opens with a link: it starts from the shared last draft, then the link replaces it in B only.
    const b = makeStore({ storage: shared, session: memoryStorage() });
    expect(b.getState().draft.title).toBe('Edits in tab A');
    expect(b.getState().openShareFragment(encodePlanForLink({ ...demoPlan(), title: 'Linked plan' }))).toBe(true);
    expect(b.getState().draft.title).toBe('Linked plan');

    // Tab A reloads: its own draft. A new tab without a link: still A's, the last draft anyone edited.
    const aAgain = makeStore({ storage: shared, session: tabA });
    expect(aAgain.getState().draft.title).toBe('Edits in tab A');
    expect(aAgain.getState().draft.matching.caliper).toBe('0.3x');
    expect(aAgain.getState().restoredFrom).toBe('tab');
    expect(makeStore({ storage: shared, session: memoryStorage() }).getState().draft.title).toBe('Edits in tab A');

    // Once B edits the linked plan, it is B's work: B's draft becomes the shared last draft…
    b.getState().setField('outcome.growthGap', '1');
    const c = makeStore({ storage: shared, session: memoryStorage() });
    expect(c.getState().draft.title).toBe('Linked plan');
    expect(c.getState().restoredFrom).toBe('browser');
    // …while A still reloads into its own.
    expect(makeStore({ storage: shared, session: tabA }).getState().draft.title).toBe('Edits in tab A');
  });
});

/** A quick-figures runner that records what it was asked for and never answers. */
function countingRunner() {
  const plans: Plan[] = [];
  const runner: PlannedProcedureRunner = {
    estimate: (plan) => {
      plans.push(plan);
      return new Promise<PlannedProcedureEstimates | null>(() => undefined);
    },
  };
  return { runner, plans };
}

describe('a half-typed value is never the last complete plan', () => {
  function typingStore() {
    const clock = manualClock();
    const quick = countingRunner();
    const store = createMeanwardStore({
      deps: { ...defaultDeps(null, quick.runner), storage: null, session: null, schedule: clock.schedule },
      demo: demoPlan,
    });
    return { store, clock, quick };
  }
  const typeOut = (store: ReturnType<typeof typingStore>['store'], path: string, text: string) => {
    for (let i = 0; i <= text.length; i++) store.getState().typeField(path, text.slice(0, i));
  };

  it('typing 0.95 (too high) keeps the results of the plan entered before, not of r = 0 from the first keystroke', () => {
    const { store, clock, quick } = typingStore();
    const planBefore = store.getState().validPlan;
    typeOut(store, 'outcome.prePostCorrelation', '0.95');
    const s = store.getState();
    expect(s.draft.outcome.prePostCorrelation).toBe('0.95');
    expect(s.problems.map((p) => p.field)).toContain('outcome.prePostCorrelation');
    expect(s.analyticStale).toBe(true);
    expect(s.validPlan).toBe(planBefore);
    expect(s.validPlan.outcome.prePostCorrelation).toBe(DEMO_R);
    // Nothing waits to be adopted, and no quick figures were asked for any keystroke.
    clock.advance(10 * TYPING_PAUSE_MS);
    expect(store.getState().validPlan).toBe(planBefore);
    expect(quick.plans).toHaveLength(1); // the demo's, at start
  });

  it('a valid typed value becomes the plan when typing pauses, once, with one request for quick figures', () => {
    const { store, clock, quick } = typingStore();
    typeOut(store, 'outcome.prePostCorrelation', '0.45');
    expect(store.getState().draftPending).toBe(true);
    expect(store.getState().problems).toEqual([]);
    expect(store.getState().analyticStale).toBe(false);
    expect(store.getState().validPlan.outcome.prePostCorrelation).toBe(DEMO_R);
    clock.advance(TYPING_PAUSE_MS - 1);
    expect(store.getState().validPlan.outcome.prePostCorrelation).toBe(DEMO_R);
    clock.advance(1);
    expect(store.getState().validPlan.outcome.prePostCorrelation).toBe(0.45);
    expect(store.getState().draftPending).toBe(false);
    expect(quick.plans.map((p) => p.outcome.prePostCorrelation)).toEqual([DEMO_R, 0.45]);
  });

  it('leaving the field (or Enter) adopts the typed value at once; typing the same plan back adopts nothing new', () => {
    const { store, clock, quick } = typingStore();
    store.getState().typeField('matching.caliper', '0.1');
    store.getState().commitDraft();
    expect(store.getState().validPlan.matching.caliper).toBe(0.1);
    expect(clock.pending()).toBe(0);
    const adopted = store.getState().validPlan;
    store.getState().typeField('matching.caliper', '0.10');
    expect(store.getState().draftPending).toBe(false);
    expect(store.getState().validPlan).toBe(adopted); // same plan, same object: no new quick figures
    store.getState().commitDraft(); // nothing waiting: no change
    expect(quick.plans).toHaveLength(2);
  });

  it('an edit made another way while a value waits decides (the waiting value is dropped, not adopted later)', () => {
    const { store, clock } = typingStore();
    store.getState().typeField('outcome.growthGap', '3');
    store.getState().setField('outcome.growthGap', '4');
    clock.advance(TYPING_PAUSE_MS);
    expect(store.getState().validPlan.outcome.growthGap).toBe(4);
  });
});
