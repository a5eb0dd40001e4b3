import type { Plan } from '../core/plan';
import { MS_COUNT, MS_DS, MS_DSS, MS_M, MS_QSX, MS_QSXX, MS_QSXY, MS_QSY, MS_QSYY, MS_RN, MS_RSX, MS_RSXX, MS_RSXY, MS_RSY, MS_RSYY, recordMatchedSampleAnalyses } from './matchedSampleAnalyses';
import { deriveModelParameters } from '../core/deriveModelParameters';
import type { ModelParameters } from '../core/modelParameters';
import { ancovaEstimate } from './ancovaEstimate';
import { gainScoreEstimate } from './gainScoreEstimate';
import { MatchingWeights } from './matchingWeights';
import { assembleSimulationResult } from './assembleSimulationResult';
import { AnalysisRecords, SLOT_ANCOVA, SLOT_CORRECTED, SLOT_GAIN } from './analysisRecords';
import { exampleReplication } from './exampleReplication';
import { createMatchingWorkspace, matchOnPretest, type MatchingWorkspace } from './matchOnPretest';
import { NormalSampler } from './normalSampler';
import { drawReplicationVariates } from './drawReplicationVariates';
import { NormalSampleIndex } from './normalSampleIndex';
import { resolveSimulationOptions } from './resolveSimulationOptions';
import { steppedSimulationRun } from './steppedSimulationRun';
import { runnerStores } from './replicationBlock';
import {
  MATCHED_SETS_OK as AFTER_OK,
  M_COUNT,
  M_MATCHED,
  M_OBS_AFTER,
  M_OBS_BEFORE,
  M_OBS_SMD_AFTER,
  M_OBS_SMD_BEFORE,
  M_TRUE_AFTER,
  M_TRUE_BEFORE,
  M_TRUE_SMD_AFTER,
  M_TRUE_SMD_BEFORE,
  M_VAR_RATIO,
  summarisePretestMatchingRecords,
  VARIANCE_RATIO_OK as VAR_RATIO_OK,
} from './summariseMatching';
import type { SimMatchingSummary, SimulationOptions, SimulationResult, SimulationRun } from './types';
import { Xoshiro128StarStar } from './xoshiro128StarStar';

export type { SimulationOptions, SimulationRun } from './types';


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
 *     comparison pool's X be drawn as a sorted sample (drawReplicationVariates:
 *     exponential spacings and Φ⁻¹), then T and Y, so nothing is sorted and no
 *     index permutation is needed. Programme members are exchangeable, so
 *     generation order is a uniformly random matching order; 'lowest-first'
 *     and 'highest-first' draw the programme pool sorted the same way.
 *  2. Caliper = plan.matching.caliper × sqrt((s_P^2 + s_C^2) / 2) of this
 *     replication's observed pretest (Cochran & Rubin 1973's unit); match with
 *     matchOnPretest (O(n log n)).
 *  3. Estimate tau five ways, each with model SE, 95% CI and a two-sided t
 *     test at plan.analysis.alpha (critical values cached per df), each SE the
 *     one that holds for the estimator (docs/simulation.md, "Standard errors"):
 *     matched difference (matched sets; matching-weights SE, Abadie & Imbens
 *     2006, df m - 1), ANCOVA (full sample; group-wise delta-method SE,
 *     Welch–Satterthwaite df), gain score (full sample; Welch 1947), Porter's
 *     corrected ANCOVA (full sample, rho' = plan.analysis.assumedReliability;
 *     delta-method SE counting the group means the correction multiplies),
 *     ANCOVA in the matched sample (stacked rows: a comparison member used by
 *     two programme members appears twice; its use count enters the SE).
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
  const { total, seed } = resolveSimulationOptions(plan, options);
  const model = deriveModelParameters(plan);
  const runner = new ReplicationRunner(plan, model, total, seed);
  const { nP, rec, recOk } = runner;
  const matching = (count: number): SimMatchingSummary =>
    summarisePretestMatchingRecords(rec, recOk, count, nP, false);
  return steppedSimulationRun(
    total,
    seed,
    runner,
    (count) => assembleSimulationResult(plan, seed, count, runner.records, matching(count), runner.example),
    runnerStores(runner, [...runner.records.stores(), ...rec.map((array) => ({ array, stride: 1 })), { array: recOk, stride: 1 }]),
  );
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
  /** Matched-set sums of one replication (MS_* layout, recordMatchedSampleAnalyses). */
  readonly sums = new Float64Array(MS_COUNT);
  /** Per-comparison-member use counts and matching weights of this replication's matched sets. */
  readonly weights: MatchingWeights;
  /** The stacked matched comparison rows for the matched-sample ANCOVA (sigma2 set per replication). */
  readonly stacked: { weights: MatchingWeights; columns: Float64Array[]; from: number; sigma2: number };
  /** The pretest and outcome centres the matched-set sums are taken about (fixed per simulation; one object, not one per replication). */
  readonly centres: { px: number; py: number; cx: number; cy: number };
  /** Per-replication estimates, SEs and flags of the five estimators. */
  readonly records: AnalysisRecords;
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

    this.centres = { px: this.muP, py: this.yCentreP, cx: this.muC, cy: this.yCentreC };
    this.xp = new Float64Array(nP);
    this.tp = new Float64Array(nP);
    this.yp = new Float64Array(nP);
    this.xc = new Float64Array(nC);
    this.tc = new Float64Array(nC);
    this.yc = new Float64Array(nC);
    // The comparison pool is drawn sorted on X; this index finds positions in it for the matching.
    // One search per programme member (two for random-within-caliper): the index samples the pool to suit.
    this.sorterC = new NormalSampleIndex(nC, this.method === 'nearest' ? nP : 2 * nP);
    this.sortProgramme = sortProgramme;
    // A replication's standard normal variates, drawn in one go: 3 per person
    // (observed pretest, true score given it, outcome residual).
    this.zBuffer = new Float64Array(3 * (nP + nC));
    this.rng = new Xoshiro128StarStar();
    this.normal = new NormalSampler(this.rng);
    this.ws = createMatchingWorkspace(nP, nC, this.k);
    this.weights = new MatchingWeights(nC);
    this.stacked = { weights: this.weights, columns: [this.xc], from: 0, sigma2: 0 };
    this.records = new AnalysisRecords(total, this.tau, plan.analysis.alpha);
    for (let r = 0; r < M_COUNT; r++) this.rec.push(new Float64Array(total));
    this.recOk = new Uint8Array(total);
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

    if (ancovaEstimate(moments, 1, out)) this.records.record(SLOT_ANCOVA, i, out[0] as number, out[1] as number, out[2] as number);
    if (ancovaEstimate(moments, this.rhoAssumed, out)) {
      this.records.record(SLOT_CORRECTED, i, out[0] as number, out[1] as number, out[2] as number);
    }
    // Gain score Y - X: Welch's unequal-variance t (Welch 1947).
    if (gainScoreEstimate(nP, myP - mxP, syyP - 2 * sxyP + sxxP, nC, myC - mxC, syyC - 2 * sxyC + sxxC, out)) {
      this.records.record(SLOT_GAIN, i, out[0] as number, out[1] as number, out[2] as number);
    }
    // The comparison group's conditional variance of Y given X (full pool): the reuse terms' sigma².
    const sigma2C = sxxC > 0 ? Math.max(0, syyC - (sxyC * sxyC) / sxxC) / (nC - 2) : 0;

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
    let rN = 0, rSx = 0, rSxx = 0, rSy = 0, rSyy = 0, rSxy = 0; // stacked partner rows (centred at muC)
    // Balance after matching weights each matched set once (its partners' mean), like the
    // matched difference does; with 1:1 this equals the stacked rows exactly.
    let wSx = 0, wSxx = 0, wSt = 0;
    const weights = this.weights;
    const replacement = this.replacement;
    weights.reset();
    for (let j = 0; j < nP; j++) {
      const cnt = counts[j] as number;
      if (cnt === 0) continue;
      const dx = (xp[j] as number) - muP;
      const dy = (yp[j] as number) - yCentreP;
      qSx += dx; qSxx += dx * dx; qSy += dy; qSyy += dy * dy; qSxy += dx * dy; qSt += (tp[j] as number) - muP;
      let ySum = 0, setX = 0, setXX = 0, setT = 0;
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
        rSx += cx; rSxx += cx * cx; rSy += cy; rSyy += cy * cy; rSxy += cx * cy;
        setX += cx; setXX += cx * cx; setT += t - muC;
        if (replacement) weights.add(c, cnt);
        else weights.addUse(c); // matching weights only enter the reuse term, 0 without replacement
      }
      rN += cnt;
      wSx += setX / cnt;
      wSxx += setXX / cnt;
      wSt += setT / cnt;
      const d = (yp[j] as number) - ySum / cnt;
      dS += d;
      dSS += d * d;
    }
    const sums = this.sums;
    sums[MS_M] = m; sums[MS_DS] = dS; sums[MS_DSS] = dSS;
    sums[MS_QSX] = qSx; sums[MS_QSXX] = qSxx; sums[MS_QSY] = qSy; sums[MS_QSYY] = qSyy; sums[MS_QSXY] = qSxy;
    sums[MS_RN] = rN; sums[MS_RSX] = rSx; sums[MS_RSXX] = rSxx; sums[MS_RSY] = rSy; sums[MS_RSYY] = rSyy; sums[MS_RSXY] = rSxy;
    const excess = this.replacement && m >= 2 ? weights.reuseExcess() : 0;
    recordMatchedSampleAnalyses(this.records, i, sums, this.centres, sigma2C, excess, moments, out, this.stacked);

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
      const obsAfter = qSx / m - wSx / m + muP - muC;
      const trueAfter = qSt / m - wSt / m + muP - muC;
      (rec[M_OBS_AFTER] as Float64Array)[i] = obsAfter;
      (rec[M_TRUE_AFTER] as Float64Array)[i] = trueAfter;
      // SMDs after matching use the before-matching pooled SD (Stuart 2010), so the change shows mean shift only.
      (rec[M_OBS_SMD_AFTER] as Float64Array)[i] = obsAfter / obsPooledSD;
      (rec[M_TRUE_SMD_AFTER] as Float64Array)[i] = truePooledSD > 0 ? trueAfter / truePooledSD : 0;
      if (m >= 2) {
        // Matching weights: each matched set once, its partners 1/cnt each (total weight m), as in the
        // balance means above and in the several-covariate engine.
        const vP = (qSxx - (qSx * qSx) / m) / (m - 1);
        const vC = (wSxx - (wSx * wSx) / m) / (m - 1);
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
    const { xp, tp, yp, xc, tc, yc, ws } = this;
    return exampleReplication(ws, { observed: xp, trueScore: tp, outcome: yp }, 0, { observed: xc, trueScore: tc, outcome: yc });
  }
}
