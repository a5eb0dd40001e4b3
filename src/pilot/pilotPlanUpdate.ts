import type { FieldProvenance, Plan } from '../core/plan';
import { PLAN_LIMITS } from '../core/planSchema';
import { validatePlan } from '../core/validatePlan';
import { formatCoefficient } from './formatPilotNumber';
import type { AppliedPilotField, PilotEstimates, PilotPlanUpdate, SkippedPilotField } from './types';

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
export function pilotPlanUpdate(plan: Plan, est: PilotEstimates): PilotPlanUpdate {
  const before = validatePlan(plan);
  if (!before.ok) {
    throw new Error(
      `Pilot values can only be written into a valid plan; this one has ${before.problems.length === 1 ? 'a problem' : 'problems'}: ${before.problems.map((p) => p.message).join(' ')}`,
    );
  }
  const candidates = pilotCandidates(est);
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
  return { plan: withCandidates(plan, candidates, chosen), applied, skipped };
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

function pilotCandidates(est: PilotEstimates): Candidate[] {
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

  const rel = reliabilityChoice(est);
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
        `comparison group pre–post correlation = ${formatCoefficient(r)}, n = ${comparison.nPrePost}`,
        (p, v) => {
          p.outcome.prePostCorrelation = v;
        },
      ),
    );
  }
  return out;
}

/** Alpha when items were mapped, else test–retest when mapped; with its note and interval. */
function reliabilityChoice(
  est: PilotEstimates,
): { value: number; note: string; interval: { lower: number; upper: number; level: number } } | undefined {
  const a = est.reliability.alpha;
  if (a) {
    return {
      value: a.value,
      note: `Cronbach's alpha within groups = ${formatCoefficient(a.value)} (${pct(a.level)} CI ${formatCoefficient(a.lower)} to ${formatCoefficient(a.upper)}, Feldt), n = ${a.n}, ${a.items} items`,
      interval: { lower: a.lower, upper: a.upper, level: a.level },
    };
  }
  const t = est.reliability.testRetest;
  if (t) {
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
