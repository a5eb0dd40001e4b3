import LogisticRegression from 'ml-logistic-regression';
import { covariance, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { deriveCovariateModel } from '../../src/core/multivariate/covariateModel';
import type { Plan } from '../../src/core/plan';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import { createGroupMoments, groupMoments } from '../../src/sim/multivariate/ancovaOnCovariates';
import { createMultivariateSimulation } from '../../src/sim/multivariate/createMultivariateSimulation';
import { createCovariatePools, drawCovariatePools } from '../../src/sim/multivariate/drawCovariatePools';
import { createLogisticWorkspace, fitLogisticRegression } from '../../src/sim/multivariate/fitLogisticRegression';
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

/** Invented data: n rows, k correlated normal columns (means far from 0), membership from a known logistic model. */
function logisticData(seed: number, n: number, k: number): { cols: Float64Array[]; y: Uint8Array } {
  const rng = Xoshiro128StarStar.forReplication(seed, 0);
  const z = new NormalSampler(rng);
  const cols = Array.from({ length: k }, () => new Float64Array(n));
  const y = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const common = z.next();
    let eta = -0.7;
    for (let j = 0; j < k; j++) {
      const v = 0.5 * common + 0.9 * z.next();
      cols[j]![i] = 20 * (j + 1) + (j + 2) * v;
      eta += ((j % 2 === 0 ? 0.6 : -0.4) / (j + 1)) * v;
    }
    y[i] = rng.nextFloat() < 1 / (1 + Math.exp(-eta)) ? 1 : 0;
  }
  return { cols, y };
}

/** One replication's pools of the built-in invented maths-club example: its measured columns and group flags. */
function exampleReplicationData(replication: number): { cols: Float64Array[]; y: Uint8Array; n: number } {
  const model = deriveCovariateModel(structuredClone(AFTER_SCHOOL_MATHS));
  const pools = createCovariatePools(model);
  const rng = new Xoshiro128StarStar();
  rng.reseed(2024, replication);
  drawCovariatePools(pools, new NormalSampler(rng));
  const n = pools.size;
  return { cols: model.measuredIndices.map((j) => Float64Array.from(pools.observed[j]!)), y: new Uint8Array(n).fill(1, pools.nComparison), n };
}

describe('the logistic fit: fast passes, reusable workspace, tolerance', () => {
  it('agrees with ml-logistic-regression 2.0.0 (npm) for one, three, four and six columns (the fast passes: unrolled sums for 1–4, pair by pair beyond; two columns: multivariateLogistic.test.ts)', () => {
    // The reference maximises the same likelihood by plain gradient ascent on the columns as given; on
    // standardised columns (so that 0.01 is a stable step; the estimate is the same up to the change of
    // scale) 3,000 steps bring it within 1e-6 of the maximum, the tolerance on each coefficient (log-odds
    // units per SD). Invented data, 240 rows.
    for (const k of [1, 3, 4, 6]) {
      const n = 240;
      const { cols, y } = logisticData(30 + k, n, k);
      const stats = cols.map((c) => {
        const m = c.reduce((s, v) => s + v, 0) / n;
        const sd = Math.sqrt(c.reduce((s, v) => s + (v - m) ** 2, 0) / (n - 1));
        return { m, sd };
      });
      const std = cols.map((c, j) => Float64Array.from(c, (v) => (v - stats[j]!.m) / stats[j]!.sd));
      const fit = fitLogisticRegression(std, y, n);
      const reference = new LogisticRegression({ numSteps: 3000, learningRate: 1e-2 });
      reference.train(new Matrix(Array.from({ length: n }, (_, i) => [1, ...std.map((c) => c[i]!)])), Matrix.columnVector(Array.from(y)));
      const w = reference.classifiers[0]!.weights.to1DArray();
      for (let j = 0; j <= k; j++) expect(Math.abs(fit.coefficients[j]! - w[j]!), `k = ${k}, coefficient ${j}`).toBeLessThan(1e-6);
    }
  });

  it('the fast passes give the same bits as the general row loop (one to nine columns, and the maths-club example)', () => {
    // Not an outside check: the two are the same sums in the same order, so the engine's results do not
    // depend on which one runs (existing plans stay bit-identical; test/core/existingPlansUnchanged.test.ts).
    const cases: { cols: Float64Array[]; y: Uint8Array; n: number; label: string }[] = [];
    for (let k = 1; k <= 9; k++) {
      for (let seed = 0; seed < 3; seed++) {
        const n = 150 + 37 * seed;
        cases.push({ ...logisticData(100 * k + seed, n, k), n, label: `k = ${k}, seed ${seed}` });
      }
    }
    for (let r = 0; r < 3; r++) cases.push({ ...exampleReplicationData(r), label: `maths-club replication ${r}` });
    for (const { cols, y, n, label } of cases) {
      const k = cols.length;
      const a = new Float64Array(n);
      const b = new Float64Array(n);
      const c = new Float64Array(n);
      const fast = fitLogisticRegression(cols, y, n, { linearPredictor: a });
      const general = fitLogisticRegression(cols, y, n, { linearPredictor: b, generalPass: true });
      // Without the final deviance (the engine's call): the same logits and coefficients, deviance NaN.
      const logitsOnly = fitLogisticRegression(cols, y, n, { linearPredictor: c, finalDeviance: false });
      expect(fast.iterations, label).toBe(general.iterations);
      expect(logitsOnly.iterations, label).toBe(general.iterations);
      expect(Object.is(fast.deviance, general.deviance), label).toBe(true);
      expect(Number.isNaN(logitsOnly.deviance), label).toBe(true);
      for (let j = 0; j <= k; j++) {
        expect(Object.is(fast.coefficients[j], general.coefficients[j]), `${label}, coefficient ${j}`).toBe(true);
        expect(Object.is(logitsOnly.coefficients[j], general.coefficients[j]), `${label}, coefficient ${j}`).toBe(true);
      }
      let same = 0;
      for (let i = 0; i < n; i++) if (Object.is(a[i], b[i]) && Object.is(c[i], b[i])) same++;
      expect(same, label).toBe(n);
    }
  });

  it('standardises four columns per sweep to the same bits as one column at a time (one to nine columns)', () => {
    // Not an outside check: the centred and scaled copy the fit works on (ws.z, ws.centre, ws.scale)
    // must be what the column-at-a-time code gave (mean, then the sum of squared deviations, then
    // (x − m) / sd), so that every later pass, and the engine's results, stay the same to the last bit.
    for (let k = 1; k <= 9; k++) {
      const n = 211;
      const { cols, y } = logisticData(500 + k, n, k);
      const ws = createLogisticWorkspace(n, k);
      fitLogisticRegression(cols, y, n, { workspace: ws });
      let differ = 0;
      for (let j = 0; j < k; j++) {
        const col = cols[j]!;
        let s = 0;
        for (let i = 0; i < n; i++) s += col[i]!;
        const m = s / n;
        let ss = 0;
        for (let i = 0; i < n; i++) ss += (col[i]! - m) ** 2;
        const sd = Math.sqrt(ss / (n - 1));
        if (!Object.is(ws.centre[j], m) || !Object.is(ws.scale[j], 1 / sd)) differ++;
        for (let i = 0; i < n; i++) if (!Object.is(ws.z[i * k + j], (col[i]! - m) / sd)) differ++;
      }
      expect(differ, `k = ${k}`).toBe(0);
    }
  });

  it('a reused workspace carries nothing from one fit to the next (a replication does not depend on those before it)', () => {
    const ws = createLogisticWorkspace(400, 3);
    const first = logisticData(7, 400, 3);
    const second = logisticData(8, 300, 3); // fewer rows than the workspace holds
    const fresh = fitLogisticRegression(second.cols, second.y, 300);
    fitLogisticRegression(first.cols, first.y, 400, { workspace: ws });
    const reused = fitLogisticRegression(second.cols, second.y, 300, { workspace: ws });
    expect(reused).toEqual(fresh);
  });

  it('fits the documented tolerance: logits within 1e-8 of a fit iterated to 1e-17, from any reasonable start', () => {
    // The tolerance documented in docs/simulation.md ("The propensity fit's tolerance"): the default stop
    // (Newton decrement below 1e-10 of the deviance, that last step taken) leaves the fitted logits within
    // 1e-8 of the maximum-likelihood ones (measured on 200 replications of this example: at most 5e-12 from
    // the default start, 2e-9 from a start 20% off). Checked on 12 replications
    // of the built-in invented maths-club example (2,250 people, four columns), against the same fit
    // iterated to 1e-17 (one Newton step more), and from a start 20% off.
    for (let r = 0; r < 12; r++) {
      const { cols, y, n } = exampleReplicationData(r);
      const a = new Float64Array(n);
      const tight = new Float64Array(n);
      const moved = new Float64Array(n);
      const fit = fitLogisticRegression(cols, y, n, { linearPredictor: a });
      fitLogisticRegression(cols, y, n, { linearPredictor: tight, tolerance: 1e-17, maxIterations: 40 });
      fitLogisticRegression(cols, y, n, { linearPredictor: moved, start: fit.coefficients.map((v) => 1.2 * v) });
      let worst = 0;
      for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(a[i]! - tight[i]!), Math.abs(moved[i]! - tight[i]!));
      expect(worst).toBeLessThan(1e-8);
    }
  });

  it('names the covariates when four columns (the unrolled pass) separate the groups or are collinear', () => {
    const n = 60;
    const cols = [0, 1, 2, 3].map((j) => Float64Array.from({ length: n }, (_, i) => Math.sin(i * (j + 1.3)) + (j === 0 ? (i >= 30 ? 5 : 0) : 0)));
    const y = Uint8Array.from({ length: n }, (_, i) => (i >= 30 ? 1 : 0));
    const names = ['Pretest', 'Attendance', 'Deprivation', 'Sex'];
    expect(() => fitLogisticRegression(cols, y, n, { names, where: 'simulated replication 4' })).toThrow(
      /^The propensity score cannot be fitted \(simulated replication 4\): the measured covariates \(Pretest, Attendance, Deprivation, Sex\) separate the programme and comparison groups completely or almost completely/,
    );
    const mixed = Uint8Array.from({ length: n }, (_, i) => (i % 3 === 0 ? 1 : 0));
    const collinear = [cols[1]!, cols[2]!, cols[3]!, Float64Array.from(cols[1]!, (v, i) => v - 2 * cols[2]![i]!)];
    expect(() => fitLogisticRegression(collinear, mixed, n, { names })).toThrow(
      'The propensity score cannot be fitted: the measured covariates (Pretest, Attendance, Deprivation, Sex) are collinear',
    );
  });
});

describe('group moments column pair by column pair', () => {
  it('match the covariance of ml-matrix 6.15.1 (npm), unweighted and with whole-number weights as repeated rows', () => {
    // Sxx / (n − 1) is the sample covariance matrix (any statistics text; common practice). Weights count a
    // row that many times, so the reference gets each row repeated. Invented data; tolerance 1e-9 relative.
    const rng = Xoshiro128StarStar.forReplication(5, 0);
    const z = new NormalSampler(rng);
    const n = 300;
    const p = 3;
    const cols = Array.from({ length: p }, (_, j) => Float64Array.from({ length: n }, () => 50 * j + (j + 1) * z.next()));
    const y = Float64Array.from({ length: n }, (_, i) => 0.5 * cols[0]![i]! + z.next());
    const weight = Float64Array.from({ length: n - 20 }, () => Math.floor(3 * rng.nextFloat()));
    for (const w of [null, weight]) {
      const G = createGroupMoments(p);
      groupMoments(cols, y, 20, n, w, G);
      const rows: number[][] = [];
      for (let i = 20; i < n; i++) for (let t = 0; t < (w ? w[i - 20]! : 1); t++) rows.push([...cols.map((c) => c[i]!), y[i]!]);
      const ref = covariance(new Matrix(rows));
      const m = rows.length;
      expect(G.n).toBe(m);
      const close = (got: number, want: number) => expect(Math.abs(got - want)).toBeLessThan(1e-9 * Math.max(1, Math.abs(want)));
      for (let a = 0; a < p; a++) {
        close(G.means[a]!, rows.reduce((s, r) => s + r[a]!, 0) / m);
        close(G.sxy[a]! / (m - 1), ref.get(a, p));
        for (let b = 0; b < p; b++) close(G.sxx[a * p + b]! / (m - 1), ref.get(a, b));
      }
      close(G.syy / (m - 1), ref.get(p, p));
    }
  });
});

describe('the propensity engine is deterministic across chunkings (four columns, exact strata)', () => {
  it('chunks in any order, repeated, give the same result as one pass', () => {
    // Another part of the work splits runs across workers by replication index: every replication must
    // depend on its index alone (its own stream; buffers that carry nothing over). Exact equality.
    const plan: Plan = { ...structuredClone(AFTER_SCHOOL_MATHS), simulation: { replications: 24, seed: 77 } };
    const whole = createMultivariateSimulation(plan);
    whole.runChunk(0, 24);
    const pieces = createMultivariateSimulation(plan);
    pieces.runChunk(16, 24);
    pieces.runChunk(3, 16);
    pieces.runChunk(0, 5);
    expect(pieces.finish()).toEqual(whole.finish());
  });
});
