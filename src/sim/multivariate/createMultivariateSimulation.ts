import { inverse, Matrix } from 'ml-matrix';
import type { MatchingDistance, Plan } from '../../core/plan';
import { assumedTrueScoreCovariance } from '../../core/multivariate/covariateCorrectedAncovaEstimate';
import { deriveCovariateModel, matchingDistance, type CovariateModel } from '../../core/multivariate/covariateModel';
import { AnalysisRecords, SLOT_ANCOVA, SLOT_ANCOVA_MATCHED, SLOT_CORRECTED, SLOT_GAIN, SLOT_MATCHED } from '../analysisRecords';
import { assembleSimulationResult } from '../assembleSimulationResult';
import { exampleReplication } from '../exampleReplication';
import { meanAndMCSE, type ReplicationSelection } from '../meanAndMCSE';
import { NormalSampler } from '../normalSampler';
import { resolveSimulationOptions } from '../resolveSimulationOptions';
import { steppedSimulationRun } from '../steppedSimulationRun';
import { runnerStores } from '../replicationBlock';
import { MATCHED_SETS_OK as AFTER_OK, summariseMatching, VARIANCE_RATIO_OK as VAR_RATIO_OK } from '../summariseMatching';
import type { CovariateBalance, SimMatchingSummary, SimulationOptions, SimulationResult, SimulationRun } from '../types';
import { Xoshiro128StarStar } from '../xoshiro128StarStar';
import { gainScoreEstimate } from '../gainScoreEstimate';
import { matchedDifferenceEstimate } from '../matchedDifferenceEstimate';
import { MatchingWeights } from '../matchingWeights';
import { ancovaOnCovariates, createGroupMoments, groupMoments, residualVariance, type GroupMoments, type StackedComparison } from './ancovaOnCovariates';
import type { CovariateMatching, MatchSettings } from './covariateMatching';
import { createCovariatePools, drawCovariatePools, type CovariatePools } from './drawCovariatePools';
import { countedRows, pairedSubsetSums, subsetSums } from './balanceSums';
import { exactStrata } from './exactStrata';
import { createDiscriminantWorkspace, discriminantStart, type DiscriminantWorkspace } from './discriminantStart';
import { createLogisticWorkspace, fitLogisticRegression, type LogisticWorkspace } from './fitLogisticRegression';
import { createMahalanobisMatchingWorkspace, matchOnMahalanobis, type MahalanobisMatchingWorkspace } from './matchOnMahalanobis';
import { createScoreMatchingWorkspace, matchOnScore, type ScoreMatchingWorkspace } from './matchOnScore';
import { whitenedCoordinates } from './whitenedCoordinates';

// Per-replication balance records, per variable (index v * B_COUNT + metric).
const B_OBS_BEFORE = 0; // observed mean difference, raw
const B_OBS_AFTER = 1;
const B_TRUE_BEFORE = 2;
const B_TRUE_AFTER = 3;
const B_OBS_SD = 4; // pooled SD of the observed variable in the full pools
const B_TRUE_SD = 5;
const B_VAR_RATIO = 6;
const B_COUNT = 7;

/**
 * The several-covariate Monte Carlo engine's stepping interface
 * (docs/simulation.md, "Several covariates"): the same
 * SimulationRun as createSimulation, for plans with covariates or a
 * propensity / Mahalanobis matching distance. The generating model is the
 * core's deriveCovariateModel, so simulation and closed forms describe the
 * same world.
 *
 * One replication, from its own stream xoshiro128**(seed, i) (so results are
 * bit-identical however replications are chunked):
 *  1. Draw both pools (drawCovariatePools): true scores of the pretest and
 *     every covariate, measured or not, observed values with each one's SEM,
 *     the outcome from the true scores. Exactly matched covariates are whole-number categories.
 *  2. Analyses in the full pools on all measured covariates m: ANCOVA (normal
 *     equations), the multivariate reliability-corrected ANCOVA (covariates
 *     replaced by X̄_g + Λ (X − X̄_g), Λ = Σ_T'[m, m] Σ_X[m, m]^-1 with the
 *     core's assumed true-score covariance: the plan's assumed reliability for
 *     the pretest, each covariate's own reliability), and the gain score on the pretest.
 *  3. Match within strata of the exactly matched covariates on the plan's distance:
 *     'pretest' — the observed pretest, caliper in pooled pretest SDs;
 *     'propensity' — the logit of a logistic regression of group on all measured
 *       covariates, fitted in this replication (fitLogisticRegression), caliper in
 *       pooled SDs of the logit (Austin 2011);
 *     'mahalanobis' — the Mahalanobis distance on the measured covariates not matched
 *       exactly, with this replication's pooled within-group covariance matrix of
 *       those covariates, caliper in distance units.
 *     Unmeasured covariates are never used.
 *  4. Matched difference (matching-weights SE, Abadie & Imbens 2006), ANCOVA on
 *     all measured covariates in the stacked matched sample (use counts in the
 *     SE), balance of every variable (observed and true) before and after, the
 *     variance ratio by matching weights as in the one-pretest engine.
 *  SEs and df as in docs/simulation.md, "Standard errors" (the same functions
 *  as the one-pretest engine).
 *
 * @param plan a validated plan (covariates optional).
 * @param options replications (2..1,000,000) and seed (defaults: plan.simulation).
 * @returns a SimulationRun whose result carries `balance` (pretest first).
 * @throws Error with a researcher-readable message for out-of-range settings,
 *   impossible covariate inputs (from deriveCovariateModel), an unknown distance,
 *   or (while running) a propensity score that cannot be fitted in some replication.
 * @example
 *   const run = createMultivariateSimulation({ ...demoPlan(), matching: { ...demoPlan().matching, distance: 'propensity' } });
 *   run.runChunk(0, run.total); run.finish().balance?.[0]?.name // 'Pretest'
 */
export function createMultivariateSimulation(plan: Plan, options: SimulationOptions = {}): SimulationRun {
  const { total, seed } = resolveSimulationOptions(plan, options);
  const distance = matchingDistance(plan);
  if (distance !== 'pretest' && distance !== 'propensity' && distance !== 'mahalanobis') {
    throw new Error(`The matching distance must be "pretest", "propensity" or "mahalanobis"; got ${String(distance)}.`);
  }
  const model = deriveCovariateModel(plan);
  const runner = new MultivariateRunner(plan, model, distance, total, seed);
  const stores = runnerStores(runner, [
    ...runner.records.stores(),
    { array: runner.matchedCount, stride: 1 },
    ...runner.bal.map((array) => ({ array, stride: 1 })),
    { array: runner.balOk, stride: runner.variables },
  ]);
  return steppedSimulationRun(
    total,
    seed,
    runner,
    (count) => assembleSimulationResult(plan, seed, count, runner.records, runner.matchingSummary(count), runner.example, runner.balanceSummary(count)),
    stores,
  );
}

/** Mean and variance (divisor n − 1; 0 when n < 2) from shifted sums. */
function meanOf(n: number, s: number, shift: number): number {
  return n > 0 ? shift + s / n : 0;
}
function varianceOf(n: number, s: number, ss: number): number {
  return n > 1 ? Math.max(0, ss - (s * s) / n) / (n - 1) : 0;
}

/**
 * One several-covariate simulation's settings, buffers and per-replication
 * work. A class, like the one-covariate engine's, so the hot loops compile
 * once for every simulation created.
 */
class MultivariateRunner {
  readonly seed: number;
  readonly total: number;
  readonly nP: number;
  readonly nC: number;
  readonly k: number;
  readonly distance: MatchingDistance;
  readonly settings: MatchSettings;
  /** The settings with this replication's caliper in score units (matchOnScore), reused. */
  readonly scoreSettings: MatchSettings;
  readonly caliperUnits: number;
  readonly names: string[];
  readonly measuredNames: string[];
  readonly measuredFlags: boolean[];
  readonly exactFlags: boolean[];
  readonly variables: number;
  readonly pools: CovariatePools;
  readonly rng: Xoshiro128StarStar;
  readonly normal: NormalSampler;
  /** Observed measured covariates (pretest first), views of the pools' columns. */
  readonly measuredObserved: Float64Array[];
  /** Observed exactly matched covariates. */
  readonly exactObserved: Float64Array[];
  /** Indices within the measured list of those not matched exactly (the Mahalanobis distance's covariates). */
  readonly notExact: number[];
  readonly strata: Int32Array | null;
  readonly correction: Float64Array;
  readonly P: GroupMoments;
  readonly C: GroupMoments;
  readonly MP: GroupMoments;
  readonly MC: GroupMoments;
  readonly out = new Float64Array(3);
  readonly sums = new Float64Array(6);
  /** Balance sums of the true values, and the programme group's of both series (recordBalance). */
  readonly sumsTrue = new Float64Array(6);
  readonly programmeSums = new Float64Array(6);
  readonly programmeSumsTrue = new Float64Array(6);
  /** The matched programme rows and the used comparison rows, with their weights (countedRows), per replication. */
  readonly rowsP: Int32Array;
  readonly weightsP: Float64Array;
  readonly rowsC: Int32Array;
  readonly weightsC: Float64Array;
  readonly programmeGroup: Uint8Array;
  readonly logit: Float64Array;
  readonly logistic: LogisticWorkspace | null;
  readonly coords: Float64Array[];
  readonly scoreWs: ScoreMatchingWorkspace | null;
  readonly mahalanobisWs: MahalanobisMatchingWorkspace | null;
  readonly matchedFlag: Uint8Array;
  /** Each matched set's difference D_j, in programme order (run). */
  readonly setDiff: Float64Array;
  /**
   * Per comparison member: uses n_j (stacked rows), matching weight K_j (Σ over the sets using it
   * of 1 / (partners in that set)) and K'_j, reset through a touched list each replication.
   */
  readonly weights: MatchingWeights;
  /** The stacked matched comparison rows for the matched-sample ANCOVA (sigma2 set per replication). */
  readonly stacked: { weights: MatchingWeights; columns: readonly Float64Array[]; from: number; sigma2: number };
  readonly pooledSxx: Float64Array;
  /** discriminantStart's buffers. */
  readonly startWork: DiscriminantWorkspace;
  /** Per-replication estimates, SEs and flags of the five estimators. */
  readonly records: AnalysisRecords;
  readonly matchedCount: Float64Array;
  /** Balance records: bal[v * B_COUNT + metric][i]. */
  readonly bal: Float64Array[] = [];
  readonly balOk: Uint8Array;
  example: SimulationResult['example'] | null = null;

  constructor(plan: Plan, model: CovariateModel, distance: MatchingDistance, total: number, seed: number) {
    this.seed = seed;
    this.total = total;
    this.nP = model.n.programme;
    this.nC = model.n.comparison;
    const N = this.nP + this.nC;
    this.k = plan.matching.ratio;
    this.distance = distance;
    this.caliperUnits = plan.matching.caliper;
    this.scoreSettings = {
      caliper: 0,
      method: plan.matching.method,
      replacement: plan.matching.replacement,
      order: plan.matching.order ?? 'random',
    };
    this.settings = {
      caliper: plan.matching.caliper,
      method: plan.matching.method,
      replacement: plan.matching.replacement,
      order: plan.matching.order ?? 'random',
    };
    this.names = [...model.names];
    this.measuredFlags = [...model.measured];
    this.exactFlags = [...model.exact];
    this.variables = model.names.length;
    this.pools = createCovariatePools(model);
    this.rng = new Xoshiro128StarStar();
    this.normal = new NormalSampler(this.rng);
    const m = model.measuredIndices;
    this.measuredNames = m.map((j) => model.names[j] as string);
    this.measuredObserved = m.map((j) => this.pools.observed[j] as Float64Array);
    this.exactObserved = model.exactIndices.map((j) => this.pools.observed[j] as Float64Array);
    this.notExact = m.map((j, t) => (model.exact[j] ? -1 : t)).filter((t) => t >= 0);
    this.strata = this.exactObserved.length > 0 ? new Int32Array(N) : null;

    // Λ = Σ_T'[m, m] Σ_X[m, m]^-1 (pooled), the corrected ANCOVA's replacement matrix.
    const assumed = assumedTrueScoreCovariance(model, plan.analysis.assumedReliability);
    const sub = (s: number[][]) => new Matrix(m.map((a) => m.map((b) => s[a]?.[b] as number)));
    const lambda = sub(assumed).mmul(inverse(sub(model.sigmaX.pooled)));
    const p = m.length;
    this.correction = new Float64Array(p * p);
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) this.correction[a * p + b] = lambda.get(a, b);

    this.P = createGroupMoments(p);
    this.C = createGroupMoments(p);
    this.MP = createGroupMoments(p);
    this.MC = createGroupMoments(p);
    this.pooledSxx = new Float64Array(p * p);
    this.startWork = createDiscriminantWorkspace(p);
    this.programmeGroup = new Uint8Array(N).fill(1, this.nC);
    this.logit = distance === 'propensity' ? new Float64Array(N) : new Float64Array(0);
    this.logistic = distance === 'propensity' ? createLogisticWorkspace(N, p) : null;
    this.coords = distance === 'mahalanobis' ? this.notExact.map(() => new Float64Array(N)) : [];
    this.scoreWs = distance === 'mahalanobis' ? null : createScoreMatchingWorkspace(this.nP, this.nC, this.k);
    this.mahalanobisWs = distance === 'mahalanobis' ? createMahalanobisMatchingWorkspace(this.nP, this.nC, this.k) : null;
    this.matchedFlag = new Uint8Array(this.nP);
    this.setDiff = new Float64Array(this.nP);
    this.rowsP = new Int32Array(this.nP);
    this.weightsP = new Float64Array(this.nP);
    this.rowsC = new Int32Array(this.nC);
    this.weightsC = new Float64Array(this.nC);
    this.weights = new MatchingWeights(this.nC);
    this.stacked = { weights: this.weights, columns: this.measuredObserved, from: 0, sigma2: 0 };
    this.records = new AnalysisRecords(total, model.effect, plan.analysis.alpha);
    this.matchedCount = new Float64Array(total);
    for (let r = 0; r < this.variables * B_COUNT; r++) this.bal.push(new Float64Array(total));
    this.balOk = new Uint8Array(total * this.variables);
  }

  /** Replication i, from its own random stream; results stored at index i. */
  run(i: number): void {
    const { nP, nC, k, pools, P, C, MP, MC, out } = this;
    const N = nP + nC;
    const y = pools.outcome;
    this.rng.reseed(this.seed, i);
    this.normal.reset();
    drawCovariatePools(pools, this.normal);

    // Full-sample analyses on all measured covariates.
    const cols = this.measuredObserved;
    groupMoments(cols, y, 0, nC, null, C);
    groupMoments(cols, y, nC, N, null, P);
    if (ancovaOnCovariates(P, C, null, out)) this.records.record(SLOT_ANCOVA, i, out[0] as number, out[1] as number, out[2] as number);
    if (ancovaOnCovariates(P, C, this.correction, out)) this.records.record(SLOT_CORRECTED, i, out[0] as number, out[1] as number, out[2] as number);
    // Gain score Y − pretest: Welch's unequal-variance t (Welch 1947). The pretest is measured variable 0.
    const ssP = P.syy - 2 * (P.sxy[0] as number) + (P.sxx[0] as number);
    const ssC = C.syy - 2 * (C.sxy[0] as number) + (C.sxx[0] as number);
    if (gainScoreEstimate(nP, P.meanY - (P.means[0] as number), ssP, nC, C.meanY - (C.means[0] as number), ssC, out)) {
      this.records.record(SLOT_GAIN, i, out[0] as number, out[1] as number, out[2] as number);
    }

    // Match.
    const strata = this.strata;
    const strataCount = strata ? exactStrata(this.exactObserved, N, strata) : 1;
    let matching: CovariateMatching;
    let m: number;
    const settings = this.settings;
    if (this.distance === 'mahalanobis') {
      const p = P.p;
      for (let a = 0; a < p * p; a++) this.pooledSxx[a] = (P.sxx[a] as number) + (C.sxx[a] as number);
      if (!whitenedCoordinates(cols, this.notExact, this.pooledSxx, N - 2, N, this.coords)) {
        throw new Error(
          `The Mahalanobis distance cannot be computed (simulated replication ${i + 1}): the measured covariates (${this.measuredNames.join(', ')}) ` +
            'are collinear in these data, so their covariance matrix has no inverse. Leave one of them out.',
        );
      }
      const ws = this.mahalanobisWs as MahalanobisMatchingWorkspace;
      m = matchOnMahalanobis(this.coords, strata, strataCount, pools.observed[0] as Float64Array, settings, this.rng, ws);
      matching = ws;
    } else {
      let score: Float64Array;
      let vP: number;
      let vC: number;
      if (this.distance === 'propensity') {
        fitLogisticRegression(cols, this.programmeGroup, N, {
          names: this.measuredNames,
          linearPredictor: this.logit,
          where: `simulated replication ${i + 1}`,
          start: this.discriminantStart(),
          workspace: this.logistic as LogisticWorkspace,
          finalDeviance: false,
        });
        score = this.logit;
        const sums = this.sums;
        subsetSums(score, nC, N, this.rowsP, this.weightsP, 0, 0, sums);
        vP = varianceOf(sums[0] as number, sums[1] as number, sums[2] as number);
        subsetSums(score, 0, nC, this.rowsC, this.weightsC, 0, 0, sums);
        vC = varianceOf(sums[0] as number, sums[1] as number, sums[2] as number);
      } else {
        score = pools.observed[0] as Float64Array;
        vP = (P.sxx[0] as number) / (nP - 1);
        vC = (C.sxx[0] as number) / (nC - 1);
      }
      // Caliper in pooled SDs of the score, sqrt((s_P² + s_C²) / 2) (Cochran & Rubin 1973; Austin 2011 for the logit).
      const scoreSettings = this.scoreSettings;
      scoreSettings.caliper = this.caliperUnits * Math.sqrt((vP + vC) / 2);
      const ws = this.scoreWs as ScoreMatchingWorkspace;
      m = matchOnScore(score, strata, strataCount, scoreSettings, this.rng, ws);
      matching = ws;
    }

    // Matched sets: D_j = Y_j − mean of its partners' Y; stacked partner rows weighted by use.
    const { partners, partnerCount } = matching;
    const matchedFlag = this.matchedFlag;
    const weights = this.weights;
    weights.reset();
    const setDiff = this.setDiff;
    let sets = 0;
    for (let j = 0; j < nP; j++) {
      const cnt = partnerCount[j] as number;
      matchedFlag[j] = cnt > 0 ? 1 : 0;
      if (cnt === 0) continue;
      let ySum = 0;
      for (let q = 0; q < cnt; q++) {
        const c = partners[j * k + q] as number;
        weights.add(c, cnt);
        ySum += y[c] as number;
      }
      setDiff[sets++] = (y[nC + j] as number) - ySum / cnt;
    }
    // The sums over the matched sets in order (a loop of their own, free of calls).
    let dS = 0;
    let dSS = 0;
    for (let t = 0; t < sets; t++) {
      const d = setDiff[t] as number;
      dS += d;
      dSS += d * d;
    }
    if (m >= 2) {
      // σ²_C: the comparison pool's residual variance of Y on all measured covariates (the model is
      // linear-normal, so Var(Y | X) is constant); 0 when it cannot be computed (then no reuse term).
      const s2 = residualVariance(C);
      const sigma2C = Number.isFinite(s2) ? s2 : 0;
      // Matching-weights SE (Abadie & Imbens 2006): the reuse term is 0 without replacement.
      const excess = settings.replacement ? weights.reuseExcess() : 0;
      if (matchedDifferenceEstimate(m, dS, dSS, sigma2C, excess, out)) {
        this.records.record(SLOT_MATCHED, i, out[0] as number, out[1] as number, out[2] as number);
      }
      groupMoments(cols, y, nC, N, matchedFlag, MP);
      groupMoments(cols, y, 0, nC, weights.uses, MC);
      this.stacked.sigma2 = sigma2C;
      if (ancovaOnCovariates(MP, MC, null, out, this.stacked as StackedComparison)) this.records.record(SLOT_ANCOVA_MATCHED, i, out[0] as number, out[1] as number, out[2] as number);
    }
    this.matchedCount[i] = m;
    this.recordBalance(i, m);
    if (i === 0) this.example = this.captureExample(matching);
  }

  /** The logistic regression's start: the linear discriminant of this replication's moments (discriminantStart). */
  private discriminantStart(): number[] | undefined {
    return discriminantStart(this.P, this.C, this.nP, this.nC, this.startWork);
  }

  /** Observed and true differences of every variable before and after matching (replication i). */
  private recordBalance(i: number, m: number): void {
    const { nP, nC, pools, sums, bal, matchedFlag } = this;
    const setWeight = this.weights.weight;
    const N = nP + nC;
    const p = this.variables;
    const { rowsP, weightsP, rowsC, weightsC } = this;
    const countP = countedRows(matchedFlag, nC, N, rowsP, weightsP);
    const countC = countedRows(setWeight, 0, nC, rowsC, weightsC);
    const sumsTrue = this.sumsTrue;
    for (let v = 0; v < p; v++) {
      let ok = 0;
      // Observed and true values side by side in each sweep (pairedSubsetSums: each sum as subsetSums's).
      const observedCol = pools.observed[v] as Float64Array;
      const trueCol = pools.trueScore[v] as Float64Array;
      const shiftObserved = observedCol[0] as number;
      const shiftTrue = trueCol[0] as number;
      pairedSubsetSums(observedCol, trueCol, nC, N, rowsP, weightsP, countP, shiftObserved, shiftTrue, sums, sumsTrue);
      const programmeObserved = this.programmeSums;
      const programmeTrue = this.programmeSumsTrue;
      programmeObserved.set(sums);
      programmeTrue.set(sumsTrue);
      pairedSubsetSums(observedCol, trueCol, 0, nC, rowsC, weightsC, countC, shiftObserved, shiftTrue, sums, sumsTrue);
      for (let series = 0; series < 2; series++) {
        const shift = series === 0 ? shiftObserved : shiftTrue;
        const sp = series === 0 ? programmeObserved : programmeTrue;
        const sc = series === 0 ? sums : sumsTrue;
        const meanP = meanOf(sp[0] as number, sp[1] as number, shift);
        const varP = varianceOf(sp[0] as number, sp[1] as number, sp[2] as number);
        const nMP = sp[3] as number;
        const meanMP = meanOf(nMP, sp[4] as number, shift);
        const varMP = varianceOf(nMP, sp[4] as number, sp[5] as number);
        const meanC = meanOf(sc[0] as number, sc[1] as number, shift);
        const varC = varianceOf(sc[0] as number, sc[1] as number, sc[2] as number);
        const nMC = sc[3] as number;
        const meanMC = meanOf(nMC, sc[4] as number, shift);
        const varMC = varianceOf(nMC, sc[4] as number, sc[5] as number);
        const base = v * B_COUNT;
        (bal[base + (series === 0 ? B_OBS_BEFORE : B_TRUE_BEFORE)] as Float64Array)[i] = meanP - meanC;
        (bal[base + (series === 0 ? B_OBS_SD : B_TRUE_SD)] as Float64Array)[i] = Math.sqrt((varP + varC) / 2);
        if (m >= 1) {
          ok |= AFTER_OK;
          (bal[base + (series === 0 ? B_OBS_AFTER : B_TRUE_AFTER)] as Float64Array)[i] = meanMP - meanMC;
          if (series === 0 && nMP >= 2 && nMC >= 2 && varMC > 0 && Number.isFinite(varMP / varMC)) {
            (bal[base + B_VAR_RATIO] as Float64Array)[i] = varMP / varMC;
            ok |= VAR_RATIO_OK;
          }
        }
      }
      this.balOk[i * p + v] = ok;
    }
  }

  /** Per-variable balance over the first `total` replications (pretest first). */
  balanceSummary(total: number): CovariateBalance[] {
    const { variables: p, bal, balOk } = this;
    const result: CovariateBalance[] = [];
    const smd = new Float64Array(total);
    for (let v = 0; v < p; v++) {
      const series = (metric: number) => bal[v * B_COUNT + metric] as Float64Array;
      const after: ReplicationSelection = { ok: balOk, bit: AFTER_OK, stride: p, offset: v };
      const ratioOk: ReplicationSelection = { ok: balOk, bit: VAR_RATIO_OK, stride: p, offset: v };
      // SMDs: difference over the full pools' pooled SD of the same replication (Stuart 2010).
      const obsBefore = meanAndMCSE(scaled(series(B_OBS_BEFORE), series(B_OBS_SD), smd, total), total);
      const obsAfter = meanAndMCSE(scaled(series(B_OBS_AFTER), series(B_OBS_SD), smd, total), total, after);
      const trueBefore = meanAndMCSE(scaled(series(B_TRUE_BEFORE), series(B_TRUE_SD), smd, total), total);
      const trueAfter = meanAndMCSE(scaled(series(B_TRUE_AFTER), series(B_TRUE_SD), smd, total), total, after);
      const ratio = meanAndMCSE(series(B_VAR_RATIO), total, ratioOk);
      result.push({
        name: this.names[v] as string,
        measured: this.measuredFlags[v] as boolean,
        exact: this.exactFlags[v] as boolean,
        observedSMDBefore: obsBefore[0],
        observedSMDBeforeMCSE: obsBefore[1],
        observedSMDAfter: obsAfter[0],
        observedSMDAfterMCSE: obsAfter[1],
        trueSMDBefore: trueBefore[0],
        trueSMDBeforeMCSE: trueBefore[1],
        trueSMDAfter: trueAfter[0],
        trueSMDAfterMCSE: trueAfter[1],
        varianceRatioAfter: ratio[0],
        varianceRatioAfterMCSE: ratio[1],
      });
    }
    return result;
  }

  /** The pretest's matching summary over the first `total` replications, in the one-covariate engine's shape. */
  matchingSummary(total: number): SimMatchingSummary {
    const { nP, bal, balOk, variables: p } = this;
    const s = (metric: number) => bal[metric] as Float64Array; // pretest = variable 0
    const smd = (diff: number, sd: number) => scaled(s(diff), s(sd), new Float64Array(total), total);
    return summariseMatching(
      {
        matched: this.matchedCount,
        observedBefore: s(B_OBS_BEFORE),
        observedAfter: s(B_OBS_AFTER),
        observedSMDBefore: smd(B_OBS_BEFORE, B_OBS_SD),
        observedSMDAfter: smd(B_OBS_AFTER, B_OBS_SD),
        trueBefore: s(B_TRUE_BEFORE),
        trueAfter: s(B_TRUE_AFTER),
        trueSMDBefore: smd(B_TRUE_BEFORE, B_TRUE_SD),
        trueSMDAfter: smd(B_TRUE_AFTER, B_TRUE_SD),
        varianceRatio: s(B_VAR_RATIO),
        ok: balOk,
        stride: p,
        offset: 0,
      },
      total,
      nP,
    );
  }

  private captureExample(matching: CovariateMatching): SimulationResult['example'] {
    const { nC, pools } = this;
    const columns = { observed: pools.observed[0] as Float64Array, trueScore: pools.trueScore[0] as Float64Array, outcome: pools.outcome };
    return exampleReplication(matching, columns, nC, columns);
  }
}

/** out[i] = diff[i] / sd[i] (0 when sd is 0), for i < n; returns out. */
function scaled(diff: Float64Array, sd: Float64Array, out: Float64Array, n: number): Float64Array {
  for (let i = 0; i < n; i++) out[i] = (sd[i] as number) > 0 ? (diff[i] as number) / (sd[i] as number) : 0;
  return out;
}
