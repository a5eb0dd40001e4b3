import type { AnalysisId, Plan } from '../plan';
import type { ExploreAxis, ExploreInput, ExploreSpec } from './exploreTypes';
import { EXPLORE_INPUTS, exploreInputs, exploreInputWords } from './exploreInputs';
import { designAnalysisIds, headlineAnalysisId } from '../design/studyDesign';
import { formatApart, formatNumber } from '../inputChecks';
import { PLAN_LIMITS } from '../planSchema';

/** Limits of an exploration (the page, the CLI and the PDF share them). */
export const EXPLORE_LIMITS = {
  stepsMin: 2,
  stepsMax: 12,
  cellsMax: 64,
  replicationsMin: 100,
  replicationsMax: 20_000,
  /** Replications per cell when none are given. */
  replicationsDefault: 2_000,
} as const;

/** Other spellings the CLI accepts for each input (lower case). */
const SPELLINGS: Record<string, ExploreInput> = Object.fromEntries(
  EXPLORE_INPUTS.flatMap((id) => {
    const kebab = id.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`);
    return [
      [id.toLowerCase(), id],
      [kebab, id],
      [kebab.replace(/-/g, '_'), id],
    ];
  }),
);

/** The input named by `name` (its id in any case, or with hyphens: "comparison-pool"), or null. */
export function exploreInputByName(name: string): ExploreInput | null {
  return SPELLINGS[name.trim().toLowerCase()] ?? null;
}

/**
 * Parse one `--vary` value of the CLI: `input=from:to:steps`, e.g.
 * `reliability=0.6:0.95:8`. Only the form is checked here; whether the input
 * applies and the range is allowed is validateExploreSpec's job.
 * Reference: none (command-line syntax).
 * @param text the value as typed. @returns the axis, or a plain problem that quotes what was typed.
 * @throws never.
 * @example parseVary('caliper=0.05:0.5:4') // { ok: true, axis: { input: 'caliper', from: 0.05, to: 0.5, steps: 4 } }
 */
export function parseVary(text: string): { ok: true; axis: ExploreAxis } | { ok: false; problem: string } {
  const names = EXPLORE_INPUTS.join(', ');
  const eq = text.indexOf('=');
  if (eq < 0) {
    return { ok: false, problem: `--vary "${text}" needs the form input=from:to:steps, e.g. reliability=0.6:0.95:8 (inputs: ${names}).` };
  }
  const name = text.slice(0, eq);
  const input = exploreInputByName(name);
  if (input === null) return { ok: false, problem: `--vary: "${name}" is not an input the explorer can vary; use one of ${names}.` };
  const parts = text.slice(eq + 1).split(':');
  if (parts.length !== 3) {
    return { ok: false, problem: `--vary ${name}: "${text.slice(eq + 1)}" needs three parts, from:to:steps, e.g. ${name}=0.6:0.95:8.` };
  }
  const [fromText, toText, stepsText] = parts as [string, string, string];
  const num = (s: string): number | null => (/^\s*[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?\s*$/i.test(s) ? Number(s) : null);
  const from = num(fromText);
  const to = num(toText);
  const steps = num(stepsText);
  if (from === null || !Number.isFinite(from)) return { ok: false, problem: `--vary ${name}: the start "${fromText}" is not a number.` };
  if (to === null || !Number.isFinite(to)) return { ok: false, problem: `--vary ${name}: the end "${toText}" is not a number.` };
  if (steps === null || !Number.isInteger(steps)) return { ok: false, problem: `--vary ${name}: the number of steps "${stepsText}" must be a whole number.` };
  return { ok: true, axis: { input, from, to, steps } };
}

/** Round a whole-number input: pools with clusters to whole clusters, others to the nearest integer. */
function roundAxisValue(plan: Plan, input: ExploreInput, x: number): number {
  if (!exploreInputWords(input).wholeNumber) return Number(x.toPrecision(12));
  const unit = (input === 'programmePool' || input === 'comparisonPool') && plan.clusters !== undefined ? plan.clusters.size : 1;
  return Math.round(x / unit) * unit;
}

/**
 * The values of one axis: `steps` evenly spaced from `from` to `to`
 * inclusive; whole-number inputs rounded (pool sizes with clusters to whole
 * clusters), others to 12 significant digits (no 0.6499999…).
 * @example axisValues(demoPlan(), { input: 'reliability', from: 0.6, to: 0.9, steps: 4 }) // [0.6, 0.7, 0.8, 0.9]
 */
export function axisValues(plan: Plan, axis: ExploreAxis): number[] {
  const n = Math.max(1, Math.floor(axis.steps));
  if (n === 1) return [roundAxisValue(plan, axis.input, axis.from)];
  return Array.from({ length: n }, (_, i) => roundAxisValue(plan, axis.input, i === n - 1 ? axis.to : axis.from + ((axis.to - axis.from) * i) / (n - 1)));
}

/**
 * Every problem with an exploration, in plain words naming the input: one or
 * two distinct axes that apply to the plan's design; steps 2..12 per axis;
 * at most 64 cells; each range inside the input's allowed range (exploreInputs)
 * with different ends, and whole-number inputs that do not round to repeated
 * values; replications 100..20,000 (whole); a seed the plan file allows; an
 * analysis the design has.
 * Reference: none (input checks).
 * @param plan a validated plan. @param spec the exploration.
 * @returns the problems (empty when the spec can run). @throws never.
 * @example validateExploreSpec(demoPlan(), { axes: [{ input: 'cutOff', from: 40, to: 60, steps: 3 }], ... })[0] // "The cut-off … Only a plan whose groups a cut-off rule forms has a cut-off."
 */
export function validateExploreSpec(plan: Plan, spec: ExploreSpec): string[] {
  const problems: string[] = [];
  const infos = exploreInputs(plan);
  const axes = Array.isArray(spec.axes) ? spec.axes : [];
  if (axes.length < 1 || axes.length > 2) problems.push(`Choose one or two inputs to vary; got ${axes.length}.`);
  if (axes.length === 2 && axes[0]!.input === axes[1]!.input) {
    problems.push(`${exploreInputWords(axes[0]!.input).label} is chosen twice; choose two different inputs.`);
  }
  for (const axis of axes) {
    const info = infos.find((i) => i.input === axis.input);
    if (info === undefined) {
      problems.push(`"${String(axis.input)}" is not an input the explorer can vary; use one of ${EXPLORE_INPUTS.join(', ')}.`);
      continue;
    }
    const name = info.label;
    if (!info.applies) {
      const why = info.notApplicableReason ?? '';
      problems.push(`${name} cannot be varied for this plan: ${why.charAt(0).toLowerCase()}${why.slice(1)}`);
      continue;
    }
    if (!Number.isInteger(axis.steps) || axis.steps < EXPLORE_LIMITS.stepsMin || axis.steps > EXPLORE_LIMITS.stepsMax) {
      problems.push(`${name}: the number of steps must be a whole number from ${EXPLORE_LIMITS.stepsMin} to ${EXPLORE_LIMITS.stepsMax}; got ${formatNumber(axis.steps)}.`);
    }
    if (!Number.isFinite(axis.from) || !Number.isFinite(axis.to)) {
      problems.push(`${name}: the start and end must be numbers.`);
      continue;
    }
    const unit = info.unit === '' ? '' : ` ${info.unit}`;
    for (const [what, v] of [['start', axis.from], ['end', axis.to]] as const) {
      if (v < info.allowed.min || v > info.allowed.max) {
        const [lo, hi, got] = formatApart(info.allowed.min, info.allowed.max, v);
        problems.push(`${name}: the ${what} must be from ${lo} to ${hi}${unit}; got ${got}.`);
      }
    }
    if (axis.from === axis.to) problems.push(`${name}: the start and the end are the same (${formatNumber(axis.from)}); give a range.`);
    else if (info.wholeNumber && Number.isInteger(axis.steps) && axis.steps >= 2) {
      const values = axisValues(plan, axis);
      if (new Set(values).size < values.length) {
        const each = axis.input !== 'clusterSize' && plan.clusters !== undefined && (axis.input === 'programmePool' || axis.input === 'comparisonPool') ? ` (whole clusters of ${plan.clusters.size})` : '';
        problems.push(`${name}: ${axis.steps} steps from ${formatNumber(axis.from)} to ${formatNumber(axis.to)} repeat values once rounded to whole numbers${each}; use fewer steps or a wider range.`);
      }
    }
  }
  const cells = axes.reduce((n, a) => n * (Number.isInteger(a.steps) && a.steps > 0 ? a.steps : 1), 1);
  if (cells > EXPLORE_LIMITS.cellsMax) problems.push(`The grid has ${cells} cells; at most ${EXPLORE_LIMITS.cellsMax} are allowed (use fewer steps).`);
  const r = spec.replications;
  if (!Number.isInteger(r) || r < EXPLORE_LIMITS.replicationsMin || r > EXPLORE_LIMITS.replicationsMax) {
    problems.push(`Replications per cell must be a whole number from ${EXPLORE_LIMITS.replicationsMin} to ${EXPLORE_LIMITS.replicationsMax.toLocaleString('en-GB')}; got ${formatNumber(r)}.`);
  }
  if (!Number.isInteger(spec.seed) || spec.seed < 0 || spec.seed > PLAN_LIMITS.seedMax) {
    problems.push(`The seed must be a whole number from 0 to ${PLAN_LIMITS.seedMax}; got ${formatNumber(spec.seed)}.`);
  }
  const ids = designAnalysisIds(plan);
  if (!ids.includes(spec.analysisId)) problems.push(`This plan has no analysis "${String(spec.analysisId)}"; use one of ${ids.join(', ')}.`);
  return problems;
}

/**
 * A first exploration for a plan: the given inputs (default: reliability)
 * over their default ranges, the design's headline analysis, the plan's seed
 * and EXPLORE_LIMITS.replicationsDefault replications per cell (fewer steps
 * when two inputs would pass the cell limit).
 * @example defaultExploreSpec(demoPlan()).axes[0] // { input: 'reliability', from: 0.6, to: 0.95, steps: 8 }
 */
export function defaultExploreSpec(plan: Plan, inputs: ExploreInput[] = ['reliability'], analysisId?: AnalysisId): ExploreSpec {
  const infos = exploreInputs(plan);
  const axes = inputs.slice(0, 2).map((input) => {
    const d = (infos.find((i) => i.input === input) as { defaultRange: { from: number; to: number; steps: number } }).defaultRange;
    return { input, from: d.from, to: d.to, steps: d.steps };
  });
  if (axes.length === 2) {
    while (axes[0]!.steps * axes[1]!.steps > EXPLORE_LIMITS.cellsMax) {
      const big = axes[0]!.steps >= axes[1]!.steps ? axes[0]! : axes[1]!;
      big.steps -= 1;
    }
  }
  return {
    axes: axes as ExploreSpec['axes'],
    analysisId: analysisId ?? headlineAnalysisId(plan),
    replications: EXPLORE_LIMITS.replicationsDefault,
    seed: plan.simulation.seed,
  };
}
