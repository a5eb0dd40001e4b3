import type { AnalysisId, Plan } from '../../core/plan';
import { MS_COUNT, MS_DS, MS_DSS, MS_M, MS_QSX, MS_QSXX, MS_QSXY, MS_QSY, MS_QSYY, MS_RN, MS_RSX, MS_RSXX, MS_RSXY, MS_RSY, MS_RSYY, recordMatchedSampleAnalyses } from '../matchedSampleAnalyses';
import { designAnalysisIds } from '../../core/design/studyDesign';
import { ancovaEstimate } from '../ancovaEstimate';
import {
  AnalysisRecords,
  SLOT_ANCOVA,
  SLOT_CORRECTED,
  SLOT_GAIN,
  SLOT_PRE_POST,
  SLOT_RD,
} from '../analysisRecords';
import { assembleSimulationResult } from '../assembleSimulationResult';
import { exampleReplication } from '../exampleReplication';
import { gainScoreEstimate } from '../gainScoreEstimate';
import { MatchingWeights } from '../matchingWeights';
import type { MatchSettings } from '../multivariate/covariateMatching';
import { NormalSampler } from '../normalSampler';
import { prePostChangeEstimate } from '../prePostChangeEstimate';
import { regressionDiscontinuityEstimate } from '../regressionDiscontinuityEstimate';
import { resolveSimulationOptions } from '../resolveSimulationOptions';
import { steppedSimulationRun } from '../steppedSimulationRun';
import { runnerStores } from '../replicationBlock';
import {
  MATCHED_SETS_OK as AFTER_OK,
  M_COUNT,
  M_MATCHED,
  M_OBS_AFTER,
  M_OBS_BEFORE,
  M_OBS_SMD_AFTER,
  M_OBS_SMD_BEFORE,
  M_PROGRAMME,
  M_TRUE_AFTER,
  M_TRUE_BEFORE,
  M_TRUE_SMD_AFTER,
  M_TRUE_SMD_BEFORE,
  M_VAR_RATIO,
  summarisePretestMatchingRecords,
  VARIANCE_RATIO_OK as VAR_RATIO_OK,
} from '../summariseMatching';
import { isFeasible, type SimAnalysisResult, type SimMatchingSummary, type SimulationOptions, type SimulationResult, type SimulationRun } from '../types';
import { Xoshiro128StarStar } from '../xoshiro128StarStar';
import { clearPoolsMatching, createPoolsMatching, matchPoolsOnPretest, type PoolsMatching } from './matchPoolsOnPretest';
import { createDrawnPools, type DrawnPools, type PoolDrawer } from './poolDrawer';
import { ClusterWork } from './clusterAnalyses';
import { summariseAnalysis } from '../summariseAnalysis';
import { SLOT_MATCHED_NAIVE, SLOT_PERSON_NAIVE } from '../analysisRecords';


// One group's moments in the full sample (offsets within a block of G_COUNT).
const G_N = 0;
const G_MX = 1; // mean observed pretest
const G_MY = 2; // mean outcome
const G_MT = 3; // mean true score
const G_MB = 4; // mean basis
const G_SXX = 5; // sums of squares and products about the group means
const G_SXY = 6;
const G_SYY = 7;
const G_STT = 8;
const G_SBB = 9;
const G_SBY = 10;
const G_MIN_X = 11;
const G_MAX_X = 12;
const G_COUNT = 13;

/**
 * The pools engine: one Monte Carlo engine for every design that a
 * PoolDrawer describes (docs/simulation.md, "The pools engine"). The drawer
 * says how a replication's people are drawn and who is in the programme
 * (selection rules: selectionPoolDrawer; two existing groups:
 * existingGroupsPoolDrawer); this engine runs ONE shared set of analyses on
 * whatever it drew, choosing them by the design's analysis list
 * (designAnalysisIds):
 *  - ANCOVA, Porter's corrected ANCOVA (rho' = plan.analysis.assumedReliability)
 *    and the gain score in the full sample (ancovaEstimate, gainScoreEstimate:
 *    the same SEs as the other engines);
 *  - regression discontinuity: OLS of Y on group and the rule's observed basis
 *    (regressionDiscontinuityEstimate; OLS SE, df N − 3);
 *  - the one-group pre–post change of the programme members (prePostChangeEstimate);
 *  - matching of programme members on the observed pretest (matchPoolsOnPretest:
 *    caliper = plan caliper × sqrt((s_P² + s_C²)/2) of this replication's pretests,
 *    ratio, replacement, order, method as planned), the matched difference with
 *    the matching-weights SE (Abadie & Imbens 2006) and ANCOVA in the stacked
 *    matched sample. When the two groups' observed pretests do not overlap at all
 *    (a sharp cut-off on the pretest) nobody is matched: there is no one with the
 *    same pretest on the other side, and the result says so.
 * Each replication draws from its own stream xoshiro128**(seed, i), so results
 * are bit-identical however the replications are chunked. Buffers are
 * allocated once per simulation; a replication allocates no typed arrays.
 * Summaries: summariseAnalyses / summariseMatching / assembleSimulationResult,
 * the discarded share relative to each replication's own programme size.
 *
 * @param plan a validated plan (its analysis settings, matching block and design).
 * @param options replications (2..1,000,000) and seed (defaults: plan.simulation).
 * @param drawer the design's pool drawer (created for this simulation; it owns its buffers).
 * @returns the stepping interface (SimulationRun).
 * @throws Error with a researcher-readable message for out-of-range settings.
 * @example
 *   const run = createPoolsSimulation(plan, { replications: 200 }, selectionPoolDrawer(plan));
 *   run.runChunk(0, 200); run.finish().analyses.ancova // ANCOVA's summary
 */
export function createPoolsSimulation(plan: Plan, options: SimulationOptions, drawer: PoolDrawer): SimulationRun {
  const { total, seed } = resolveSimulationOptions(plan, options);
  const ids = designAnalysisIds(plan);
  const runner = new PoolsRunner(plan, drawer, ids, total, seed);
  const { rec, recOk } = runner;
  const matching = (count: number): SimMatchingSummary =>
    summarisePretestMatchingRecords(rec, recOk, count, Math.max(1, plan.groups.programme.poolSize), true);
  const stores = runnerStores(runner, [
    ...runner.records.stores(),
    ...rec.map((array) => ({ array, stride: 1 })),
    { array: recOk, stride: 1 },
    { array: runner.noOverlap, stride: 1 },
  ]);
  return steppedSimulationRun(
    total,
    seed,
    runner,
    (count) => {
      const result = assembleSimulationResult(plan, seed, count, runner.records, matching(count), runner.example);
      if (runner.cluster) result.naivePersonLevel = naivePersonLevel(runner, count);
      return explainNoOverlap(result, runner.noOverlap, count);
    },
    stores,
  );
}

/**
 * Clusters: the person-level figures with the naive SEs that ignore the
 * clustering (OLS for the person-level ANCOVA; the one-level matching-weights
 * SE when people are matched across clusters), summarised like the others.
 */
function naivePersonLevel(runner: PoolsRunner, count: number): NonNullable<SimulationResult['naivePersonLevel']> {
  const r = runner.records;
  const at = (id: 'personLevelAncova' | 'matchedDifference', slot: number, sample: 'full' | 'matched') =>
    summariseAnalysis(id, r.est[slot] as Float64Array, r.se[slot] as Float64Array, r.flags[slot] as Uint8Array, count, r.tau, sample);
  const out: NonNullable<SimulationResult['naivePersonLevel']> = { personLevelAncova: at('personLevelAncova', SLOT_PERSON_NAIVE, 'full') };
  if (runner.cluster && !runner.cluster.layout.matchClusters) out.matchedDifference = at('matchedDifference', SLOT_MATCHED_NAIVE, 'matched');
  return out;
}

/**
 * Replace the generic "nobody matched" reason by the real one when the groups'
 * pretests never overlapped (a sharp cut-off on the observed pretest).
 */
function explainNoOverlap(result: SimulationResult, noOverlap: Uint8Array, count: number): SimulationResult {
  let apart = 0;
  for (let i = 0; i < count; i++) apart += noOverlap[i] as number;
  if (apart === 0) return result;
  const why =
    `In ${apart} of ${count} simulated studies every programme member's observed pretest lay on one side of the cut-off and every comparison member's on the other, ` +
    'so nobody in one group has a counterpart with the same pretest in the other: a sharp cut-off on the pretest leaves no overlap to match on. ' +
    'Adjust for the pretest across the cut-off instead (regression discontinuity, or ANCOVA on the pretest), or use a rule with overlap.';
  const explain = (s: SimAnalysisResult): SimAnalysisResult => (isFeasible(s) ? s : { ...s, reason: `${s.reason.split('. ')[0]}. ${why}` });
  const md = result.analyses.matchedDifference;
  if (md) result.analyses.matchedDifference = explain(md);
  result.ancovaMatchedSample = explain(result.ancovaMatchedSample);
  return result;
}

/**
 * One pools simulation's settings, buffers and per-replication work. A class,
 * like the other engines', so the hot loops compile once for every simulation.
 */
class PoolsRunner {
  readonly seed: number;
  readonly drawer: PoolDrawer;
  readonly pools: DrawnPools;
  readonly rng: Xoshiro128StarStar;
  readonly normal: NormalSampler;
  readonly k: number;
  readonly caliperSD: number;
  readonly rhoAssumed: number;
  readonly settings: MatchSettings;
  readonly doAncova: boolean;
  readonly doCorrected: boolean;
  readonly doGain: boolean;
  readonly doRD: boolean;
  readonly doPrePost: boolean;
  readonly doMatch: boolean;
  readonly g = new Float64Array(2 * G_COUNT); // comparison block first, then programme
  readonly moments = new Float64Array(12);
  readonly out = new Float64Array(3);
  /** Matched-set sums of one replication (MS_* layout, recordMatchedSampleAnalyses). */
  readonly sums = new Float64Array(MS_COUNT);
  readonly ws: PoolsMatching;
  readonly weights: MatchingWeights;
  readonly stacked: { weights: MatchingWeights; columns: Float64Array[]; from: number; sigma2: number };
  readonly records: AnalysisRecords;
  readonly rec: Float64Array[] = [];
  readonly recOk: Uint8Array;
  /** 1 where the replication's two groups had no overlap in the observed pretest (nobody could be matched). */
  readonly noOverlap: Uint8Array;
  example: SimulationResult['example'] | null = null;
  /** Clusters only: the cluster means and the person-level work (null for other designs). */
  readonly cluster: ClusterWork | null;

  constructor(plan: Plan, drawer: PoolDrawer, ids: readonly AnalysisId[], total: number, seed: number) {
    this.seed = seed;
    this.drawer = drawer;
    this.pools = createDrawnPools(drawer.capacity);
    this.rng = new Xoshiro128StarStar();
    this.normal = new NormalSampler(this.rng);
    this.k = plan.matching.ratio;
    this.caliperSD = plan.matching.caliper;
    this.rhoAssumed = plan.analysis.assumedReliability;
    this.settings = {
      caliper: 0, // set per replication, in points
      method: plan.matching.method,
      replacement: plan.matching.replacement,
      order: plan.matching.order ?? 'random',
    };
    const has = (id: AnalysisId) => ids.includes(id);
    this.doAncova = has('ancova');
    this.doCorrected = has('correctedAncova');
    this.doGain = has('gainScore');
    this.doRD = has('regressionDiscontinuity') && drawer.observedBasis;
    this.doPrePost = has('prePostChange');
    this.doMatch = has('matchedDifference');
    const capacity = drawer.capacity;
    this.ws = createPoolsMatching(this.doMatch ? capacity : 1, this.k);
    this.weights = new MatchingWeights(this.doMatch ? capacity : 0);
    this.stacked = { weights: this.weights, columns: [this.pools.observed], from: 0, sigma2: 0 };
    this.records = new AnalysisRecords(total, drawer.effect, plan.analysis.alpha, ids);
    for (let r = 0; r < M_COUNT; r++) this.rec.push(new Float64Array(total));
    this.recOk = new Uint8Array(total);
    this.noOverlap = new Uint8Array(total);
    this.cluster = drawer.clusters ? new ClusterWork(drawer.clusters) : null;
    if (this.cluster && this.cluster.layout.matchClusters) this.stacked.columns = [this.cluster.units.observed];
  }

  /** Full-sample moments of rows [from, to) into block `at` of g (two passes: means, then centred sums). */
  private groupMoments(pools: DrawnPools, from: number, to: number, at: number): void {
    const { observed: x, outcome: y, trueScore: t, basis: b } = pools;
    const g = this.g;
    const withBasis = this.doRD;
    const n = to - from;
    let sx = 0, sy = 0, st = 0, sb = 0;
    let lo = Infinity, hi = -Infinity;
    for (let i = from; i < to; i++) {
      const xi = x[i] as number;
      sx += xi;
      sy += y[i] as number;
      st += t[i] as number;
      if (xi < lo) lo = xi;
      if (xi > hi) hi = xi;
    }
    if (withBasis) for (let i = from; i < to; i++) sb += b[i] as number;
    const mx = n > 0 ? sx / n : 0;
    const my = n > 0 ? sy / n : 0;
    const mt = n > 0 ? st / n : 0;
    const mb = n > 0 ? sb / n : 0;
    let sxx = 0, sxy = 0, syy = 0, stt = 0, sbb = 0, sby = 0;
    for (let i = from; i < to; i++) {
      const dx = (x[i] as number) - mx;
      const dy = (y[i] as number) - my;
      const dt = (t[i] as number) - mt;
      sxx += dx * dx;
      sxy += dx * dy;
      syy += dy * dy;
      stt += dt * dt;
    }
    if (withBasis) {
      for (let i = from; i < to; i++) {
        const db = (b[i] as number) - mb;
        const dy = (y[i] as number) - my;
        sbb += db * db;
        sby += db * dy;
      }
    }
    g[at + G_N] = n;
    g[at + G_MX] = mx;
    g[at + G_MY] = my;
    g[at + G_MT] = mt;
    g[at + G_MB] = mb;
    g[at + G_SXX] = sxx;
    g[at + G_SXY] = sxy;
    g[at + G_SYY] = syy;
    g[at + G_STT] = stt;
    g[at + G_SBB] = sbb;
    g[at + G_SBY] = sby;
    g[at + G_MIN_X] = lo;
    g[at + G_MAX_X] = hi;
  }

  /** ancovaEstimate's moment layout from the two groups' blocks, on the pretest (useBasis false) or the basis. */
  private fillMoments(useBasis: boolean): Float64Array {
    const { g, moments } = this;
    const m = useBasis ? G_MB : G_MX;
    const ss = useBasis ? G_SBB : G_SXX;
    const sp = useBasis ? G_SBY : G_SXY;
    // Programme block (at G_COUNT) into moments[0..6), comparison block (at 0) into moments[6..12).
    for (let side = 0; side < 2; side++) {
      const to = side * 6;
      const at = side === 0 ? G_COUNT : 0;
      moments[to] = g[at + G_N] as number;
      moments[to + 1] = g[at + m] as number;
      moments[to + 2] = g[at + G_MY] as number;
      moments[to + 3] = g[at + ss] as number;
      moments[to + 4] = g[at + sp] as number;
      moments[to + 5] = g[at + G_SYY] as number;
    }
    return moments;
  }

  /** Replication i, from its own random stream; results stored at index i. */
  run(i: number): void {
    const { pools, g, out, records } = this;
    this.rng.reseed(this.seed, i);
    this.normal.reset();
    this.drawer.draw(this.normal, this.rng, pools);
    // Clusters: the full-sample analyses run on the cluster means; matching on them or on people.
    const cluster = this.cluster;
    if (cluster) cluster.fillClusters(pools);
    const units = cluster ? cluster.units : pools;
    const nC = units.nComparison;
    const nP = units.nProgramme;
    const N = nC + nP;
    this.groupMoments(units, 0, nC, 0);
    this.groupMoments(units, nC, N, G_COUNT);
    const P = G_COUNT;
    const sxxP = g[P + G_SXX] as number, sxyP = g[P + G_SXY] as number, syyP = g[P + G_SYY] as number;
    const sxxC = g[G_SXX] as number, sxyC = g[G_SXY] as number, syyC = g[G_SYY] as number;
    const mxP = g[P + G_MX] as number, myP = g[P + G_MY] as number;
    const mxC = g[G_MX] as number, myC = g[G_MY] as number;

    // Full-sample analyses: one step per analysis of the design.
    if (this.doAncova && ancovaEstimate(this.fillMoments(false), 1, out)) records.record(SLOT_ANCOVA, i, out[0] as number, out[1] as number, out[2] as number);
    if (this.doCorrected && ancovaEstimate(this.fillMoments(false), this.rhoAssumed, out)) records.record(SLOT_CORRECTED, i, out[0] as number, out[1] as number, out[2] as number);
    // Gain score Y − X: Welch's unequal-variance t (Welch 1947).
    if (this.doGain && gainScoreEstimate(nP, myP - mxP, syyP - 2 * sxyP + sxxP, nC, myC - mxC, syyC - 2 * sxyC + sxxC, out)) records.record(SLOT_GAIN, i, out[0] as number, out[1] as number, out[2] as number);
    if (this.doRD && regressionDiscontinuityEstimate(this.fillMoments(true), out)) records.record(SLOT_RD, i, out[0] as number, out[1] as number, out[2] as number);
    if (this.doPrePost && prePostChangeEstimate(nP, myP - mxP, syyP - 2 * sxyP + sxxP, out)) records.record(SLOT_PRE_POST, i, out[0] as number, out[1] as number, out[2] as number);
    if (cluster) {
      cluster.personLevel(i, records);
      if (!cluster.layout.matchClusters) this.matchPeopleAcrossClusters(i, cluster);
      else this.matchAndBalance(i, units);
      return;
    }
    this.matchAndBalance(i, pools);
  }

  /** People matched across clusters: balance and matching on the people, then the cluster-robust SE. */
  private matchPeopleAcrossClusters(i: number, cluster: ClusterWork): void {
    const pools = this.pools;
    this.groupMoments(pools, 0, pools.nComparison, 0);
    this.groupMoments(pools, pools.nComparison, pools.nComparison + pools.nProgramme, G_COUNT);
    // Pooled within-group slope of Y on X over all people: the cluster-robust SE uses Y − bX.
    const g = this.g;
    const sxx = (g[G_SXX] as number) + (g[G_COUNT + G_SXX] as number);
    const slope = sxx > 0 ? ((g[G_SXY] as number) + (g[G_COUNT + G_SXY] as number)) / sxx : 0;
    this.matchAndBalance(i, pools);
    if (this.doMatch) cluster.peopleMatched(i, this.records, this.ws, pools, slope);
  }

  /** Balance before matching, matching on the observed pretest and the matched-sample analyses, on `pools` (people, or cluster means). */
  private matchAndBalance(i: number, pools: DrawnPools): void {
    const g = this.g;
    const nC = pools.nComparison;
    const nP = pools.nProgramme;
    const P = G_COUNT;
    const sxxP = g[P + G_SXX] as number;
    const sxxC = g[G_SXX] as number, sxyC = g[G_SXY] as number, syyC = g[G_SYY] as number;
    const mxP = g[P + G_MX] as number;
    const mxC = g[G_MX] as number;

    // Balance before matching.
    const rec = this.rec;
    const vP = nP > 1 ? sxxP / (nP - 1) : 0;
    const vC = nC > 1 ? sxxC / (nC - 1) : 0;
    const obsPooledSD = Math.sqrt((vP + vC) / 2);
    const sttP = g[P + G_STT] as number, sttC = g[G_STT] as number;
    const truePooledSD = Math.sqrt(((nP > 1 ? sttP / (nP - 1) : 0) + (nC > 1 ? sttC / (nC - 1) : 0)) / 2);
    const obsBefore = mxP - mxC;
    const trueBefore = (g[P + G_MT] as number) - (g[G_MT] as number);
    (rec[M_PROGRAMME] as Float64Array)[i] = nP;
    (rec[M_OBS_BEFORE] as Float64Array)[i] = obsBefore;
    (rec[M_TRUE_BEFORE] as Float64Array)[i] = trueBefore;
    (rec[M_OBS_SMD_BEFORE] as Float64Array)[i] = obsPooledSD > 0 ? obsBefore / obsPooledSD : 0;
    (rec[M_TRUE_SMD_BEFORE] as Float64Array)[i] = truePooledSD > 0 ? trueBefore / truePooledSD : 0;

    let m = 0;
    let ok = 0;
    if (this.doMatch && nP >= 1 && nC >= 1) {
      // No overlap at all in the observed pretest: nobody has a counterpart, so nobody is matched.
      const apart = (g[P + G_MAX_X] as number) < (g[G_MIN_X] as number) || (g[G_MAX_X] as number) < (g[P + G_MIN_X] as number);
      if (apart) {
        this.noOverlap[i] = 1;
        clearPoolsMatching(this.ws, nC, nP);
      } else {
        this.noOverlap[i] = 0;
        // Caliper in pooled SDs of this replication's observed pretest (Cochran & Rubin 1973).
        this.settings.caliper = this.caliperSD * obsPooledSD;
        m = matchPoolsOnPretest(pools.observed, nC, nP, this.settings, this.rng, this.ws, this.drawer.sortedByPretest && pools === this.pools);
      }
      // The comparison group's conditional variance of Y given X (full pool): the reuse terms' sigma².
      const sigma2C = sxxC > 0 && nC > 2 ? Math.max(0, syyC - (sxyC * sxyC) / sxxC) / (nC - 2) : 0;
      ok = this.matchedSample(pools, i, m, nC, nP, sigma2C, obsPooledSD, truePooledSD);
      if (i === 0) this.example = exampleReplication(this.ws, pools, nC, pools);
    } else if (this.doMatch) {
      clearPoolsMatching(this.ws, nC, nP);
      if (i === 0) this.example = exampleReplication(this.ws, pools, nC, pools);
    }
    (rec[M_MATCHED] as Float64Array)[i] = m;
    this.recOk[i] = ok;
  }

  /**
   * The matched difference, ANCOVA in the stacked matched sample and the balance after matching
   * (the one-pretest engine's formulas, rows by pool position). Returns the replication's balance flags.
   */
  private matchedSample(pools: DrawnPools, i: number, m: number, nC: number, nP: number, sigma2C: number, obsPooledSD: number, truePooledSD: number): number {
    const { ws, weights, moments, out, g, rec, k } = this;
    const { observed: x, trueScore: t, outcome: y } = pools;
    const P = G_COUNT;
    const cx0 = g[G_MX] as number, cy0 = g[G_MY] as number, ct0 = g[G_MT] as number;
    const px0 = g[P + G_MX] as number, py0 = g[P + G_MY] as number, pt0 = g[P + G_MT] as number;
    const partners = ws.partners;
    const counts = ws.partnerCount;
    let dS = 0, dSS = 0;
    let qSx = 0, qSxx = 0, qSy = 0, qSyy = 0, qSxy = 0, qSt = 0; // matched programme, centred at its full-sample means
    let rN = 0, rSx = 0, rSxx = 0, rSy = 0, rSyy = 0, rSxy = 0; // stacked partner rows, centred at the comparison means
    let wSx = 0, wSxx = 0, wSt = 0; // matching weights: each set once
    weights.reset();
    for (let j = 0; j < nP; j++) {
      const cnt = counts[j] as number;
      if (cnt === 0) continue;
      const row = nC + j;
      const dx = (x[row] as number) - px0;
      const dy = (y[row] as number) - py0;
      qSx += dx; qSxx += dx * dx; qSy += dy; qSyy += dy * dy; qSxy += dx * dy; qSt += (t[row] as number) - pt0;
      let ySum = 0, setX = 0, setXX = 0, setT = 0;
      const base = j * k;
      for (let q = 0; q < cnt; q++) {
        const c = partners[base + q] as number;
        const cx = (x[c] as number) - cx0;
        const cy = (y[c] as number) - cy0;
        ySum += y[c] as number;
        rSx += cx; rSxx += cx * cx; rSy += cy; rSyy += cy * cy; rSxy += cx * cy;
        setX += cx; setXX += cx * cx; setT += (t[c] as number) - ct0;
        weights.add(c, cnt);
      }
      rN += cnt;
      wSx += setX / cnt;
      wSxx += setXX / cnt;
      wSt += setT / cnt;
      const d = (y[row] as number) - ySum / cnt;
      dS += d;
      dSS += d * d;
    }
    const sums = this.sums;
    sums[MS_M] = m; sums[MS_DS] = dS; sums[MS_DSS] = dSS;
    sums[MS_QSX] = qSx; sums[MS_QSXX] = qSxx; sums[MS_QSY] = qSy; sums[MS_QSYY] = qSyy; sums[MS_QSXY] = qSxy;
    sums[MS_RN] = rN; sums[MS_RSX] = rSx; sums[MS_RSXX] = rSxx; sums[MS_RSY] = rSy; sums[MS_RSYY] = rSyy; sums[MS_RSXY] = rSxy;
    const excess = this.settings.replacement && m >= 2 ? weights.reuseExcess() : 0;
    recordMatchedSampleAnalyses(this.records, i, sums, { px: px0, py: py0, cx: cx0, cy: cy0 }, sigma2C, excess, moments, out, this.stacked);
    let ok = 0;
    if (m >= 1) {
      ok |= AFTER_OK;
      const obsAfter = qSx / m - wSx / m + px0 - cx0;
      const trueAfter = qSt / m - wSt / m + pt0 - ct0;
      (rec[M_OBS_AFTER] as Float64Array)[i] = obsAfter;
      (rec[M_TRUE_AFTER] as Float64Array)[i] = trueAfter;
      // SMDs after matching use the before-matching pooled SD (Stuart 2010).
      (rec[M_OBS_SMD_AFTER] as Float64Array)[i] = obsPooledSD > 0 ? obsAfter / obsPooledSD : 0;
      (rec[M_TRUE_SMD_AFTER] as Float64Array)[i] = truePooledSD > 0 ? trueAfter / truePooledSD : 0;
      if (m >= 2) {
        const vP = (qSxx - (qSx * qSx) / m) / (m - 1);
        const vC = (wSxx - (wSx * wSx) / m) / (m - 1);
        if (vC > 0 && Number.isFinite(vP / vC)) {
          (rec[M_VAR_RATIO] as Float64Array)[i] = vP / vC;
          ok |= VAR_RATIO_OK;
        }
      }
    }
    return ok;
  }
}
