import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { normalCdf } from '../../src/core/distributions';
import { createPlanSimulation } from '../../src/sim/multivariate/createPlanSimulation';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { ClusterSums, clusterRobustAncova } from '../../src/sim/design/clusterRobustAncova';
import { clusterRobustDifference } from '../../src/sim/design/clusterRobustDifference';
import { isFeasible, type SimAnalysisResult, type SimAnalysisSummary } from '../../src/sim/types';
import { clusterPlan } from '../core/clusterFixtures';
import { mulberry32, normalSource } from '../core/independentNormals';

const feasible = (s: SimAnalysisResult | undefined): SimAnalysisSummary => {
  if (!s || !isFeasible(s)) throw new Error('expected figures');
  return s;
};

/**
 * An independent simulation, written here in plain JS (its own generator, no
 * engine code): programme and comparison schools of n people, a new cohort or
 * the same people at posttest; each programme school is matched to the
 * comparison school whose observed pretest mean is nearest (with replacement,
 * from a large pool), and the study's estimate is the mean difference of the
 * posttest school means. Returns the mean over studies and its MC SE.
 */
function independentMatchedClusters(cohort: 'new' | 'same', studies: number, seed: number): { mean: number; mcse: number } {
  const z = normalSource(seed);
  const n = 25, JP = 30, JC = 600;
  const tau2 = 45, w2 = 135, e2 = 45; // ICC .2, reliability .8, SD 15
  const resid = 45; // posttest SD 15, r .8, slope 1: 225·(1 − .64/.8); posttest ICC .2 leaves none of it between schools
  const school = (mu: number) => {
    const u = Math.sqrt(tau2) * z();
    let x = 0, y = 0;
    for (let i = 0; i < n; i++) {
      const t = mu + u + Math.sqrt(w2) * z();
      x += t + Math.sqrt(e2) * z();
      const taker = cohort === 'same' ? t : mu + u + Math.sqrt(w2) * z();
      y += taker + Math.sqrt(resid) * z();
    }
    return { x: x / n, y: y / n };
  };
  const estimates: number[] = [];
  for (let s = 0; s < studies; s++) {
    const comparison = Array.from({ length: JC }, () => school(100));
    let sum = 0;
    for (let j = 0; j < JP; j++) {
      const p = school(92);
      let best = comparison[0]!;
      for (const c of comparison) if (Math.abs(c.x - p.x) < Math.abs(best.x - p.x)) best = c;
      sum += p.y - best.y;
    }
    estimates.push(sum / JP);
  }
  const mean = estimates.reduce((a, b) => a + b, 0) / studies;
  const sd = Math.sqrt(estimates.reduce((a, b) => a + (b - mean) ** 2, 0) / (studies - 1));
  return { mean, mcse: sd / Math.sqrt(studies) };
}

describe('matched-cluster artefact beta(1 − λ)Delta (Thorndike 1942 at cluster level)', () => {
  for (const cohort of ['new', 'same'] as const) {
    it(`${cohort} cohort: the closed form agrees with an independent simulation within 3 MC SE`, () => {
      const closed = analysePlan(clusterPlan({ cohort })).clusters?.matchedClusterArtefact as number;
      const sim = independentMatchedClusters(cohort, 150, cohort === 'new' ? 101 : 202);
      expect(Math.abs(sim.mean - closed)).toBeLessThan(3 * sim.mcse);
      // The check can fail: the one-level artefact −1.6 and no artefact are both far outside it.
      expect(Math.abs(sim.mean - -1.6)).toBeGreaterThan(3 * sim.mcse);
      expect(Math.abs(sim.mean)).toBeGreaterThan(3 * sim.mcse);
    });
  }

  it('the engine (clusters matched nearly exactly from a large pool, with replacement) agrees with the closed form within 3 MC SE', () => {
    const plan = clusterPlan({ clustersP: 30, clustersC: 600, caliper: 0.02, replacement: true, replications: 200, seed: 13 });
    const s = feasible(simulatePlan(plan).analyses.matchedDifference);
    const closed = analysePlan(plan).analyses.matchedDifference?.formulaEstimate as number;
    expect(Math.abs(s.meanEstimate - closed)).toBeLessThan(3 * s.meanEstimateMCSE);
  });
});

describe('cluster-aware SEs: simulated coverage 0.95 ± 0.02 (plus 3 MC SE)', () => {
  // Invented plan with no gap (every analysis unbiased), so coverage of tau tests the SEs alone.
  const cases = [
    { name: 'clusters matched, new cohort', plan: clusterPlan({ gap: 0, effect: 2, size: 10, clustersP: 20, clustersC: 60, caliper: 0.2, replications: 1000, seed: 11 }) },
    { name: 'people matched across clusters, same people', plan: clusterPlan({ gap: 0, effect: 2, size: 10, clustersP: 20, clustersC: 60, caliper: 0.2, replications: 1000, seed: 12, cohort: 'same', level: 'people' }) },
  ];
  for (const c of cases) {
    it(c.name, () => {
      const r = simulatePlan(c.plan);
      for (const id of ['matchedDifference', 'ancova', 'gainScore', 'personLevelAncova'] as const) {
        const s = feasible(r.analyses[id]);
        expect(Math.abs(s.coverage - 0.95), `${id} coverage ${s.coverage}`).toBeLessThan(0.02 + 3 * s.coverageMCSE);
      }
      // The naive person-level SE ignores the clustering: its coverage falls short (the cost shown to the researcher).
      const naive = feasible(r.naivePersonLevel?.personLevelAncova);
      const aware = feasible(r.analyses.personLevelAncova);
      expect(naive.meanModelSE).toBeLessThan(aware.meanModelSE);
      expect(naive.coverage).toBeLessThan(aware.coverage);
    });
  }

  it('the naive person-level coverage matches what the closed-form SEs predict, 2Φ(1.96·naive/aware) − 1, within 0.02 + 3 MC SE', () => {
    // Invented: ICC .3 at both tests, new cohort, no gap. Prediction from the normal approximation (common practice).
    const plan = clusterPlan({ gap: 0, effect: 2, size: 25, icc: 0.3, posttestICC: 0.3, clustersP: 20, clustersC: 20, caliper: 1, replications: 800, seed: 5 });
    const a = analysePlan(plan).analyses.personLevelAncova;
    const predicted = 2 * normalCdf((1.96 * (a?.naiveSE as number)) / (a?.se as number)) - 1;
    expect(predicted).toBeLessThan(0.9);
    const naive = feasible(simulatePlan(plan).naivePersonLevel?.personLevelAncova);
    expect(Math.abs(naive.coverage - predicted)).toBeLessThan(0.02 + 3 * naive.coverageMCSE);
  });
});

/** Eigen-decomposition of a small symmetric matrix by cyclic Jacobi rotations (Golub & Van Loan 2013, §8.5). */
function jacobiEigen(S: number[][]): { values: number[]; vectors: number[][] } {
  const n = S.length;
  const a = S.map((r) => [...r]);
  const v: number[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off += a[p]![q]! ** 2;
    if (off < 1e-30) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        if (Math.abs(a[p]![q]!) < 1e-300) continue;
        const theta = (a[q]![q]! - a[p]![p]!) / (2 * a[p]![q]!);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1), s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k]![p]!, akq = a[k]![q]!;
          a[k]![p] = c * akp - s * akq;
          a[k]![q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p]![k]!, aqk = a[q]![k]!;
          a[p]![k] = c * apk - s * aqk;
          a[q]![k] = s * apk + c * aqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k]![p]!, vkq = v[k]![q]!;
          v[k]![p] = c * vkp - s * vkq;
          v[k]![q] = s * vkp + c * vkq;
        }
      }
    }
  }
  return { values: a.map((r, i) => r[i]!), vectors: v };
}

/** The CR2 SE of the group coefficient by the full matrix formula of Bell & McCaffrey (2002), eq. for V_BRL. */
function bruteForceCR2(rows: { cluster: number; g: number; x: number; y: number }[]): { est: number; se: number; naive: number } {
  const X = rows.map((r) => [1, r.g, r.x]);
  const y = rows.map((r) => r.y);
  const XtX = [0, 1, 2].map((i) => [0, 1, 2].map((j) => X.reduce((s, row) => s + row[i]! * row[j]!, 0)));
  // 3 × 3 inverse by Gauss–Jordan.
  const M = XtX.map((r, i) => [...r, ...[0, 1, 2].map((j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < 3; c++) {
    let piv = c;
    for (let r = c + 1; r < 3; r++) if (Math.abs(M[r]![c]!) > Math.abs(M[piv]![c]!)) piv = r;
    [M[c], M[piv]] = [M[piv]!, M[c]!];
    const d = M[c]![c]!;
    for (let j = 0; j < 6; j++) M[c]![j] = M[c]![j]! / d;
    for (let r = 0; r < 3; r++) if (r !== c) { const f = M[r]![c]!; for (let j = 0; j < 6; j++) M[r]![j] = M[r]![j]! - f * M[c]![j]!; }
  }
  const A = M.map((r) => r.slice(3));
  const Xty = [0, 1, 2].map((i) => X.reduce((s, row, k) => s + row[i]! * y[k]!, 0));
  const b = A.map((r) => r.reduce((s, v, j) => s + v * Xty[j]!, 0));
  const e = X.map((row, k) => y[k]! - row.reduce((s, v, j) => s + v * b[j]!, 0));
  const clusters = [...new Set(rows.map((r) => r.cluster))];
  let V = 0;
  for (const c of clusters) {
    const idx = rows.flatMap((r, k) => (r.cluster === c ? [k] : []));
    const Xc = idx.map((k) => X[k]!);
    const H = Xc.map((ri) => Xc.map((rj) => [0, 1, 2].reduce((s, i) => s + ri[i]! * [0, 1, 2].reduce((t, j) => t + A[i]![j]! * rj[j]!, 0), 0)));
    const IminusH = H.map((r, i) => r.map((v, j) => (i === j ? 1 : 0) - v));
    const { values, vectors } = jacobiEigen(IminusH);
    const m = idx.length;
    const adj = Array.from({ length: m }, (_, i) => Array.from({ length: m }, (_, j) => values.reduce((s, lam, k) => s + (vectors[i]![k]! * vectors[j]![k]!) / Math.sqrt(lam), 0)));
    const ae = adj.map((r) => r.reduce((s, v, j) => s + v * e[idx[j]!]!, 0));
    const u = [0, 1, 2].map((i) => Xc.reduce((s, row, k) => s + row[i]! * ae[k]!, 0));
    const t = [0, 1, 2].reduce((s, j) => s + A[1]![j]! * u[j]!, 0);
    V += t * t;
  }
  const sse = e.reduce((s, v) => s + v * v, 0);
  return { est: b[1]!, se: Math.sqrt(V), naive: Math.sqrt((sse / (rows.length - 3)) * A[1]![1]!) };
}

describe('CR2 cluster-robust SE (Bell & McCaffrey 2002)', () => {
  const rand = mulberry32(99);
  const data = (clusterConstantX: boolean) => {
    const rows: { cluster: number; g: number; x: number; y: number }[] = [];
    const sizes = [3, 4, 2, 5, 3, 4, 3, 2];
    sizes.forEach((n, c) => {
      const g = c < 4 ? 0 : 1;
      const cx = 10 * rand();
      for (let i = 0; i < n; i++) {
        const x = clusterConstantX ? cx : cx + 3 * rand();
        rows.push({ cluster: c, g, x, y: 2 * g + 0.7 * x + rand() * 4 + (c % 3) });
      }
    });
    return rows;
  };
  const sums = (rows: ReturnType<typeof data>) => {
    const s = new ClusterSums(8);
    s.count = 8;
    for (const r of rows) {
      s.group[r.cluster] = r.g;
      s.n[r.cluster]! += 1;
      s.sx[r.cluster]! += r.x;
      s.sxx[r.cluster]! += r.x * r.x;
      s.sy[r.cluster]! += r.y;
      s.sxy[r.cluster]! += r.x * r.y;
      s.syy[r.cluster]! += r.y * r.y;
    }
    return s;
  };
  for (const constant of [false, true]) {
    it(`matches the full-matrix formula on a small worked data set (${constant ? 'cluster-constant covariate' : 'person covariate'}, unequal cluster sizes)`, () => {
      const rows = data(constant);
      const ref = bruteForceCR2(rows);
      const out = new Float64Array(5);
      expect(clusterRobustAncova(sums(rows), out)).toBe(true);
      // Tolerance 1e-8 relative: the same quantity by two routes, up to rounding.
      expect(out[0]).toBeCloseTo(ref.est, 8);
      expect(Math.abs((out[1] as number) / ref.se - 1)).toBeLessThan(1e-8);
      expect(Math.abs((out[3] as number) / ref.naive - 1)).toBeLessThan(1e-8);
      expect(out[2]).toBe(6); // 8 clusters − 2
    });
  }

  it('difference of means: hand-worked example (CR2 = s²_P/J_P + s²_C/J_C for equal weights)', () => {
    // Two clusters per group, one person each: P 1, 3; C 0, 0 → estimate 2, variance 2/2 + 0 = 1, df 2.
    const out = new Float64Array(3);
    expect(clusterRobustDifference(Uint8Array.of(1, 1, 0, 0), Float64Array.of(1, 1, 1, 1), Float64Array.of(1, 3, 0, 0), 4, out)).toBe(true);
    expect([...out]).toEqual([2, 1, 2]);
    // Clusters of 2 people (weights 2): sums 2·1 and 2·3 give the same cluster means, so the same variance.
    expect(clusterRobustDifference(Uint8Array.of(1, 1, 0, 0), Float64Array.of(2, 2, 2, 2), Float64Array.of(2, 6, 0, 0), 4, out)).toBe(true);
    expect(out[1]).toBeCloseTo(1, 12);
  });
});

describe('clusters: determinism', () => {
  it('same plan and seed give the same numbers bit for bit, however the replications are chunked', () => {
    const plan = clusterPlan({ replications: 40, seed: 3, cohort: 'same', level: 'people', size: 10, clustersP: 6, clustersC: 12 });
    const a = simulatePlan(plan);
    const run = createPlanSimulation(plan);
    run.runChunk(0, 13);
    run.runChunk(13, 40);
    const b = run.finish();
    expect(JSON.stringify(b.analyses)).toBe(JSON.stringify(a.analyses));
    expect(JSON.stringify(b.naivePersonLevel)).toBe(JSON.stringify(a.naivePersonLevel));
    const c = simulatePlan({ ...plan, simulation: { ...plan.simulation, seed: 4 } });
    expect(JSON.stringify(c.analyses)).not.toBe(JSON.stringify(a.analyses));
  });
});
