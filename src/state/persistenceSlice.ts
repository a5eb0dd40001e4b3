import type { StateCreator } from 'zustand';
import type { Plan } from '../core/plan';
import type { MeanwardDeps, PlanCheck } from './deps';
import { isPlanDraft, withDraftDefaults, type PlanDraft } from './planDraft';
import type { MeanwardState } from './store';

/** localStorage key of the autosaved draft. */
export const AUTOSAVE_KEY = 'meanward.draft.v1';

/** The fragment prefix of a share link: https://…/#plan=<encoded plan>. */
export const SHARE_PREFIX = '#plan=';

/** Whether a URL fragment carries a plan ("#plan=…" or "plan=…"). */
export function isShareFragment(fragment: string): boolean {
  return /(^|[#&])plan=/.test(fragment);
}

export interface Notice {
  kind: 'info' | 'error';
  text: string;
}

/**
 * Keeping and sharing plans: autosave and restore, reset to the demo,
 * examples, plan files and share links. Opening a bad file or link leaves the
 * current plan untouched and explains what is wrong.
 */
export interface PersistenceSlice {
  notice: Notice | null;
  /** The built-in (invented) example plans, for the picker. */
  examplesList: readonly { id: string; name: string; description: string }[];
  dismissNotice(): void;
  loadExample(id: string): void;
  resetToDemo(): void;
  /** Open the text of a plan file; returns whether it was loaded. */
  openPlanText(text: string, fileName?: string): boolean;
  /** Open a URL fragment ("#plan=…"); returns whether a plan was loaded. */
  openShareFragment(fragment: string): boolean;
  /** The plan file text for the current plan (the last valid one). */
  planFileText(): string;
  /** The fragment ("#plan=…") that reopens the current plan. */
  shareFragment(): string;
  /** Write the draft to storage now (also done after every change). */
  autosave(): void;
}

/** Read an autosaved draft; null when none or unreadable. */
export function readAutosave(storage: MeanwardDeps['storage']): PlanDraft | null {
  if (!storage) return null;
  try {
    const raw = storage.getItem(AUTOSAVE_KEY);
    if (!raw) return null;
    const parsed = JSON.parse(raw) as { version?: unknown; draft?: unknown };
    return parsed.version === 1 && isPlanDraft(parsed.draft) ? withDraftDefaults(parsed.draft) : null;
  } catch {
    return null;
  }
}

export const createPersistenceSlice =
  (deps: MeanwardDeps, demo: () => Plan): StateCreator<MeanwardState, [], [], PersistenceSlice> =>
  (set, get) => {
    const load = (plan: Plan, text: string) => {
      get().replacePlan(plan);
      set({ notice: { kind: 'info', text } });
    };
    const explain = (check: PlanCheck & { ok: false }): string => {
      const list = check.problems.map((p) => p.message);
      return list.length > 3 ? `${list.slice(0, 3).join(' ')} (and ${list.length - 3} more problems)` : list.join(' ');
    };
    return {
      notice: null,
      examplesList: deps.examples.map(({ id, name, description }) => ({ id, name, description })),
      dismissNotice: () => set({ notice: null }),
      loadExample: (id) => {
        const ex = deps.examples.find((e) => e.id === id);
        if (!ex) {
          set({ notice: { kind: 'error', text: `There is no example called "${id}".` } });
          return;
        }
        load(structuredClone(ex.plan), `Loaded the invented example "${ex.name}": ${ex.description}`);
      },
      resetToDemo: () => load(demo(), 'The form was reset to the demo plan (an invented example).'),
      openPlanText: (text, fileName) => {
        const check = deps.parsePlanText(text);
        if (!check.ok) {
          const what = fileName ? `The file "${fileName}"` : 'The plan file';
          set({ notice: { kind: 'error', text: `${what} could not be opened; your current plan is unchanged. ${explain(check)}` } });
          return false;
        }
        load(check.plan, `Opened ${fileName ? `"${fileName}"` : 'the plan file'}.`);
        return true;
      },
      openShareFragment: (fragment) => {
        if (!isShareFragment(fragment)) return false;
        const check = deps.decodePlanFromLink(fragment);
        if (!check.ok) {
          set({
            notice: { kind: 'error', text: `The shared link could not be read, so your current plan is unchanged. ${explain(check)}` },
          });
          return false;
        }
        load(check.plan, 'Opened the plan from the shared link.');
        return true;
      },
      planFileText: () => deps.serializePlan(get().validPlan),
      shareFragment: () => deps.encodePlanForLink(get().validPlan),
      autosave: () => {
        if (!deps.storage) return;
        try {
          deps.storage.setItem(AUTOSAVE_KEY, JSON.stringify({ version: 1, draft: get().draft }));
        } catch {
          // Storage full or blocked (private mode): autosave is a convenience, the page still works.
        }
      },
    };
  };
