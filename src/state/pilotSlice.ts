import type { Plan } from '../core/plan';
import { createPilotReader } from '../pilot/pilotClient';
import { pessimisticPlanResult } from '../pilot/pessimisticPlan';
import { applyPilotOffer, pilotPlanUpdate, pilotReliabilityOptions, type PilotPlanUpdateOptions } from '../pilot/pilotPlanUpdate';
import type { ColumnFacts, PilotTableSummary } from '../pilot/pilotWorkerProtocol';
import type { PilotMapping, PilotOffer } from '../pilot/types';
import type { DraftStorage } from './deps';
import { draftProvenance, withDraftProvenance } from './draftSlice';
import { FIELD_NAMES, setDraftField, type PlanDraft } from './planDraft';
import {
  EMPTY_MAPPING,
  initialPilot,
  installPilotActions,
  type PilotActions,
  type PilotActionsFactory,
  type PilotDeps,
  type PilotMappingDraft,
  type PilotProblem,
  type PilotReadOptions,
  type PilotState,
} from './pilotState';

// The pilot slice's state and types are in pilotState.ts (on the first screen); this module, with
// the reader's client and the plan update, loads with the pilot reader's body.
export {
  initialPilot,
  type PilotApplyReport,
  type PilotDeps,
  type PilotMappingDraft,
  type PilotPreview,
  type PilotProblem,
  type PilotReadOptions,
  type PilotSlice,
  type PilotState,
  type PilotStatus,
} from './pilotState';

/** The pilot slice's real dependencies: the worker reader, src/pilot's plan writers, the tab's sessionStorage. */
export function defaultPilotDeps(): PilotDeps {
  let session: DraftStorage | null = null;
  try {
    session = globalThis.sessionStorage ?? null;
  } catch {
    session = null; // blocked (some private modes): mappings are kept in the store only
  }
  return { reader: createPilotReader(), planUpdate: pilotPlanUpdate, pessimisticPlan: pessimisticPlanResult, applyOffer: applyPilotOffer, session };
}

/** sessionStorage key of the remembered column mappings (by the file's column names; never any rows). */
export const PILOT_MAPPING_KEY = 'meanward.pilotMapping.v1';

/** The reliability choice for pilotPlanUpdate: the researcher's, else the recommended one. */
function reliabilityOption(p: PilotState): PilotPlanUpdateOptions {
  if (p.reliabilitySource) return { reliability: p.reliabilitySource };
  const recommended = p.estimates ? pilotReliabilityOptions(p.estimates).find((o) => o.recommended) : undefined;
  return recommended ? { reliability: recommended.source } : {};
}

/** After the pessimistic step the reliability changed again: the offers propose the plan's new value. */
function offersAfter(plan: Plan, offers: PilotOffer[]): PilotOffer[] {
  const r = plan.pretest.reliability;
  return offers
    .map((o) => (o.path === 'analysis.assumedReliability' && typeof r === 'number' ? { ...o, proposed: r, message: o.message.replace(/now [.0-9]+ from the pilot/, `now ${String(Number(r.toFixed(3))).replace(/^0\./, '.')} from the pilot`) } : o))
    .filter((o) => o.proposed !== o.current);
}

/** A name that identifies a file's layout: its column names in order. */
function layoutKey(summary: PilotTableSummary): string {
  return JSON.stringify(summary.columns.map((c) => c.name));
}

function readRemembered(session: DraftStorage | null): Record<string, PilotMappingDraft> {
  if (!session) return {};
  try {
    const raw = session.getItem(PILOT_MAPPING_KEY);
    const parsed: unknown = raw ? JSON.parse(raw) : {};
    if (!parsed || typeof parsed !== 'object') return {};
    // Mappings remembered before a field existed get its empty value.
    const out: Record<string, PilotMappingDraft> = {};
    for (const [key, m] of Object.entries(parsed as Record<string, Partial<PilotMappingDraft>>)) out[key] = { ...EMPTY_MAPPING, ...m };
    return out;
  } catch {
    return {};
  }
}

/** A remembered mapping still fits when every column it names is in the file. */
function fits(m: PilotMappingDraft, summary: PilotTableSummary): boolean {
  const names = new Set(summary.columns.map((c) => c.name));
  const used = [m.group, m.pretestColumn, m.retest, m.posttest, m.idColumn, m.occasionColumn, ...m.itemColumns].filter((c) => c !== '');
  return used.every((c) => names.has(c)) && m.group !== '';
}

/**
 * A first guess at the mapping from the column names (group, pretest, items,
 * retest, posttest), for the researcher to check. Names only: no data are
 * summarised here.
 */
export function guessPilotMapping(summary: PilotTableSummary): PilotMappingDraft {
  const cols = summary.columns;
  const smallSet = (c: ColumnFacts) => !c.moreDistinct && c.distinct.length >= 2;
  const group =
    cols.find((c) => /group|arm|cohort|condition|programme|program|treat/i.test(c.name) && smallSet(c)) ??
    cols.find((c) => !c.looksNumeric && smallSet(c)) ??
    cols.find((c) => smallSet(c) && c.distinct.length <= 5);
  // Score columns are picked by name even when a cell holds text: estimating then names the bad cell,
  // rather than the column being left out without a word.
  const scores = cols.filter((c) => c !== group);
  const programmeValue = group ? guessProgrammeValue(group.distinct) : '';
  const isItem = (c: ColumnFacts) => /item|^q\d|^i\d|_q\d|_i\d/i.test(c.name);
  // "pretest" contains "retest": a retest name must not follow a p.
  const retest = scores.find((c) => /(^|[^p])re-?test|repeat|second/i.test(c.name));
  const posttest = scores.find((c) => /post|outcome|follow/i.test(c.name) && c !== retest);
  const total = scores.find(
    (c) => c !== retest && c !== posttest && !isItem(c) && /pre|baseline|total|score/i.test(c.name),
  );
  const items = scores.filter(isItem);
  const pretestKind: PilotMappingDraft['pretestKind'] = !total && items.length >= 2 ? 'items' : 'total';
  return {
    ...EMPTY_MAPPING,
    group: group?.name ?? '',
    programmeValue,
    pretestKind,
    pretestColumn: total?.name ?? '',
    itemColumns: items.map((c) => c.name),
    retest: retest?.name ?? '',
    posttest: posttest?.name ?? '',
  };
}

/** Values that name a comparison group, never guessed as the programme's. */
const COMPARISON_WORDS = /compar|control|usual|wait|none|no[ -]?(programme|program|support|treat)|^no$|^0$|reference|standard/i;
/** Values that name a programme group. */
const PROGRAMME_WORDS = /prog|treat|interv|pilot|support|tutor|course|^yes$|^1$|received|took part|participa/i;

/**
 * The programme group's value, guessed from the group values' names: a value
 * that reads like a programme and not like a comparison; with no such value,
 * nothing ('' : the researcher chooses). Never the first value by default.
 */
export function guessProgrammeValue(values: readonly string[]): string {
  return values.find((v) => PROGRAMME_WORDS.test(v) && !COMPARISON_WORDS.test(v)) ?? '';
}

/** The mapping for src/pilot, or a message saying what is still to choose. */
export function mappingFromDraft(m: PilotMappingDraft): { mapping: PilotMapping } | { message: string } {
  if (m.group === '') return { message: 'Choose the column that holds each row’s group.' };
  if (m.programmeValue === '') return { message: `Choose which value of “${m.group}” marks the programme group.` };
  if (m.pretestKind === 'total' && m.pretestColumn === '') return { message: 'Choose the pretest column (the total score).' };
  if (m.pretestKind === 'items' && m.itemColumns.length === 0) return { message: 'Tick the pretest’s item columns.' };
  let reverse: { columns: string[]; minimum: number; maximum: number } | undefined;
  const reversed = m.pretestKind === 'items' ? m.reverseColumns.filter((c) => m.itemColumns.includes(c)) : [];
  if (reversed.length > 0) {
    const scale = parseScale(m.scaleMin, m.scaleMax);
    if ('message' in scale) return scale;
    reverse = { columns: reversed, ...scale };
  }
  const mapping: PilotMapping = {
    group: m.group,
    programmeValue: m.programmeValue,
    pretest:
      m.pretestKind === 'total'
        ? { kind: 'total', column: m.pretestColumn }
        : { kind: 'items', columns: m.itemColumns, combine: m.combine, ...(reverse ? { reverse } : {}) },
  };
  if (m.layout === 'long') {
    if (m.idColumn === '') return { message: 'Choose the column that identifies each person in the long file.' };
    if (m.occasionColumn === '') return { message: 'Choose the column that says which occasion each row holds.' };
    if (m.pretestOccasion === '') return { message: `Choose which value of “${m.occasionColumn}” marks the pretest.` };
    mapping.layout = {
      kind: 'long',
      id: m.idColumn,
      occasion: m.occasionColumn,
      pretestOccasion: m.pretestOccasion,
      ...(m.retestOccasion !== '' ? { retestOccasion: m.retestOccasion } : {}),
      ...(m.posttestOccasion !== '' ? { posttestOccasion: m.posttestOccasion } : {}),
    };
    return { mapping };
  }
  if (m.retest !== '') mapping.retest = m.retest;
  if (m.posttest !== '') mapping.posttest = m.posttest;
  return { mapping };
}

/**
 * The items' scale as typed ("1" and "6"), or a message saying what is wrong.
 * Text is kept as typed in the draft; only this reading turns it into numbers.
 */
export function parseScale(minText: string, maxText: string): { minimum: number; maximum: number } | { message: string } {
  const read = (t: string) => (/^\s*[+-]?(\d+\.?\d*|\.\d+)\s*$/.test(t) ? Number(t) : Number.NaN);
  const minimum = read(minText);
  const maximum = read(maxText);
  if (minText.trim() === '' || maxText.trim() === '') {
    return { message: 'To reverse items, give the lowest and highest possible score of an item (e.g. 1 and 6).' };
  }
  if (Number.isNaN(minimum)) return { message: `The lowest possible score must be a number, e.g. 1; got “${minText.trim()}”.` };
  if (Number.isNaN(maximum)) return { message: `The highest possible score must be a number, e.g. 6; got “${maxText.trim()}”.` };
  if (!(minimum < maximum)) return { message: `The lowest possible score (${minText.trim()}) must be below the highest (${maxText.trim()}).` };
  return { minimum, maximum };
}

function problemFrom(stage: PilotProblem['stage'], err: unknown): PilotProblem {
  const e = err as { message?: unknown; column?: unknown; row?: unknown };
  const p: PilotProblem = { stage, message: typeof e?.message === 'string' ? e.message : String(err) };
  if (typeof e?.column === 'string') p.column = e.column;
  if (typeof e?.row === 'number') p.row = e.row;
  return p;
}

function at(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}

/** Significant digits of a value typed into the form from an estimate. */
export const PILOT_DRAFT_DIGITS = 6;

/**
 * An estimate as the text of its form box: 6 significant digits, far below
 * any pilot's sampling error, so the box never shows floating-point noise
 * such as "42.877750000000006".
 */
function draftText(value: number): string {
  return String(Number(value.toPrecision(PILOT_DRAFT_DIGITS)));
}

/**
 * The draft with the plan fields that changed from `before` to `after` (and
 * the `written` paths) typed in, and `after`'s provenance for them. Fields
 * not written keep exactly what the researcher typed, even if unfinished.
 */
export function writePlanChangesIntoDraft(draft: PlanDraft, before: Plan, after: Plan, written: readonly string[]): PlanDraft {
  const paths = new Set(written);
  for (const path of Object.keys(FIELD_NAMES)) {
    const a = at(after, path);
    if (typeof a === 'number' && a !== at(before, path)) paths.add(path);
  }
  let next = draft;
  for (const path of paths) {
    const value = at(after, path);
    if (typeof value !== 'number' || !Number.isFinite(value)) continue;
    next = setDraftField(next, path, draftText(value));
  }
  if ([...paths].some((p) => p.startsWith('pretest.reliability')) && next.pretest.mode !== 'reliability') {
    next = { ...next, pretest: { ...next.pretest, mode: 'reliability' } };
  }
  const provenance = { ...(draftProvenance(draft) ?? {}) };
  for (const path of paths) {
    const entry = after.provenance?.[path];
    if (entry) provenance[path] = entry;
    else delete provenance[path];
  }
  return withDraftProvenance(next, provenance);
}

/**
 * The pilot reader's actions for one store, over the default deps with the store's overrides
 * (installed into the slice in pilotState.ts when this module loads; see there).
 */
export const createPilotActions: PilotActionsFactory = (overrides, set, get): PilotActions => {
  const deps: PilotDeps = { ...defaultPilotDeps(), ...overrides };
  // The file stays in memory only while the panel uses it (to read it again with other options).
  let file: Blob | string | null = null;
  let readSeq = 0;
  let estimateSeq = 0;
  const remembered: Record<string, PilotMappingDraft> = readRemembered(deps.session);
  const patch = (p: Partial<PilotState>) => set((s) => ({ pilot: { ...s.pilot, ...p } }));

  const remember = (summary: PilotTableSummary, mapping: PilotMappingDraft) => {
    remembered[layoutKey(summary)] = mapping;
    try {
      deps.session?.setItem(PILOT_MAPPING_KEY, JSON.stringify(remembered));
    } catch {
      // Session storage blocked or full: the mapping is still kept in this store.
    }
  };

  const read = async (source: Blob | string, fileName: string, options: PilotReadOptions) => {
    const seq = ++readSeq;
    estimateSeq++; // any estimate still running belongs to the old file
    patch({ status: 'reading', fileName, problem: null, estimates: null, lastApply: null, announcement: `Reading “${fileName}”…` });
    try {
      const summary = await deps.reader.read(source, fileName, { delimiter: options.delimiter, header: options.header });
      if (seq !== readSeq) return;
      const saved = remembered[layoutKey(summary)];
      const useSaved = saved !== undefined && fits(saved, summary);
      const mapping = useSaved ? saved : guessPilotMapping(summary);
      const rows = `${summary.rowCount.toLocaleString('en-GB')} ${summary.rowCount === 1 ? 'row' : 'rows'}`;
      patch({
        status: 'mapping',
        summary,
        mapping,
        mappingRemembered: useSaved,
        announcement: `Read “${fileName}”: ${rows} and ${summary.columns.length} columns. ${useSaved ? 'The column choices from earlier in this session are restored; check them' : 'Check the column choices'}, then estimate.`,
      });
    } catch (err) {
      if (seq !== readSeq) return;
      file = null;
      const problem = problemFrom('read', err);
      patch({
        status: 'empty',
        summary: null,
        problem,
        announcement: `“${fileName}” could not be read; your plan is unchanged. ${problem.message}`,
      });
    }
  };

  const apply = (pessimistic: boolean) => {
    get().commitDraft(); // a value still being typed is part of the plan the estimates go into
    const s = get();
    const estimates = s.pilot.estimates;
    if (!estimates) return;
    try {
      const before = s.validPlan;
      const update = deps.planUpdate(before, estimates, reliabilityOption(s.pilot));
      let after = update.plan;
      if (pessimistic) {
        const low = deps.pessimisticPlan(update.plan);
        if (!low.ok) {
          patch({ problem: { stage: 'apply', message: low.reason }, announcement: `Your plan is unchanged. ${low.reason}` });
          return;
        }
        after = low.plan;
      }
      const written = update.applied.map((a) => a.path);
      const draft = writePlanChangesIntoDraft(s.draft, before, after, written);
      get().replaceDraft(draft);
      const applied = pessimistic
        ? update.applied.map((a) =>
            a.path === 'pretest.reliability' && typeof after.pretest.reliability === 'number'
              ? { ...a, value: after.pretest.reliability, note: after.provenance?.[a.path]?.note ?? a.note }
              : a,
          )
        : update.applied;
      const n = applied.length;
      const skippedText = update.skipped.length > 0 ? ` ${update.skipped.length} left as they were (see why below).` : '';
      const filled = `${n === 1 ? 'One plan field' : `${n} plan fields`} filled from “${estimates.fileName ?? s.pilot.fileName ?? 'the pilot file'}”${pessimistic ? ', with the reliability at the lower end of its confidence interval' : ''}.`;
      // The corrected ANCOVA's assumed reliability is asked about, never changed silently.
      const offers = pessimistic ? offersAfter(after, update.offers) : update.offers;
      const asked = offers.length > 0 ? ` ${offers[0]!.message}` : '';
      patch({
        lastApply: { applied, skipped: update.skipped, pessimistic },
        offers,
        problem: null,
        announcement: `${filled}${skippedText}${asked}`,
      });
      // Like every replace, it can be undone: the draft before, exactly as typed.
      get().offerUndo(s.draft, 'pilot', filled);
    } catch (err) {
      const problem = problemFrom('apply', err);
      patch({ problem, announcement: `The estimates could not be written into the plan; your plan is unchanged. ${problem.message}` });
    }
  };

  return {
    readPilotFile: async (source, fileName) => {
      file = source;
      await read(source, fileName, get().pilot.readOptions);
    },
    setPilotReadOptions: async (options) => {
      const readOptions = { ...get().pilot.readOptions, ...options };
      patch({ readOptions });
      const { fileName } = get().pilot;
      if (file !== null && fileName !== null) await read(file, fileName, readOptions);
    },
    setPilotMapping: (p) => {
      const s = get().pilot;
      const mapping = { ...s.mapping, ...p };
      // A new group column means a new programme value (unless given).
      if (p.group !== undefined && p.group !== s.mapping.group && p.programmeValue === undefined) {
        const col = s.summary?.columns.find((c) => c.name === p.group);
        mapping.programmeValue = col ? guessProgrammeValue(col.distinct) : '';
      }
      estimateSeq++;
      patch({
        mapping,
        mappingRemembered: false,
        estimates: null,
        lastApply: null,
        problem: s.problem?.stage === 'read' ? s.problem : null,
        status: s.summary ? 'mapping' : s.status,
      });
    },
    estimateFromPilot: async () => {
      const s = get().pilot;
      if (!s.summary) return;
      const m = mappingFromDraft(s.mapping);
      if ('message' in m) {
        patch({ problem: { stage: 'map', message: m.message }, announcement: m.message });
        return;
      }
      const seq = ++estimateSeq;
      remember(s.summary, s.mapping);
      patch({ status: 'estimating', problem: null, estimates: null, lastApply: null, offers: [], reliabilitySource: null, announcement: 'Estimating…' });
      try {
        const estimates = await deps.reader.estimate(m.mapping);
        if (seq !== estimateSeq) return;
        const d = estimates.rowsDropped;
        const dropped = d > 0 ? ` ${d === 1 ? 'One row was' : `${d.toLocaleString('en-GB')} rows were`} left out (see why below).` : '';
        const warn = estimates.warnings.length > 0 ? ` ${estimates.warnings.length === 1 ? 'One warning' : `${estimates.warnings.length} warnings`} to read.` : '';
        patch({
          status: 'estimated',
          estimates,
          announcement: `Estimates ready from ${estimates.rowsUsed.toLocaleString('en-GB')} rows.${dropped}${warn} Nothing is in the plan until you choose “Use these values”.`,
        });
      } catch (err) {
        if (seq !== estimateSeq) return;
        const problem = problemFrom('estimate', err);
        patch({ status: 'mapping', problem, announcement: `No estimates; your plan is unchanged. ${problem.message}` });
      }
    },
    applyPilotEstimates: () => apply(false),
    applyPessimisticPilotEstimates: () => apply(true),
    previewPilotUpdate: () => {
      const s = get();
      if (!s.pilot.estimates) return null;
      try {
        const update = deps.planUpdate(s.validPlan, s.pilot.estimates, reliabilityOption(s.pilot));
        return { update, pessimistic: deps.pessimisticPlan(update.plan) };
      } catch {
        return null; // apply() reports the reason if the researcher presses the button
      }
    },
    clearPilot: () => {
      file = null;
      readSeq++;
      estimateSeq++;
      deps.reader.forget();
      set((s) => ({ pilot: { ...initialPilot(), readOptions: s.pilot.readOptions, announcement: 'The pilot file was closed and forgotten.' } }));
    },
    setPilotReliabilitySource: (source) => {
      patch({ reliabilitySource: source, lastApply: null, offers: [] });
    },
    acceptPilotOffer: (path) => {
      get().commitDraft();
      const s = get();
      const offer = s.pilot.offers.find((o) => o.path === path);
      if (!offer || !deps.applyOffer) return;
      try {
        const before = s.validPlan;
        const after = deps.applyOffer(before, offer);
        get().replaceDraft(writePlanChangesIntoDraft(s.draft, before, after, [offer.path]));
        const done = `The corrected ANCOVA now assumes a reliability of ${draftText(offer.proposed)}, as the pretest.`;
        patch({ offers: s.pilot.offers.filter((o) => o.path !== path), problem: null, announcement: done });
        get().offerUndo(s.draft, 'pilot', done);
      } catch (err) {
        const problem = problemFrom('apply', err);
        patch({ problem, announcement: `Your plan is unchanged. ${problem.message}` });
      }
    },
    dismissPilotOffer: (path) => {
      const s = get().pilot;
      patch({ offers: s.offers.filter((o) => o.path !== path), announcement: 'The corrected ANCOVA keeps its assumed reliability.' });
    },
  };
};

installPilotActions(createPilotActions);
