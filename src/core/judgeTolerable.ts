import { requireFinite, requireNonNegative, requireOpenInterval } from './inputChecks';

/** A plan's false-positive rate may reach at most this multiple of alpha and still be called tolerable (project rule). */
export const FALSE_POSITIVE_LIMIT_FACTOR = 1.5;
/** Power may fall by at most this much (a proportion: 10 percentage points) and still be called tolerable (project rule). */
export const POWER_DROP_LIMIT = 0.1;

/** Which condition of "tolerable" an analysis fails. */
export type ToleranceFailure = 'artefact' | 'false-positive' | 'power-drop';

/** Whether an analysis may be called tolerable, each condition on its own, and why (one plain sentence). */
export interface Tolerability {
  tolerable: boolean;
  /** |regression artefact| ≤ tolerable share × |tau| (when tau = 0: the artefact is numerically zero). */
  artefactWithinShare: boolean;
  /** false-positive rate ≤ 1.5 × alpha; null when the rate is not known (analysis not feasible). */
  falsePositiveWithinLimit: boolean | null;
  /** power without bias − power with it ≤ 10 percentage points; null when not known (not feasible, or tau = 0). */
  powerDropWithinLimit: boolean | null;
  /** The conditions that failed, in the order above (empty when tolerable). */
  failed: ToleranceFailure[];
  /** One or two sentences: which conditions hold or fail, with the figures. */
  reason: string;
}

const pct = (x: number): string => `${(x * 100).toFixed(1)}%`;
const pct0 = (x: number): string => `${Math.round(x * 100)}%`;

/**
 * Whether an analysis may be called tolerable: only when all three hold —
 * the regression artefact (the growth gap left out: a guessed growth gap that
 * happens to offset it does not make a design safe) is within the tolerable
 * share of the hoped-for effect; the false-positive rate if the programme did
 * nothing stays at or below 1.5 × alpha; and the artefact lowers power by at
 * most 10 percentage points. The two error-rate limits are this project's
 * rule, in the spirit of Bradley (1978)'s "liberal" robustness criterion
 * (a true type I rate within 0.5α–1.5α, from memory).
 *
 * @param x tau and the regression artefact (points), the tolerable share,
 *   alpha, and the analysis' false-positive rate, power and power without the
 *   bias (null when not known).
 * @returns the judgement with its reason.
 * @throws Error on non-finite figures or a negative share.
 * @example judgeTolerable({ tau: 2.5, regressionArtefact: -0.33, tolerableShare: 0.25, alpha: 0.05, falsePositiveRate: 0.09, power: 0.72, powerWithoutBias: 0.83 }).failed // ['false-positive', 'power-drop']
 */
export function judgeTolerable(x: {
  tau: number;
  regressionArtefact: number;
  tolerableShare: number;
  alpha: number;
  falsePositiveRate: number | null;
  power: number | null;
  powerWithoutBias: number | null;
  /** Why the error rates are unknown when falsePositiveRate is null (default: the analysis cannot be carried out as planned); '' says nothing. */
  whyRatesUnknown?: string;
}): Tolerability {
  requireFinite(x.tau, 'The hoped-for effect');
  requireFinite(x.regressionArtefact, 'The regression artefact');
  requireNonNegative(x.tolerableShare, 'The tolerable share of the effect');
  requireOpenInterval(x.alpha, 0, 1, 'The significance level');
  const limit = x.tau === 0 ? 1e-9 : x.tolerableShare * Math.abs(x.tau);
  const artefactWithinShare = Math.abs(x.regressionArtefact) <= limit;
  const fprLimit = FALSE_POSITIVE_LIMIT_FACTOR * x.alpha;
  const falsePositiveWithinLimit = x.falsePositiveRate === null ? null : x.falsePositiveRate <= fprLimit + 1e-12;
  const drop = x.tau === 0 || x.power === null || x.powerWithoutBias === null ? null : x.powerWithoutBias - x.power;
  const powerDropWithinLimit = drop === null ? null : drop <= POWER_DROP_LIMIT + 1e-12;
  const failed: ToleranceFailure[] = [];
  if (!artefactWithinShare) failed.push('artefact');
  if (falsePositiveWithinLimit === false) failed.push('false-positive');
  if (powerDropWithinLimit === false) failed.push('power-drop');
  const share = x.tau === 0 ? null : Math.abs(x.regressionArtefact / x.tau);
  const parts: string[] = [];
  parts.push(
    x.tau === 0
      ? artefactWithinShare
        ? 'there is no regression artefact'
        : 'the hoped-for effect is zero, yet the regression artefact is not'
      : `the regression artefact is ${pct0(share as number)} of the effect (${artefactWithinShare ? 'within' : 'more than'} the ${pct0(x.tolerableShare)} you can tolerate)`,
  );
  if (x.falsePositiveRate !== null) {
    parts.push(
      `the false-positive rate is ${pct(x.falsePositiveRate)} (${falsePositiveWithinLimit ? 'at or below' : 'above'} 1.5 × α = ${pct(fprLimit)})`,
    );
  }
  if (drop !== null && x.power !== null && x.powerWithoutBias !== null) {
    parts.push(
      `power ${drop > 0 ? 'falls' : 'goes'} from ${pct0(x.powerWithoutBias)} to ${pct0(x.power)} (${powerDropWithinLimit ? 'a drop of at most' : 'a drop of more than'} 10 percentage points)`,
    );
  }
  const tolerable = failed.length === 0;
  const list = parts.length <= 1 ? parts.join('') : `${parts.slice(0, -1).join('; ')}; and ${parts[parts.length - 1]}`;
  const why = x.whyRatesUnknown ?? 'The error rates are not known because the analysis cannot be carried out as planned.';
  const unknown = x.falsePositiveRate === null && why !== '' ? ` ${why}` : '';
  const reason = tolerable
    ? `Tolerable: ${list}.${unknown}`
    : `Not tolerable (${failed.map((f) => FAILURE_WORDS[f]).join(', ')}): ${list}.${unknown}`;
  return { tolerable, artefactWithinShare, falsePositiveWithinLimit, powerDropWithinLimit, failed, reason };
}

/** Each failed condition in a few words. */
export const FAILURE_WORDS: Record<ToleranceFailure, string> = {
  artefact: 'artefact too large',
  'false-positive': 'false-positive rate too high',
  'power-drop': 'power falls too far',
};
