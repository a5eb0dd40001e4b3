import { TWO_GROUP_ANALYSIS_IDS, type AnalysisId } from '../core/plan';
import { FLAG_COMPUTED, FLAG_COVERED, FLAG_REJECTED, FLAG_WRONG_SIGN } from './summariseAnalysis';
import { TCriticalValues } from './tQuantile';
import type { ReplicationStore } from './replicationBlock';

/** Slot of the matched difference in AnalysisRecords. */
export const SLOT_MATCHED = 0;
/** Slot of ANCOVA in the full pools. */
export const SLOT_ANCOVA = 1;
/** Slot of the gain score. */
export const SLOT_GAIN = 2;
/** Slot of the reliability-corrected ANCOVA. */
export const SLOT_CORRECTED = 3;
/** Slot of ANCOVA in the matched sample. */
export const SLOT_ANCOVA_MATCHED = 4;
/** Slot of the regression-discontinuity analysis (selection rules on an observed basis). */
export const SLOT_RD = 5;
/** Slot of the one-group pre–post change. */
export const SLOT_PRE_POST = 6;
/** Slot of the person-level ANCOVA with cluster-robust (CR2) SEs (clusters only). */
export const SLOT_PERSON = 7;
/** Slot of the same person-level estimates with the naive OLS SE that ignores clustering (clusters only). */
export const SLOT_PERSON_NAIVE = 8;
/** Slot of the matched difference of people matched across clusters with the one-level SE that ignores clustering (clusters only). */
export const SLOT_MATCHED_NAIVE = 9;
/** Number of slots: the seven analyses, ANCOVA in the matched sample and the two naive figures of clustered designs. */
export const SLOT_COUNT = 10;
/** The slot of each of the four analyses (ANCOVA in the full pools for 'ancova'). */
export const ANALYSIS_SLOT: Readonly<Record<AnalysisId, number>> = {
  matchedDifference: SLOT_MATCHED,
  ancova: SLOT_ANCOVA,
  gainScore: SLOT_GAIN,
  correctedAncova: SLOT_CORRECTED,
  regressionDiscontinuity: SLOT_RD,
  prePostChange: SLOT_PRE_POST,
  personLevelAncova: SLOT_PERSON,
};

/**
 * Per-replication estimates, model SEs and outcome flags of the five
 * estimators both Monte Carlo engines run (slots SLOT_*), allocated once per
 * simulation. `record` classifies one estimate against the true effect tau:
 * its 95% CI est ± t_{.975, df} · SE covers tau (FLAG_COVERED); the two-sided
 * t test rejects at alpha, |est| > t_{1 − alpha/2, df} · SE (FLAG_REJECTED),
 * and if so with the sign opposite to the hoped-for direction
 * (FLAG_WRONG_SIGN; tau = 0 counts as a positive hoped-for effect). These are
 * the indicators whose shares Morris, White & Crowther (2019, Table 6) call
 * coverage and rejection rate; summariseAnalysis turns them into summaries.
 *
 * @example
 *   const r = new AnalysisRecords(2, 0, 0.05);
 *   r.record(SLOT_GAIN, 0, 3, 1, 10); // t_{.975, 10} = 2.228 (t table; common practice): |3 − 0| > 2.228, so
 *   r.flags[SLOT_GAIN][0] // not covered, rejected, right sign: FLAG_COMPUTED | FLAG_REJECTED = 5
 */
export class AnalysisRecords {
  /** est[slot][i]: replication i's estimate, points (valid where flags has FLAG_COMPUTED). */
  readonly est: Float64Array[] = [];
  /** se[slot][i]: its model SE, points. */
  readonly se: Float64Array[] = [];
  /** flags[slot][i]: FLAG_* bits. */
  readonly flags: Uint8Array[] = [];
  /** True effect, points. */
  readonly tau: number;
  /** Sign of the hoped-for effect: −1 when tau < 0, else +1. */
  readonly direction: number;
  readonly critAlpha: TCriticalValues;
  readonly crit95: TCriticalValues;

  /**
   * @param total number of replications (≥ 1).
   * @param tau true programme effect, points.
   * @param alpha two-sided significance level of the test, in (0, 1).
   * @param ids the analyses to summarise (default the four two-group ones); slots of others stay unused.
   * @throws Error when alpha is not in (0, 1) (from TCriticalValues).
   */
  /** The analyses this simulation summarises (its design's), in display order. */
  readonly ids: readonly AnalysisId[];

  constructor(total: number, tau: number, alpha: number, ids: readonly AnalysisId[] = TWO_GROUP_ANALYSIS_IDS) {
    this.tau = tau;
    this.ids = ids;
    this.direction = tau < 0 ? -1 : 1; // tau = 0: a positive effect is the hoped-for direction
    this.critAlpha = new TCriticalValues(alpha);
    this.crit95 = new TCriticalValues(0.05);
    for (let a = 0; a < SLOT_COUNT; a++) {
      this.est.push(new Float64Array(total));
      this.se.push(new Float64Array(total));
      this.flags.push(new Uint8Array(total));
    }
  }

  /** Every slot's estimates, SEs and flags as per-replication stores (stride 1), for exportBlock / importBlock. */
  stores(): ReplicationStore[] {
    const out: ReplicationStore[] = [];
    for (let a = 0; a < SLOT_COUNT; a++) {
      out.push({ array: this.est[a] as Float64Array, stride: 1 }, { array: this.se[a] as Float64Array, stride: 1 }, { array: this.flags[a] as Uint8Array, stride: 1 });
    }
    return out;
  }

  /**
   * Store replication i's estimate e (points) with model SE s (points, > 0)
   * and df degrees of freedom (> 0) in the slot, with its flags.
   * @throws Error when df is not positive (from TCriticalValues).
   */
  record(slot: number, i: number, e: number, s: number, df: number): void {
    let f = FLAG_COMPUTED;
    if (Math.abs(e - this.tau) <= this.crit95.get(df) * s) f |= FLAG_COVERED;
    if (Math.abs(e) > this.critAlpha.get(df) * s) {
      f |= FLAG_REJECTED;
      if (e * this.direction < 0) f |= FLAG_WRONG_SIGN;
    }
    (this.est[slot] as Float64Array)[i] = e;
    (this.se[slot] as Float64Array)[i] = s;
    (this.flags[slot] as Uint8Array)[i] = f;
  }
}
