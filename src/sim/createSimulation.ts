import { ANALYSIS_IDS, type AnalysisId, type Plan } from '../core/plan';
import { deriveModelParameters } from '../core/deriveModelParameters';
import { ancovaEstimate } from './ancovaEstimate';
import { createMatchingWorkspace, matchOnPretest } from './matchOnPretest';
import { NormalSampler } from './normalSampler';
import { sortNormalSample } from './sortNormalSample';
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

  const nP = model.n.programme;
  const nC = model.n.comparison;
  const k = plan.matching.ratio;
  const method = plan.matching.method;
  const replacement = plan.matching.replacement;
  const order = plan.matching.order ?? 'random';
  const sortProgramme = !replacement && order !== 'random';
  const caliperSD = plan.matching.caliper;
  const rhoAssumed = plan.analysis.assumedReliability;
  const tau = model.effect;
  const direction = tau < 0 ? -1 : 1; // tau = 0: a positive effect is the hoped-for direction
  const beta = model.beta;
  const resSD = model.residualSD;
  const gap = model.growthGap;
  const muP = model.mean.programme;
  const muC = model.mean.comparison;
  const sdXP = model.observedSD.programme;
  const sdXC = model.observedSD.comparison;
  const rhoP = model.reliability.programme;
  const rhoC = model.reliability.comparison;
  // SD of T given X: sd_T * sem / sd_X (= sqrt(rho (1 - rho)) sd_X).
  const condP = (model.trueSD.programme * model.sem) / sdXP;
  const condC = (model.trueSD.comparison * model.sem) / sdXC;
  const yCentreP = gap + tau + beta * muP;
  const yCentreC = beta * muC;

  const xp = new Float64Array(nP);
  const tp = new Float64Array(nP);
  const yp = new Float64Array(nP);
  const xc = new Float64Array(nC);
  const tc = new Float64Array(nC);
  const yc = new Float64Array(nC);
  const nMax = Math.max(nP, nC);
  const sortScratch = new Float64Array(nMax);
  const sortCounts = new Int32Array(nMax + 1);
  const sortBuckets = new Int32Array(nMax);
  // A replication's standard normal variates, drawn in one go: 3 per person
  // (observed pretest, true score given it, outcome residual).
  const zBuffer = new Float64Array(3 * (nP + nC));
  const rng = new Xoshiro128StarStar();
  const normal = new NormalSampler(rng);
  const ws = createMatchingWorkspace(nP, nC, k);
  const moments = new Float64Array(12);
  const out = new Float64Array(3);
  const critAlpha = new TCriticalValues(plan.analysis.alpha);
  const crit95 = new TCriticalValues(0.05);

  const est: Float64Array[] = [];
  const se: Float64Array[] = [];
  const flags: Uint8Array[] = [];
  for (let a = 0; a < 5; a++) {
    est.push(new Float64Array(total));
    se.push(new Float64Array(total));
    flags.push(new Uint8Array(total));
  }
  const rec: Float64Array[] = [];
  for (let r = 0; r < M_COUNT; r++) rec.push(new Float64Array(total));
  const recOk = new Uint8Array(total);
  const done = new Uint8Array(total);
  let completed = 0;
  let example: SimulationResult['example'] | null = null;

  const record = (a: number, i: number, e: number, s: number, df: number): void => {
    let f = FLAG_COMPUTED;
    if (Math.abs(e - tau) <= crit95.get(df) * s) f |= FLAG_COVERED;
    if (Math.abs(e) > critAlpha.get(df) * s) {
      f |= FLAG_REJECTED;
      if (e * direction < 0) f |= FLAG_WRONG_SIGN;
    }
    (est[a] as Float64Array)[i] = e;
    (se[a] as Float64Array)[i] = s;
    (flags[a] as Uint8Array)[i] = f;
  };

  const runOne = (i: number): void => {
    rng.reseed(seed, i);
    normal.reset();

    // Draw every standard normal variate this replication needs, in a fixed layout:
    // [comparison X | comparison T|X | comparison e | programme X | programme T|X | programme e].
    const z = zBuffer;
    normal.fillStandard(z, z.length);
    const zTC = nC;
    const zEC = 2 * nC;
    const zXP = 3 * nC;
    const zTP = zXP + nP;
    const zEP = zXP + 2 * nP;

    // Comparison pool, generated sorted on the observed pretest.
    for (let j = 0; j < nC; j++) xc[j] = muC + sdXC * (z[j] as number);
    sortNormalSample(xc, nC, muC, sdXC, sortScratch, sortCounts, sortBuckets);
    let cSx = 0, cSxx = 0, cSy = 0, cSyy = 0, cSxy = 0, cSt = 0, cStt = 0;
    for (let j = 0; j < nC; j++) {
      const dx = (xc[j] as number) - muC;
      const dt = rhoC * dx + condC * (z[zTC + j] as number);
      const dy = beta * dt + resSD * (z[zEC + j] as number);
      tc[j] = muC + dt;
      yc[j] = yCentreC + dy;
      cSx += dx; cSxx += dx * dx; cSy += dy; cSyy += dy * dy; cSxy += dx * dy; cSt += dt; cStt += dt * dt;
    }

    // Programme pool, in matching order.
    for (let j = 0; j < nP; j++) xp[j] = muP + sdXP * (z[zXP + j] as number);
    if (sortProgramme) {
      sortNormalSample(xp, nP, muP, sdXP, sortScratch, sortCounts, sortBuckets);
      if (order === 'highest-first') xp.reverse();
    }
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

    if (ancovaEstimate(moments, 1, out)) record(A_ANCOVA, i, out[0] as number, out[1] as number, out[2] as number);
    if (ancovaEstimate(moments, rhoAssumed, out)) {
      record(A_CORRECTED, i, out[0] as number, out[1] as number, out[2] as number);
    }
    {
      // Gain score Y - X: pooled-variance two-sample t (Student 1908), df n - 2.
      const dfG = nP + nC - 2;
      const ss = syyP - 2 * sxyP + sxxP + (syyC - 2 * sxyC + sxxC);
      const s = Math.sqrt((ss / dfG) * (1 / nP + 1 / nC));
      const e = myP - mxP - (myC - mxC);
      if (s > 0 && Number.isFinite(s) && Number.isFinite(e)) record(A_GAIN, i, e, s, dfG);
    }

    const obsPooledSD = Math.sqrt((sxxP / (nP - 1) + sxxC / (nC - 1)) / 2);
    const truePooledSD = Math.sqrt((sttP / (nP - 1) + sttC / (nC - 1)) / 2);
    const caliper = caliperSD * obsPooledSD;
    const m = matchOnPretest(xc, xp, caliper, method, replacement, rng, ws);

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
        const y = yc[c] as number;
        ySum += y;
        const cx = (xc[c] as number) - muC;
        const cy = y - yCentreC;
        rSx += cx; rSxx += cx * cx; rSy += cy; rSyy += cy * cy; rSxy += cx * cy; rSt += (tc[c] as number) - muC;
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
      if (s > 0 && Number.isFinite(s)) record(A_MATCHED, i, mean, s, m - 1);
      moments[0] = m; moments[1] = muP + qSx / m; moments[2] = yCentreP + qSy / m;
      moments[3] = qSxx - (qSx * qSx) / m; moments[4] = qSxy - (qSx * qSy) / m; moments[5] = qSyy - (qSy * qSy) / m;
      moments[6] = rN; moments[7] = muC + rSx / rN; moments[8] = yCentreC + rSy / rN;
      moments[9] = rSxx - (rSx * rSx) / rN; moments[10] = rSxy - (rSx * rSy) / rN; moments[11] = rSyy - (rSy * rSy) / rN;
      if (ancovaEstimate(moments, 1, out)) {
        record(A_ANCOVA_MATCHED, i, out[0] as number, out[1] as number, out[2] as number);
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
    recOk[i] = ok;

    if (i === 0) example = captureExample();
  };

  const captureExample = (): SimulationResult['example'] => {
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
  };

  const runChunk = (from: number, to: number): void => {
    if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to > total || from > to) {
      throw new Error(`Replication range ${from}..${to} is outside 0..${total}.`);
    }
    for (let i = from; i < to; i++) {
      runOne(i);
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
      example: example ?? { pairs: [], discarded: [] },
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
