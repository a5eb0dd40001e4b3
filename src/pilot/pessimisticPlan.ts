import type { Plan } from '../core/plan';
import { PLAN_LIMITS } from '../core/planSchema';
import { validatePlan } from '../core/validatePlan';
import { formatCoefficient } from './formatPilotNumber';

const PREFIX = /^pessimistic \(lower end of the \d+% CI\): /;

/** The pessimistic plan, or why there is none (for the UI to show). */
export type PessimisticPlanResult = { ok: true; plan: Plan; reliability: number } | { ok: false; reason: string };

/**
 * The plan run at the lower end of the pretest reliability's confidence
 * interval (e.g. Feldt's CI of a pilot alpha), so the planner can show what
 * happens if the instrument is as weak as the pilot data allow. The
 * provenance note of pretest.reliability says so; its interval is kept.
 * Applying it twice gives the same plan.
 *
 * Reference: using a confidence limit of a planning input as a pessimistic
 * (conservative) value is common practice in sample-size planning (e.g.
 * Browne 1995, Statistics in Medicine 14, 1933–1940: plan with an upper
 * confidence limit of a pilot SD; from memory).
 *
 * @param plan a plan whose provenance['pretest.reliability'] has an interval
 *   (as pilotPlanUpdate writes).
 * @returns { ok: true, plan, reliability } (the plan passes validatePlan), or
 *   { ok: false, reason } when the plan has no reliability interval, the lower
 *   end is not a usable reliability (≤ 0), or the plan would break a rule
 *   (e.g. its pre–post correlation exceeds the root of the lower reliability).
 *   Never throws.
 * @example pessimisticPlanResult(planFromPilot) // { ok: true, reliability: .77, plan: { pretest: { reliability: .77, … } } }
 */
export function pessimisticPlanResult(plan: Plan): PessimisticPlanResult {
  const prov = plan.provenance?.['pretest.reliability'];
  if (plan.pretest.reliability === undefined || prov?.interval === undefined) {
    return {
      ok: false,
      reason: 'The pretest reliability has no confidence interval here (it was not estimated from a pilot file), so there is no pessimistic value to use.',
    };
  }
  const lower = prov.interval.lower;
  const level = `${Math.round(prov.interval.level * 100)}%`;
  if (!(lower > 0)) {
    return {
      ok: false,
      reason: `The lower end of the reliability's ${level} CI is ${formatCoefficient(lower)}, not a usable reliability (it must be above 0): the pilot sample is too small or the pretest too unreliable to plan with its lower limit.`,
    };
  }
  const out = structuredClone(plan);
  out.pretest = { ...out.pretest, reliability: lower };
  const note = `pessimistic (lower end of the ${level} CI): ${prov.note.replace(PREFIX, '')}`;
  const max = PLAN_LIMITS.provenanceNoteMaxLength;
  out.provenance = {
    ...out.provenance,
    'pretest.reliability': { ...prov, note: note.length > max ? `${note.slice(0, max - 1)}…` : note },
  };
  const check = validatePlan(out);
  if (!check.ok) {
    return {
      ok: false,
      reason: `At the lower end of its ${level} CI (${formatCoefficient(lower)}) the reliability breaks a plan rule: ${check.problems.map((p) => p.message).join(' ')}`,
    };
  }
  return { ok: true, plan: out, reliability: lower };
}

/**
 * The plan with pretest.reliability at the lower end of its provenance
 * interval, or undefined when there is none or it cannot be used (see
 * pessimisticPlanResult for the reason).
 * @example pessimisticPlan(demoPlan()) // undefined: the demo's reliability has no interval
 */
export function pessimisticPlan(plan: Plan): Plan | undefined {
  const r = pessimisticPlanResult(plan);
  return r.ok ? r.plan : undefined;
}
