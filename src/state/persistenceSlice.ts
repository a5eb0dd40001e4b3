import type { StateCreator } from 'zustand';
import type { Plan } from '../core/plan';
import { MissingEngineError } from '../core/engineRegistry';
import { ENGINES_FAILED } from './draftSlice';
import { looksLikePlanPart } from '../io/shareLink';
import type { DraftStorage, MeanwardDeps, PlanCheck } from './deps';
import { isPlanDraft, withDraftDefaults, type PlanDraft } from './planDraft';
import type { MeanwardState } from './store';

/**
 * localStorage key of the shared "last draft": the draft last edited in any
 * tab of this browser. A new tab opened without a link starts from it.
 */
export const AUTOSAVE_KEY = 'meanward.draft.v1';

/** sessionStorage key of this tab's own draft (a reload of the tab restores it; other tabs never write it). */
export const TAB_DRAFT_KEY = 'meanward.tabDraft.v1';

/** localStorage key where autosaves that could not be read are kept until the researcher dismisses the message. */
export const UNREADABLE_KEY = 'meanward.unreadableDraft.v1';

/** The fragment prefix of a share link: https://…/#plan=<encoded plan>. */
export const SHARE_PREFIX = '#plan=';

/**
 * Whether a URL fragment is meant to carry a plan: "#plan=…", "plan=…", a
 * "plan=…" parameter among others, or a malformed attempt at one ("#plan",
 * "#PLAN=…", "#plan:…"), which is then reported rather than ignored.
 * Other fragments ("#results") are not plan links.
 * @example isShareFragment("#plan") // true; isShareFragment("#results") // false
 */
export function isShareFragment(fragment: string): boolean {
  const body = fragment.startsWith('#') ? fragment.slice(1) : fragment;
  return body.split('&').some((part) => part.startsWith('plan=') || looksLikePlanPart(part));
}

/** What replaced the whole plan (for the undo message). */
export type ReplaceSource = 'demo' | 'example' | 'file' | 'link' | 'pilot' | 'variant';

export interface Notice {
  kind: 'info' | 'error';
  text: string;
  /** A button offered with the message: undo (or redo) the replace it reports. */
  action?: 'undo' | 'redo';
}

/** The draft a replace took away, kept so one press of Undo brings it back exactly. */
export interface UndoableReplace {
  /** The draft to bring back (text as typed, provenance, covariate rows). */
  draft: PlanDraft;
  source: ReplaceSource;
  /** True once undone: the kept draft is then the one the replace brought in (Redo). */
  undone: boolean;
}

/** An autosave that could not be read: its raw text, kept so it can be downloaded. */
export interface UnreadableDraft {
  /** Where it was found: this tab's draft or the browser's shared last draft. */
  from: 'tab' | 'browser';
  text: string;
}

/**
 * Keeping and sharing plans: autosave and restore, reset to the demo,
 * examples, plan files and share links. Opening a bad file or link leaves the
 * current plan untouched and explains what is wrong; every replace of the
 * whole plan can be undone; an unreadable autosave is reported and kept.
 */
export interface PersistenceSlice {
  notice: Notice | null;
  /** The last replace of the whole plan, while its notice offers Undo (null otherwise). */
  undoable: UndoableReplace | null;
  /** Autosaves found unreadable (this visit or an earlier one), kept until dismissed; empty when none. */
  unreadableDrafts: UnreadableDraft[];
  /** Where this visit's draft came from: this tab's autosave, the browser's last draft, or neither (the demo). */
  restoredFrom: RestoredDrafts['from'];
  /** The built-in (invented) example plans, for the picker. */
  examplesList: readonly { id: string; name: string; description: string }[];
  /** Close the message (and the undo it offered). */
  dismissNotice(): void;
  loadExample(id: string): void;
  resetToDemo(): void;
  /** Open the text of a plan file; returns whether it was loaded (false also while an engine it needs loads: it opens when that arrives). */
  openPlanText(text: string, fileName?: string): boolean;
  /** Open a URL fragment ("#plan=…"); returns whether a plan was loaded (false also while an engine it needs loads). A malformed "#plan…" fragment is reported. */
  openShareFragment(fragment: string): boolean;
  /**
   * Replace the whole draft (after `before`) and offer Undo: used by every
   * replace (reset, file, link, example, pilot values). `text` is the message.
   */
  offerUndo(before: PlanDraft, source: ReplaceSource, text: string): void;
  /** Bring back the draft the last replace took away (and offer Redo); nothing when there is none. */
  undoReplace(): void;
  /** The text to download for the unreadable autosave(s): the raw text as it was stored. */
  unreadableDraftFile(): string;
  /** Forget the unreadable autosave(s) (after the researcher has downloaded them or does not want them). */
  dismissUnreadableDrafts(): void;
  /** The plan file text for the current plan (the last valid one). */
  planFileText(): string;
  /** The fragment ("#plan=…") that reopens the current plan. */
  shareFragment(): string;
  /** Write the draft to storage now (also done after every change). */
  autosave(): void;
}

/** One stored draft: none, read, or present but unreadable (raw text kept). */
export type StoredDraft = { status: 'none' } | { status: 'ok'; draft: PlanDraft } | { status: 'unreadable'; text: string };

/** Read the draft stored under `key`; never throws. */
export function readStoredDraft(storage: DraftStorage | null | undefined, key: string): StoredDraft {
  if (!storage) return { status: 'none' };
  let raw: string | null;
  try {
    raw = storage.getItem(key);
  } catch {
    return { status: 'none' }; // storage blocked: nothing to read, nothing to keep
  }
  if (raw === null || raw === '') return { status: 'none' };
  try {
    const parsed = JSON.parse(raw) as { version?: unknown; draft?: unknown } | null;
    if (parsed && typeof parsed === 'object' && parsed.version === 1 && isPlanDraft(parsed.draft)) {
      return { status: 'ok', draft: withDraftDefaults(parsed.draft) };
    }
  } catch {
    // falls through: unreadable
  }
  return { status: 'unreadable', text: raw };
}

/** Read the shared autosaved draft; null when none or unreadable. */
export function readAutosave(storage: MeanwardDeps['storage']): PlanDraft | null {
  const r = readStoredDraft(storage, AUTOSAVE_KEY);
  return r.status === 'ok' ? r.draft : null;
}

/** What the store starts from: the restored draft (if any), where it came from, and any unreadable autosaves. */
export interface RestoredDrafts {
  draft: PlanDraft | null;
  from: 'tab' | 'browser' | null;
  unreadable: UnreadableDraft[];
}

/** At most this many unreadable autosaves are kept (the newest). */
const MAX_KEPT = 5;

/**
 * Restore at start-up: this tab's own draft (a reload), else the browser's
 * shared last draft (a new tab), else nothing (the demo). An autosave that is
 * present but unreadable is skipped, kept under UNREADABLE_KEY with any kept
 * earlier, and returned so the researcher is told and can download it.
 */
export function restoreDrafts(deps: Pick<MeanwardDeps, 'storage' | 'session'>): RestoredDrafts {
  const unreadable: UnreadableDraft[] = readKept(deps.storage);
  const found: UnreadableDraft[] = [];
  let draft: PlanDraft | null = null;
  let from: RestoredDrafts['from'] = null;
  for (const [where, storage, key] of [
    ['tab', deps.session, TAB_DRAFT_KEY],
    ['browser', deps.storage, AUTOSAVE_KEY],
  ] as const) {
    const r = readStoredDraft(storage, key);
    if (r.status === 'unreadable') found.push({ from: where, text: r.text });
    if (r.status === 'ok') {
      draft = r.draft;
      from = where;
      break;
    }
  }
  for (const f of found) if (!unreadable.some((u) => u.text === f.text)) unreadable.push(f);
  const kept = unreadable.slice(-MAX_KEPT);
  if (found.length > 0) writeKept(deps.storage, kept);
  return { draft, from, unreadable: kept };
}

function readKept(storage: DraftStorage | null | undefined): UnreadableDraft[] {
  try {
    const raw = storage?.getItem(UNREADABLE_KEY);
    if (!raw) return [];
    const parsed = JSON.parse(raw) as { version?: unknown; drafts?: unknown };
    if (parsed?.version !== 1 || !Array.isArray(parsed.drafts)) return [];
    return parsed.drafts.filter(
      (d): d is UnreadableDraft =>
        typeof d === 'object' && d !== null && (d.from === 'tab' || d.from === 'browser') && typeof d.text === 'string',
    );
  } catch {
    return []; // the keeping place itself is damaged: nothing more to recover from it
  }
}

function writeKept(storage: DraftStorage | null | undefined, drafts: UnreadableDraft[]): void {
  try {
    if (drafts.length === 0) storage?.removeItem(UNREADABLE_KEY);
    else storage?.setItem(UNREADABLE_KEY, JSON.stringify({ version: 1, drafts }));
  } catch {
    // Storage full or blocked: the drafts stay in memory for this visit (the download still works).
  }
}

/** The message after Redo, per source. */
const REDONE: Record<ReplaceSource, string> = {
  demo: 'Put the demo plan back.',
  example: 'Put the example back.',
  file: 'Put the plan from the file back.',
  link: 'Put the plan from the shared link back.',
  pilot: 'Put the pilot values back into the plan.',
  variant: 'Put the variant back in the form.',
};

/** What a replace took the plan from, in the undo message ("before the …"). */
const REPLACED_BY: Record<ReplaceSource, string> = {
  demo: 'the reset to the demo',
  example: 'the example',
  file: 'the plan file',
  link: 'the shared link',
  pilot: 'the pilot values',
  variant: 'opening the variant',
};

/** The persistence slice over the injected storage and parsers; `restored` is what restoreDrafts found at start-up. */
export const createPersistenceSlice =
  (
    deps: MeanwardDeps,
    demo: () => Plan,
    restored: Pick<RestoredDrafts, 'from' | 'unreadable'> = { from: null, unreadable: [] },
  ): StateCreator<MeanwardState, [], [], PersistenceSlice> =>
  (set, get) => {
    // A plan opened from a link is this tab's, not yet the researcher's work: it is
    // not written over the browser's shared last draft until it is edited.
    let holdNextShared = false;
    let heldDraft: PlanDraft | null = null;
    const load = (plan: Plan, source: ReplaceSource, text: string) => {
      const before = get().draft;
      get().replacePlan(plan);
      get().offerUndo(before, source, text);
    };
    const explain = (check: PlanCheck & { ok: false }): string => {
      const list = check.problems.map((p) => p.message);
      return list.length > 3 ? `${list.slice(0, 3).join(' ')} (and ${list.length - 3} more problems)` : list.join(' ');
    };
    /**
     * Run an open (file, link) now; when checking the plan needs an engine that is still loading
     * (src/core/engineRegistry.ts), run it again once the engine has arrived. Until then the current
     * plan stays as it is; a failed load is reported and changes nothing.
     */
    const whenEnginesReady = (open: () => boolean): boolean => {
      try {
        return open();
      } catch (e) {
        if (!(e instanceof MissingEngineError) || !deps.loadEngines) throw e;
        void deps.loadEngines([e.engine]).then(
          () => void open(),
          () => set({ notice: { kind: 'error', text: `This plan could not be opened; your current plan is unchanged. ${ENGINES_FAILED}` } }),
        );
        return false;
      }
    };
    const write = (storage: DraftStorage | null | undefined, key: string, text: string) => {
      try {
        storage?.setItem(key, text);
      } catch {
        // Storage full or blocked (private mode): autosave is a convenience, the page still works.
      }
    };
    return {
      notice: null,
      undoable: null,
      unreadableDrafts: restored.unreadable,
      restoredFrom: restored.from,
      examplesList: deps.examples.map(({ id, name, description }) => ({ id, name, description })),
      dismissNotice: () => set({ notice: null, undoable: null }),
      loadExample: (id) => {
        const ex = deps.examples.find((e) => e.id === id);
        if (!ex) {
          set({ notice: { kind: 'error', text: `There is no example called "${id}".` } });
          return;
        }
        load(structuredClone(ex.plan), 'example', `Loaded the invented example "${ex.name}": ${ex.description}`);
      },
      resetToDemo: () => load(demo(), 'demo', 'The form was reset to the demo plan (an invented example).'),
      openPlanText: (text, fileName) => whenEnginesReady(() => {
        const check = deps.parsePlanText(text);
        if (!check.ok) {
          const what = fileName ? `The file "${fileName}"` : 'The plan file';
          set({ notice: { kind: 'error', text: `${what} could not be opened; your current plan is unchanged. ${explain(check)}` } });
          return false;
        }
        load(check.plan, 'file', `Opened ${fileName ? `"${fileName}"` : 'the plan file'}.`);
        return true;
      }),
      openShareFragment: (fragment) => whenEnginesReady(() => {
        if (!isShareFragment(fragment)) return false;
        const check = deps.decodePlanFromLink(fragment);
        if (!check.ok) {
          set({
            notice: { kind: 'error', text: `The shared link could not be read, so your current plan is unchanged. ${explain(check)}` },
          });
          return false;
        }
        holdNextShared = true;
        try {
          load(check.plan, 'link', 'Opened the plan from the shared link.');
        } finally {
          holdNextShared = false;
        }
        return true;
      }),
      offerUndo: (before, source, text) => {
        set({ notice: { kind: 'info', text, action: 'undo' }, undoable: { draft: before, source, undone: false } });
      },
      undoReplace: () => {
        const u = get().undoable;
        if (!u) return;
        const current = get().draft;
        get().replaceDraft(u.draft);
        const undone = !u.undone;
        const text = undone
          ? `Brought back your plan from before ${REPLACED_BY[u.source]}, exactly as you left it.`
          : REDONE[u.source];
        set({ notice: { kind: 'info', text, action: undone ? 'redo' : 'undo' }, undoable: { draft: current, source: u.source, undone } });
        if (u.source === 'pilot' && undone) {
          set((s) => ({ pilot: { ...s.pilot, lastApply: null, announcement: 'The pilot values were taken out of the plan again (Undo).' } }));
        }
      },
      unreadableDraftFile: () => {
        const list = get().unreadableDrafts;
        if (list.length === 1) return list[0]!.text;
        return list
          .map((d, i) => `--- unreadable autosave ${i + 1} of ${list.length} (${d.from === 'tab' ? 'this tab' : 'last draft of this browser'}) ---\n${d.text}\n`)
          .join('\n');
      },
      dismissUnreadableDrafts: () => {
        writeKept(deps.storage, []);
        set({ unreadableDrafts: [] });
      },
      planFileText: () => deps.serializePlan(get().validPlan),
      shareFragment: () => deps.encodePlanForLink(get().validPlan),
      autosave: () => {
        const text = JSON.stringify({ version: 1, draft: get().draft });
        write(deps.session, TAB_DRAFT_KEY, text);
        if (holdNextShared) heldDraft = get().draft;
        if (get().draft !== heldDraft) write(deps.storage, AUTOSAVE_KEY, text);
      },
    };
  };
