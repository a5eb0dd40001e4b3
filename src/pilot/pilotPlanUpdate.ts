import type { FieldProvenance, Plan } from '../core/plan';
import { PLAN_LIMITS } from '../core/planSchema';
import { validatePlan } from '../core/validatePlan';
import { formatCoefficient } from './formatPilotNumber';
import { designAnalysisIds } from '../core/design/studyDesign';
import type {
  AppliedPilotField,
  PilotEstimates,
  PilotOffer,
  PilotPlanUpdate,
  PilotReliabilityOption,
  PilotReliabilitySource,
  SkippedPilotField,
} from './types';

/** One candidate write: the plan paths it sets, how, and its provenance. */
interface Candidate {
  /** The field the user thinks of (reported when skipped). */
  path: string;
  value: number;
  apply(plan: Plan): void;
  /** Provenance entries it writes (path → entry); the first is `path` itself. */
  provenance: Array<{ path: string; value: number; entry: FieldProvenance }>;
}

/**
 * Write pilot estimates into a plan: each group's pretest mean and SD; the
 * pretest's reliability (the pooled within-group Cronbach's alpha when items
 * were mapped, else the within-group test–retest correlation) with
 * referenceSD = the pooled within-group SD (and no SEM); and, when a posttest
 * was mapped, outcome.posttestSD and outcome.prePostCorrelation from the
 * comparison group (the plan documents both as comparison-group values).
 * Each written field gets `plan.provenance[path] = { source: 'pilot', note,
 * interval? }` (the reliability's carries its confidence interval).
 *
 * A value that would break a plan rule (validatePlan: ranges, and e.g. a
 * pre–post correlation above the root of the reliability, Spearman 1904; an
 * SEM at least a group's SD) is not written: the largest set of values that
 * pass together is written (ties: earlier in the order above wins) and each
 * other value is returned in `skipped` with validatePlan's message as reason.
 *
 * Reference: the fields' meanings as in src/core/plan.ts; pooled
 * within-group SD as the reference SD of a within-group reliability (Lord &
 * Novick 1968, ch. 3, common practice).
 *
 * @param plan a plan that passes validatePlan (it is not changed).
 * @param est estimates from estimatePilot.
 * @returns { plan, applied, skipped }: plan is a new plan that passes
 *   validatePlan; applied lists each written path with its value and note;
 *   skipped lists each unwritten path with its value and the reason.
 * @throws Error when `plan` itself does not pass validatePlan (the message lists its problems).
 * @example
 *   pilotPlanUpdate(demoPlan(), est).plan.provenance['pretest.reliability'].note
 *   // "from pilot file cohort.csv, Cronbach's alpha within groups = .81 (95% CI .77 to .85, Feldt), n = 212, 8 items"
 */
export function pilotPlanUpdate(plan: Plan, est: PilotEstimates, options: PilotPlanUpdateOptions = {}): PilotPlanUpdate {
  const before = validatePlan(plan);
  if (!before.ok) {
    throw new Error(
      `Pilot values can only be written into a valid plan; this one has ${before.problems.length === 1 ? 'a problem' : 'problems'}: ${before.problems.map((p) => p.message).join(' ')}`,
    );
  }
  const source = chosenReliabilitySource(est, options.reliability);
  const candidates = pilotCandidates(est, source);
  const m = candidates.length;

  // Largest passing subset; among equal sizes the one keeping earlier candidates (bit i = candidate i).
  const masks = Array.from({ length: 1 << m }, (_, mask) => mask).sort(
    (a, b) => popcount(b) - popcount(a) || priorityKey(b, m) - priorityKey(a, m),
  );
  let chosen = 0;
  for (const mask of masks) {
    if (validatePlan(withCandidates(plan, candidates, mask)).ok) {
      chosen = mask;
      break;
    }
  }

  const applied: AppliedPilotField[] = [];
  const skipped: SkippedPilotField[] = [];
  candidates.forEach((c, i) => {
    if (chosen & (1 << i)) {
      for (const p of c.provenance) applied.push({ path: p.path, value: p.value, note: p.entry.note });
      return;
    }
    const check = validatePlan(withCandidates(plan, candidates, chosen | (1 << i)));
    const reason = check.ok
      ? 'Not written: together with the other pilot values it breaks a plan rule.'
      : `Not written: ${check.problems.map((p) => p.message).join(' ')}`;
    skipped.push({ path: c.path, value: c.value, reason });
  });
  const after = withCandidates(plan, candidates, chosen);
  const reliabilityWritten = applied.some((a) => a.path === 'pretest.reliability');
  return {
    plan: after,
    applied,
    skipped,
    offers: reliabilityWritten ? correctedAncovaOffers(after) : [],
    ...(reliabilityWritten && source ? { reliabilitySource: source } : {}),
  };
}

/** Options of pilotPlanUpdate. */
export interface PilotPlanUpdateOptions {
  /**
   * Which reliability to write: 'alpha' or 'test-retest'. Left out: alpha
   * when items were mapped, else test–retest (as before this option existed);
   * the planner passes the researcher's choice, which starts at the
   * recommended one (see pilotReliabilityOptions).
   */
  reliability?: PilotReliabilitySource;
}

/**
 * The reliabilities the pilot offers for the plan, each with why it fits or
 * not. Alpha counts only disagreement between items at one sitting as error;
 * the test–retest correlation also counts day-to-day fluctuation, which is
 * the error that makes a group picked on one day's scores drift back on
 * another day (regression toward the mean), so it is recommended when a
 * retest was mapped (Lord & Novick 1968, ch. 3 and 9, from memory; the
 * distinction is common practice).
 *
 * @returns the options (alpha first when present), exactly one recommended; empty when none was estimated.
 */
export function pilotReliabilityOptions(est: PilotEstimates): PilotReliabilityOption[] {
  const out: PilotReliabilityOption[] = [];
  const a = est.reliability.alpha;
  const t = est.reliability.testRetest;
  if (a) {
    out.push({
      source: 'alpha',
      value: a.value,
      label: `Cronbach's alpha within groups, ${formatCoefficient(a.value)} (${pct(a.level)} CI ${formatCoefficient(a.lower)} to ${formatCoefficient(a.upper)})`,
      why: t
        ? 'Counts only disagreement between the items at one sitting as error. Day-to-day ups and downs are not counted, yet they are what regresses when groups differ on one day\'s scores, so alpha usually overstates the reliability that matters here.'
        : 'Counts only disagreement between the items at one sitting as error; day-to-day ups and downs, which also regress, are not counted, so the artefact may be larger than planned. Map a retest column to compare.',
      recommended: !t,
    });
  }
  if (t) {
    out.push({
      source: 'test-retest',
      value: t.value,
      label: `test–retest correlation within groups, ${formatCoefficient(t.value)} (${pct(t.level)} CI ${formatCoefficient(t.lower)} to ${formatCoefficient(t.upper)})`,
      why: 'Counts day-to-day ups and downs as error as well as item disagreement: that error is what regresses toward the mean between pretest and posttest, so this is the figure recommended for the plan (if real change between the two sittings is small).',
      recommended: true,
    });
  }
  return out;
}

/** The source written: the one asked for when it was estimated, else the default (alpha, then test–retest). */
function chosenReliabilitySource(est: PilotEstimates, asked: PilotReliabilitySource | undefined): PilotReliabilitySource | undefined {
  if (asked === 'test-retest' && est.reliability.testRetest) return 'test-retest';
  if (asked === 'alpha' && est.reliability.alpha) return 'alpha';
  if (est.reliability.alpha) return 'alpha';
  if (est.reliability.testRetest) return 'test-retest';
  return undefined;
}

/**
 * When the plan has a corrected ANCOVA and its assumed reliability differs
 * from the pretest reliability just written, ask whether to use that value
 * there too (the correction removes the artefact only when the assumed value
 * matches the pretest's reliability; Porter 1967, from memory).
 */
function correctedAncovaOffers(plan: Plan): PilotOffer[] {
  const r = plan.pretest.reliability;
  if (typeof r !== 'number' || !designAnalysisIds(plan).includes('correctedAncova')) return [];
  const current = plan.analysis.assumedReliability;
  if (current === r) return [];
  const proposed = r;
  const check = structuredClone(plan);
  check.analysis.assumedReliability = proposed;
  if (!validatePlan(check).ok) return [];
  return [
    {
      path: 'analysis.assumedReliability',
      current,
      proposed,
      message: `The corrected ANCOVA still assumes a reliability of ${formatCoefficient(current, 3)}, but the pretest reliability is now ${formatCoefficient(proposed, 3)} from the pilot. The correction removes the artefact only when the value it assumes matches the pretest's reliability. Use ${formatCoefficient(proposed, 3)} for the corrected ANCOVA too?`,
      note: clip(`${plan.provenance?.['pretest.reliability']?.note ?? 'from the pilot file'} (also assumed by the corrected ANCOVA)`),
    },
  ];
}

/**
 * Accept an offer from pilotPlanUpdate: the plan with that one value and its
 * provenance written; the input is not changed.
 * @throws Error when the result would not pass validatePlan (the message lists why).
 */
export function applyPilotOffer(plan: Plan, offer: PilotOffer): Plan {
  if (offer.path !== 'analysis.assumedReliability') throw new Error(`Unknown pilot offer for ${offer.path}.`);
  const out = structuredClone(plan);
  out.analysis.assumedReliability = offer.proposed;
  out.provenance = { ...(out.provenance ?? {}), [offer.path]: { source: 'pilot', note: offer.note } };
  const check = validatePlan(out);
  if (!check.ok) throw new Error(`The corrected ANCOVA's assumed reliability was not changed: ${check.problems.map((p) => p.message).join(' ')}`);
  return out;
}

/** The plan with the candidates in `mask` written (a deep copy; the input is untouched). */
function withCandidates(plan: Plan, candidates: Candidate[], mask: number): Plan {
  const out = structuredClone(plan);
  candidates.forEach((c, i) => {
    if (!(mask & (1 << i))) return;
    c.apply(out);
    const provenance = { ...(out.provenance ?? {}) };
    for (const p of c.provenance) provenance[p.path] = p.entry;
    out.provenance = provenance;
  });
  return out;
}

function pilotCandidates(est: PilotEstimates, source: PilotReliabilitySource | undefined): Candidate[] {
  const from = fileNote(est.fileName);
  const { programme, comparison } = est.groups;
  const out: Candidate[] = [];
  const simple = (path: string, value: number, note: string, set: (p: Plan, v: number) => void): Candidate => ({
    path,
    value,
    apply: (p) => set(p, value),
    provenance: [{ path, value, entry: { source: 'pilot', note: clip(`${from}, ${note}`) } }],
  });

  out.push(
    simple('groups.programme.pretestMean', programme.pretestMean, `programme group pretest mean, n = ${programme.n}`, (p, v) => {
      p.groups.programme.pretestMean = v;
    }),
    simple('groups.comparison.pretestMean', comparison.pretestMean, `comparison group pretest mean, n = ${comparison.n}`, (p, v) => {
      p.groups.comparison.pretestMean = v;
    }),
    simple('groups.programme.pretestSD', programme.pretestSD, `programme group pretest SD, n = ${programme.n}`, (p, v) => {
      p.groups.programme.pretestSD = v;
    }),
    simple('groups.comparison.pretestSD', comparison.pretestSD, `comparison group pretest SD, n = ${comparison.n}`, (p, v) => {
      p.groups.comparison.pretestSD = v;
    }),
  );

  const rel = reliabilityChoice(est, source);
  if (rel) {
    const referenceSD = est.pooledWithinSD;
    out.push({
      path: 'pretest.reliability',
      value: rel.value,
      apply: (p) => {
        p.pretest = { reliability: rel.value, referenceSD };
        if (p.provenance) {
          const { ['pretest.sem']: _dropped, ...rest } = p.provenance;
          p.provenance = rest;
        }
      },
      provenance: [
        {
          path: 'pretest.reliability',
          value: rel.value,
          entry: { source: 'pilot', note: clip(`${from}, ${rel.note}`), interval: rel.interval },
        },
        {
          path: 'pretest.referenceSD',
          value: referenceSD,
          entry: {
            source: 'pilot',
            note: clip(`${from}, pooled within-group pretest SD (where the reliability was estimated), n = ${est.rowsUsed}`),
          },
        },
      ],
    });
  }

  if (comparison.posttestSD !== undefined && comparison.nPrePost !== undefined) {
    out.push(
      simple('outcome.posttestSD', comparison.posttestSD, `comparison group posttest SD, n = ${comparison.nPrePost}`, (p, v) => {
        p.outcome.posttestSD = v;
      }),
    );
  }
  if (comparison.prePostCorrelation !== undefined && comparison.nPrePost !== undefined) {
    const r = comparison.prePostCorrelation;
    out.push(
      simple(
        'outcome.prePostCorrelation',
        r,
        `comparison group pre–post correlation = ${formatCoefficient(r)}, n = ${comparison.nPrePost}${est.prePostByGroup?.differ ? ` (programme group's ${formatCoefficient(est.prePostByGroup.programme.value)} differs; not merged)` : ''}`,
        (p, v) => {
          p.outcome.prePostCorrelation = v;
        },
      ),
    );
  }
  return out;
}

/** The chosen reliability (alpha or test–retest) with its note and interval. */
function reliabilityChoice(
  est: PilotEstimates,
  source: PilotReliabilitySource | undefined,
): { value: number; note: string; interval: { lower: number; upper: number; level: number } } | undefined {
  const a = est.reliability.alpha;
  if (a && source === 'alpha') {
    return {
      value: a.value,
      note: `Cronbach's alpha within groups = ${formatCoefficient(a.value)} (${pct(a.level)} CI ${formatCoefficient(a.lower)} to ${formatCoefficient(a.upper)}, Feldt), n = ${a.n}, ${a.items} items`,
      interval: { lower: a.lower, upper: a.upper, level: a.level },
    };
  }
  const t = est.reliability.testRetest;
  if (t && source === 'test-retest') {
    return {
      value: t.value,
      note: `test–retest correlation within groups = ${formatCoefficient(t.value)} (${pct(t.level)} CI ${formatCoefficient(t.lower)} to ${formatCoefficient(t.upper)}, Fisher z), n = ${t.n}`,
      interval: { lower: t.lower, upper: t.upper, level: t.level },
    };
  }
  return undefined;
}

function fileNote(fileName: string | undefined): string {
  if (fileName === undefined || fileName.trim() === '') return 'from the pilot file';
  const name = fileName.trim();
  return `from pilot file ${name.length > 80 ? `${name.slice(0, 79)}…` : name}`;
}

function clip(note: string): string {
  const max = PLAN_LIMITS.provenanceNoteMaxLength;
  return note.length > max ? `${note.slice(0, max - 1)}…` : note;
}

function pct(level: number): string {
  return `${Math.round(level * 100)}%`;
}

function popcount(x: number): number {
  let c = 0;
  for (let v = x; v; v &= v - 1) c++;
  return c;
}

/** Larger when earlier candidates are kept: candidate 0 is the most significant. */
function priorityKey(mask: number, m: number): number {
  let key = 0;
  for (let i = 0; i < m; i++) key = key * 2 + ((mask >> i) & 1);
  return key;
}
