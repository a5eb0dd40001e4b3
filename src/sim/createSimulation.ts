import { ANALYSIS_IDS, type AnalysisId, type Plan } from '../core/plan';
import { deriveModelParameters } from '../core/deriveModelParameters';
import type { ModelParameters } from '../core/modelParameters';
import { ancovaEstimate } from './ancovaEstimate';
import { createMatchingWorkspace, matchOnPretest, type MatchingWorkspace } from './matchOnPretest';
import { NormalSampler } from './normalSampler';
import { drawReplicationVariates } from './drawReplicationVariates';
import { NormalSampleIndex } from './normalSampleIndex';
import {
  FLAG_COMPUTED,
  FLAG_COVERED,
  FLAG_REJECTED,
  FLAG_WRONG_SIGN,
  summariseAnalysis,
} from './summariseAnalysis';
import { TCriticalValues } from './tQuantile';
import type { ExamplePair, SimMatchingSummary, SimulationResult } from './types';
import { validateSimulationSettings } from './validateSimulationSettings';
import { Xoshiro128StarStar } from './xoshiro128StarStar';

/** Options for a simulation run; each defaults to the plan's `simulation` block. */
export interface SimulationOptions {
  /** Number of replications, integer 2..1,000,000. */
  replications?: number;
  /** Seed, any safe integer. */
  seed?: number;
}

/** A simulation in progress: run replications in any chunks, then summarise. */
export interface SimulationRun {
  readonly total: number;
  readonly seed: number;
  /** Replications finished so far. */
  readonly completed: number;
  /** Run replications from (inclusive) to `to` (exclusive); 0 <= from <= to <= total. */
  runChunk(from: number, to: number): void;
  /** Summaries over all replications. @throws Error if some replications have not run. */
  finish(): SimulationResult;
}

// Slots of the per-replication estimate stores.
const A_MATCHED = 0;
const A_ANCOVA = 1;
const A_GAIN = 2;
const A_CORRECTED = 3;
const A_ANCOVA_MATCHED = 4;
const SLOT: Record<AnalysisId, number> = {
  matchedDifference: A_MATCHED,
  ancova: A_ANCOVA,
  gainScore: A_GAIN,
  correctedAncova: A_CORRECTED,
};

// Per-replication matching records (Float64Array each).
const M_MATCHED = 0;
const M_OBS_BEFORE = 1;
const M_OBS_AFTER = 2;
const M_OBS_SMD_BEFORE = 3;
const M_OBS_SMD_AFTER = 4;
const M_TRUE_BEFORE = 5;
const M_TRUE_AFTER = 6;
const M_TRUE_SMD_BEFORE = 7;
const M_TRUE_SMD_AFTER = 8;
const M_VAR_RATIO = 9;
const M_COUNT = 10;
const AFTER_OK = 1; // after-matching means computable (at least one matched set)
const VAR_RATIO_OK = 2; // after-matching variance ratio computable

/**
 * The Monte Carlo engine's stepping interface: simulate the researcher's
 * actual procedure (finite pools, caliper, ratio, replacement, matching
 * order, discarded members) under the plan's generating model
 * (deriveModelParameters), replication by replication, then summarise.
 *
 * One replication (docs/simulation.md):
 *  1. Draw each pool from the model. For group g the observed pretest is drawn
 *     first, X ~ N(mu_g, sd_Xg^2), then the true score from its conditional
 *     distribution T | X ~ N(mu_g + rho_g (X - mu_g), rho_g (1 - rho_g) sd_Xg^2)
 *     (Kelley 1947), then Y = d_g + beta T + tau [g = P] + e. This is exactly
 *     the joint law of T ~ N(mu_g, sd_Tg^2), X = T + N(0, sem^2), and lets the
 *     pool be generated already sorted on X (sort X, then draw T and Y), so no
 *     index permutation is needed. Programme members are exchangeable, so
 *     generation order is a uniformly random matching order; 'lowest-first'
 *     and 'highest-first' sort the programme pool the same way.
 *  2. Caliper = plan.matching.caliper × sqrt((s_P^2 + s_C^2) / 2) of this
 *     replication's observed pretest (Cochran & Rubin 1973's unit); match with
 *     matchOnPretest (O(n log n)).
 *  3. Estimate tau five ways, each with model SE, 95% CI and a two-sided t
 *     test at plan.analysis.alpha (critical values cached per df):
 *     matched difference (matched sets; SE = sd(D)/sqrt(m), df m - 1),
 *     ANCOVA (full sample, df n - 3), gain score (full sample, pooled-variance
 *     t, df n - 2), Porter's corrected ANCOVA (full sample, rho' =
 *     plan.analysis.assumedReliability), ANCOVA in the matched sample (stacked
 *     rows: a comparison member used by two programme members appears twice).
 *
 * Replication i draws from its own stream xoshiro128**(seed, i), so results
 * are bit-identical however replications are chunked or ordered.
 *
 * @param plan a validated plan.
 * @param options replications and seed (defaults: plan.simulation).
 * @throws Error with a researcher-readable message for out-of-range settings
 *   or contradictory model inputs (from deriveModelParameters).
 * @example
 *   const run = createSimulation(demoPlan(), { replications: 200 });
 *   run.runChunk(0, 100); run.runChunk(100, 200);
 *   run.finish().analyses.matchedDifference.meanEstimate; // ≈ 2.5 + 0.875·0.25·(-10) ≈ 0.31 (closed form: Thorndike 1942)
 */
export function createSimulation(plan: Plan, options: SimulationOptions = {}): SimulationRun {
  const total = options.replications ?? plan.simulation.replications;
  const seed = options.seed ?? plan.simulation.seed;
  validateSimulationSettings(plan, total, seed);
  const model = deriveModelParameters(plan);
  const runner = new ReplicationRunner(plan, model, total, seed);
  const { nP, tau, est, se, flags, rec, recOk } = runner;
  const done = new Uint8Array(total);
  let completed = 0;

  const runChunk = (from: number, to: number): void => {
    if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to > total || from > to) {
      throw new Error(`Replication range ${from}..${to} is outside 0..${total}.`);
    }
    for (let i = from; i < to; i++) {
      runner.run(i);
      if (!done[i]) {
        done[i] = 1;
        completed++;
      }
    }
  };

  const finish = (): SimulationResult => {
    if (completed < total) {
      throw new Error(`Only ${completed} of ${total} replications have run; cannot summarise yet.`);
    }
    const summary = (id: AnalysisId, slot: number, sample: 'full' | 'matched') =>
      summariseAnalysis(id, est[slot] as Float64Array, se[slot] as Float64Array, flags[slot] as Uint8Array, total, tau, sample);
    const analyses = {} as SimulationResult['analyses'];
    const estimates = {} as SimulationResult['estimates'];
    for (const id of ANALYSIS_IDS) {
      const slot = SLOT[id];
      analyses[id] = summary(id, slot, id === 'matchedDifference' ? 'matched' : 'full');
      const list: number[] = [];
      const e = est[slot] as Float64Array;
      const f = flags[slot] as Uint8Array;
      for (let i = 0; i < total; i++) if ((f[i] as number) & FLAG_COMPUTED) list.push(e[i] as number);
      estimates[id] = list;
    }
    return {
      plan: structuredClone(plan),
      seed,
      replications: total,
      tau,
      analyses,
      ancovaMatchedSample: summary('ancova', A_ANCOVA_MATCHED, 'matched'),
      matching: summariseMatching(),
      estimates,
      example: runner.example ?? { pairs: [], discarded: [] },
    };
  };

  const summariseMatching = (): SimMatchingSummary => {
    const all = (r: number): [number, number] => meanAndMCSE(rec[r] as Float64Array, total, recOk, 0);
    const after = (r: number, bit: number): [number, number] => meanAndMCSE(rec[r] as Float64Array, total, recOk, bit);
    const [matchedMean, matchedMCSE] = all(M_MATCHED);
    const [obsAfter, obsAfterMCSE] = after(M_OBS_AFTER, AFTER_OK);
    const [trueAfter, trueAfterMCSE] = after(M_TRUE_AFTER, AFTER_OK);
    return {
      meanMatchedProgramme: matchedMean,
      meanMatchedProgrammeMCSE: matchedMCSE,
      discardedProgrammeShare: 1 - matchedMean / nP,
      discardedProgrammeShareMCSE: matchedMCSE / nP,
      observedDifferenceBefore: all(M_OBS_BEFORE)[0],
      observedDifferenceAfter: obsAfter,
      observedDifferenceAfterMCSE: obsAfterMCSE,
      observedSMDBefore: all(M_OBS_SMD_BEFORE)[0],
      observedSMDAfter: after(M_OBS_SMD_AFTER, AFTER_OK)[0],
      trueDifferenceBefore: all(M_TRUE_BEFORE)[0],
      trueDifferenceAfter: trueAfter,
      trueDifferenceAfterMCSE: trueAfterMCSE,
      trueSMDBefore: all(M_TRUE_SMD_BEFORE)[0],
      trueSMDAfter: after(M_TRUE_SMD_AFTER, AFTER_OK)[0],
      varianceRatioAfter: after(M_VAR_RATIO, VAR_RATIO_OK)[0],
      replicationsWithMatches: countBits(recOk, total, AFTER_OK),
    };
  };

  return {
    total,
    seed,
    get completed() {
      return completed;
    },
    runChunk,
    finish,
  };
}

/** Mean and its MCSE (sd / sqrt(n)) over replications whose ok-bits include `bit` (bit 0: all). 0, 0 when none. */
function meanAndMCSE(values: Float64Array, n: number, ok: Uint8Array, bit: number): [number, number] {
  let c = 0;
  let s = 0;
  for (let i = 0; i < n; i++) {
    if (bit && !((ok[i] as number) & bit)) continue;
    c++;
    s += values[i] as number;
  }
  if (c === 0) return [0, 0];
  const mean = s / c;
  if (c < 2) return [mean, 0];
  let ss = 0;
  for (let i = 0; i < n; i++) {
    if (bit && !((ok[i] as number) & bit)) continue;
    const d = (values[i] as number) - mean;
    ss += d * d;
  }
  return [mean, Math.sqrt(ss / (c - 1) / c)];
}

function countBits(ok: Uint8Array, n: number, bit: number): number {
  let c = 0;
  for (let i = 0; i < n; i++) if ((ok[i] as number) & bit) c++;
  return c;
}

/**
 * One simulation's settings and reusable buffers, and the per-replication
 * work (see createSimulation). A class rather than closures so the hot loops
 * compile once for every simulation created (closures re-created per run
 * lose V8's optimisations after the first), with fields read into locals.
 */
class ReplicationRunner {
  readonly seed: number;
  readonly nP: number;
  readonly nC: number;
  readonly k: number;
  readonly method: Plan['matching']['method'];
  readonly replacement: boolean;
  readonly highestFirst: boolean;
  readonly caliperSD: number;
  readonly rhoAssumed: number;
  readonly tau: number;
  readonly direction: number;
  readonly beta: number;
  readonly resSD: number;
  readonly muP: number;
  readonly muC: number;
  readonly sdXP: number;
  readonly sdXC: number;
  readonly rhoP: number;
  readonly rhoC: number;
  readonly condP: number;
  readonly condC: number;
  readonly yCentreP: number;
  readonly yCentreC: number;
  readonly xp: Float64Array;
  readonly tp: Float64Array;
  readonly yp: Float64Array;
  readonly xc: Float64Array;
  /** True scores and outcomes of the sorted comparison pool: only matched partners' entries are filled. */
  readonly tc: Float64Array;
  readonly yc: Float64Array;
  readonly sorterC: NormalSampleIndex;
  /** Lowest- or highest-first matching order: the programme pool is drawn sorted. */
  readonly sortProgramme: boolean;
  readonly zBuffer: Float64Array;
  readonly rng: Xoshiro128StarStar;
  readonly normal: NormalSampler;
  readonly ws: MatchingWorkspace;
  readonly moments = new Float64Array(12);
  readonly out = new Float64Array(3);
  readonly critAlpha: TCriticalValues;
  readonly crit95: TCriticalValues;
  readonly est: Float64Array[] = [];
  readonly se: Float64Array[] = [];
  readonly flags: Uint8Array[] = [];
  readonly rec: Float64Array[] = [];
  readonly recOk: Uint8Array;
  example: SimulationResult['example'] | null = null;

  constructor(plan: Plan, model: ModelParameters, total: number, seed: number) {
    this.seed = seed;
    const nP = model.n.programme;
    const nC = model.n.comparison;
    this.nP = nP;
    this.nC = nC;
    this.k = plan.matching.ratio;
    this.method = plan.matching.method;
    this.replacement = plan.matching.replacement;
    const order = plan.matching.order ?? 'random';
    const sortProgramme = !this.replacement && order !== 'random';
    this.highestFirst = order === 'highest-first';
    this.caliperSD = plan.matching.caliper;
    this.rhoAssumed = plan.analysis.assumedReliability;
    this.tau = model.effect;
    this.direction = this.tau < 0 ? -1 : 1; // tau = 0: a positive effect is the hoped-for direction
    this.beta = model.beta;
    this.resSD = model.residualSD;
    this.muP = model.mean.programme;
    this.muC = model.mean.comparison;
    this.sdXP = model.observedSD.programme;
    this.sdXC = model.observedSD.comparison;
    this.rhoP = model.reliability.programme;
    this.rhoC = model.reliability.comparison;
    // SD of T given X: sd_T * sem / sd_X (= sqrt(rho (1 - rho)) sd_X).
    this.condP = (model.trueSD.programme * model.sem) / this.sdXP;
    this.condC = (model.trueSD.comparison * model.sem) / this.sdXC;
    this.yCentreP = model.growthGap + this.tau + this.beta * this.muP;
    this.yCentreC = this.beta * this.muC;

    this.xp = new Float64Array(nP);
    this.tp = new Float64Array(nP);
    this.yp = new Float64Array(nP);
    this.xc = new Float64Array(nC);
    this.tc = new Float64Array(nC);
    this.yc = new Float64Array(nC);
    // The comparison pool is drawn sorted on X; this index finds positions in it for the matching.
    this.sorterC = new NormalSampleIndex(nC);
    this.sortProgramme = sortProgramme;
    // A replication's standard normal variates, drawn in one go: 3 per person
    // (observed pretest, true score given it, outcome residual).
    this.zBuffer = new Float64Array(3 * (nP + nC));
    this.rng = new Xoshiro128StarStar();
    this.normal = new NormalSampler(this.rng);
    this.ws = createMatchingWorkspace(nP, nC, this.k);
    this.critAlpha = new TCriticalValues(plan.analysis.alpha);
    this.crit95 = new TCriticalValues(0.05);
    for (let a = 0; a < 5; a++) {
      this.est.push(new Float64Array(total));
      this.se.push(new Float64Array(total));
      this.flags.push(new Uint8Array(total));
    }
    for (let r = 0; r < M_COUNT; r++) this.rec.push(new Float64Array(total));
    this.recOk = new Uint8Array(total);
  }

  private record(a: number, i: number, e: number, s: number, df: number): void {
    let f = FLAG_COMPUTED;
    if (Math.abs(e - this.tau) <= this.crit95.get(df) * s) f |= FLAG_COVERED;
    if (Math.abs(e) > this.critAlpha.get(df) * s) {
      f |= FLAG_REJECTED;
      if (e * this.direction < 0) f |= FLAG_WRONG_SIGN;
    }
    (this.est[a] as Float64Array)[i] = e;
    (this.se[a] as Float64Array)[i] = s;
    (this.flags[a] as Uint8Array)[i] = f;
  }

  /** Replication i, from its own random stream; results stored at index i. */
  run(i: number): void {
    const { nP, nC, k, muP, muC, sdXP, sdXC, rhoP, rhoC, condP, condC, beta, resSD, yCentreP, yCentreC } = this;
    const { xp, tp, yp, xc, tc, yc, moments, out, rng, ws } = this;
    const rec = this.rec;
    this.rng.reseed(this.seed, i);
    this.normal.reset();

    // Draw every standard normal variate this replication needs, in a fixed layout:
    // [comparison X (ascending) | comparison T|X | comparison e | programme X | programme T|X | programme e].
    const z = this.zBuffer;
    drawReplicationVariates(this.normal, z, nC, nP, this.sortProgramme);
    const zTC = nC;
    const zEC = 2 * nC;
    const zXP = 3 * nC;
    const zTP = zXP + nP;
    const zEP = zXP + 2 * nP;

    // Comparison pool, drawn sorted on the observed pretest (indexed for the matching below).
    let cSx = 0, cSxx = 0, cSy = 0, cSyy = 0, cSxy = 0, cSt = 0, cStt = 0;
    for (let j = 0; j < nC; j++) {
      const dx = sdXC * (z[j] as number);
      xc[j] = muC + dx;
      const dt = rhoC * dx + condC * (z[zTC + j] as number);
      const dy = beta * dt + resSD * (z[zEC + j] as number);
      cSx += dx; cSxx += dx * dx; cSy += dy; cSyy += dy * dy; cSxy += dx * dy; cSt += dt; cStt += dt * dt;
    }

    // Programme pool, in matching order.
    for (let j = 0; j < nP; j++) xp[j] = muP + sdXP * (z[zXP + j] as number);
    // Lowest- or highest-first order: the programme X were drawn ascending.
    if (this.sortProgramme && this.highestFirst) xp.reverse();
    let pSx = 0, pSxx = 0, pSy = 0, pSyy = 0, pSxy = 0, pSt = 0, pStt = 0;
    for (let j = 0; j < nP; j++) {
      const dx = (xp[j] as number) - muP;
      const dt = rhoP * dx + condP * (z[zTP + j] as number);
      const dy = beta * dt + resSD * (z[zEP + j] as number);
      tp[j] = muP + dt;
      yp[j] = yCentreP + dy;
      pSx += dx; pSxx += dx * dx; pSy += dy; pSyy += dy * dy; pSxy += dx * dy; pSt += dt; pStt += dt * dt;
    }

    // Full-sample within-group moments.
    const mxP = muP + pSx / nP;
    const mxC = muC + cSx / nC;
    const myP = yCentreP + pSy / nP;
    const myC = yCentreC + cSy / nC;
    const sxxP = pSxx - (pSx * pSx) / nP;
    const sxxC = cSxx - (cSx * cSx) / nC;
    const sxyP = pSxy - (pSx * pSy) / nP;
    const sxyC = cSxy - (cSx * cSy) / nC;
    const syyP = pSyy - (pSy * pSy) / nP;
    const syyC = cSyy - (cSy * cSy) / nC;
    const sttP = pStt - (pSt * pSt) / nP;
    const sttC = cStt - (cSt * cSt) / nC;
    moments[0] = nP; moments[1] = mxP; moments[2] = myP; moments[3] = sxxP; moments[4] = sxyP; moments[5] = syyP;
    moments[6] = nC; moments[7] = mxC; moments[8] = myC; moments[9] = sxxC; moments[10] = sxyC; moments[11] = syyC;

    if (ancovaEstimate(moments, 1, out)) this.record(A_ANCOVA, i, out[0] as number, out[1] as number, out[2] as number);
    if (ancovaEstimate(moments, this.rhoAssumed, out)) {
      this.record(A_CORRECTED, i, out[0] as number, out[1] as number, out[2] as number);
    }
    {
      // Gain score Y - X: pooled-variance two-sample t (Student 1908), df n - 2.
      const dfG = nP + nC - 2;
      const ss = syyP - 2 * sxyP + sxxP + (syyC - 2 * sxyC + sxxC);
      const s = Math.sqrt((ss / dfG) * (1 / nP + 1 / nC));
      const e = myP - mxP - (myC - mxC);
      if (s > 0 && Number.isFinite(s) && Number.isFinite(e)) this.record(A_GAIN, i, e, s, dfG);
    }

    const obsPooledSD = Math.sqrt((sxxP / (nP - 1) + sxxC / (nC - 1)) / 2);
    const truePooledSD = Math.sqrt((sttP / (nP - 1) + sttC / (nC - 1)) / 2);
    const caliper = this.caliperSD * obsPooledSD;
    this.sorterC.indexSorted(xc, muC, sdXC);
    const m = matchOnPretest(xc, xp, caliper, this.method, this.replacement, rng, ws, this.sorterC);

    // Matched sets: D_i = Y_i - mean of its partners' Y; stacked matched sample.
    const partners = ws.partners;
    const counts = ws.partnerCount;
    let dS = 0, dSS = 0;
    let qSx = 0, qSxx = 0, qSy = 0, qSyy = 0, qSxy = 0, qSt = 0; // matched programme (centred at muP)
    let rN = 0, rSx = 0, rSxx = 0, rSy = 0, rSyy = 0, rSxy = 0, rSt = 0; // stacked partner rows (centred at muC)
    for (let j = 0; j < nP; j++) {
      const cnt = counts[j] as number;
      if (cnt === 0) continue;
      const dx = (xp[j] as number) - muP;
      const dy = (yp[j] as number) - yCentreP;
      qSx += dx; qSxx += dx * dx; qSy += dy; qSyy += dy * dy; qSxy += dx * dy; qSt += (tp[j] as number) - muP;
      let ySum = 0;
      const base = j * k;
      for (let q = 0; q < cnt; q++) {
        const c = partners[base + q] as number;
        // The partner's true score and outcome, exactly as the pool loop drew them (only partners are kept).
        const cx = (xc[c] as number) - muC;
        const dt = rhoC * cx + condC * (z[zTC + c] as number);
        const t = muC + dt;
        const y = yCentreC + (beta * dt + resSD * (z[zEC + c] as number));
        tc[c] = t;
        yc[c] = y;
        ySum += y;
        const cy = y - yCentreC;
        rSx += cx; rSxx += cx * cx; rSy += cy; rSyy += cy * cy; rSxy += cx * cy; rSt += t - muC;
      }
      rN += cnt;
      const d = (yp[j] as number) - ySum / cnt;
      dS += d;
      dSS += d * d;
    }
    if (m >= 2) {
      const mean = dS / m;
      const v = (dSS - dS * mean) / (m - 1);
      const s = Math.sqrt(v / m);
      if (s > 0 && Number.isFinite(s)) this.record(A_MATCHED, i, mean, s, m - 1);
      moments[0] = m; moments[1] = muP + qSx / m; moments[2] = yCentreP + qSy / m;
      moments[3] = qSxx - (qSx * qSx) / m; moments[4] = qSxy - (qSx * qSy) / m; moments[5] = qSyy - (qSy * qSy) / m;
      moments[6] = rN; moments[7] = muC + rSx / rN; moments[8] = yCentreC + rSy / rN;
      moments[9] = rSxx - (rSx * rSx) / rN; moments[10] = rSxy - (rSx * rSy) / rN; moments[11] = rSyy - (rSy * rSy) / rN;
      if (ancovaEstimate(moments, 1, out)) {
        this.record(A_ANCOVA_MATCHED, i, out[0] as number, out[1] as number, out[2] as number);
      }
    }

    // Balance before and after matching, observed and true scores.
    (rec[M_MATCHED] as Float64Array)[i] = m;
    const obsBefore = mxP - mxC;
    const trueBefore = pSt / nP - cSt / nC + muP - muC;
    (rec[M_OBS_BEFORE] as Float64Array)[i] = obsBefore;
    (rec[M_TRUE_BEFORE] as Float64Array)[i] = trueBefore;
    (rec[M_OBS_SMD_BEFORE] as Float64Array)[i] = obsBefore / obsPooledSD;
    (rec[M_TRUE_SMD_BEFORE] as Float64Array)[i] = truePooledSD > 0 ? trueBefore / truePooledSD : 0;
    let ok = 0;
    if (m >= 1) {
      ok |= AFTER_OK;
      const obsAfter = qSx / m - rSx / rN + muP - muC;
      const trueAfter = qSt / m - rSt / rN + muP - muC;
      (rec[M_OBS_AFTER] as Float64Array)[i] = obsAfter;
      (rec[M_TRUE_AFTER] as Float64Array)[i] = trueAfter;
      // SMDs after matching use the before-matching pooled SD (Stuart 2010), so the change shows mean shift only.
      (rec[M_OBS_SMD_AFTER] as Float64Array)[i] = obsAfter / obsPooledSD;
      (rec[M_TRUE_SMD_AFTER] as Float64Array)[i] = truePooledSD > 0 ? trueAfter / truePooledSD : 0;
      if (m >= 2 && rN >= 2) {
        const vP = (qSxx - (qSx * qSx) / m) / (m - 1);
        const vC = (rSxx - (rSx * rSx) / rN) / (rN - 1);
        if (vC > 0 && Number.isFinite(vP / vC)) {
          (rec[M_VAR_RATIO] as Float64Array)[i] = vP / vC;
          ok |= VAR_RATIO_OK;
        }
      }
    }
    this.recOk[i] = ok;


    if (i === 0) this.example = this.captureExample();
  }

  private captureExample(): SimulationResult['example'] {
    const { nP, k, xp, tp, yp, xc, tc, yc, ws } = this;
    const pairs: ExamplePair[] = [];
    const discarded: { observed: number; trueScore: number }[] = [];
    for (let j = 0; j < nP; j++) {
      const cnt = ws.partnerCount[j] as number;
      if (cnt === 0) {
        discarded.push({ observed: xp[j] as number, trueScore: tp[j] as number });
        continue;
      }
      const comparison: ExamplePair['comparison'] = [];
      for (let q = 0; q < cnt; q++) {
        const c = ws.partners[j * k + q] as number;
        comparison.push({ observed: xc[c] as number, trueScore: tc[c] as number, outcome: yc[c] as number });
      }
      pairs.push({ programme: { observed: xp[j] as number, trueScore: tp[j] as number, outcome: yp[j] as number }, comparison });
    }
    return { pairs, discarded };
  }
}
