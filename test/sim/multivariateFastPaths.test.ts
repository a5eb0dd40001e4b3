import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { countedRows, pairedSubsetSums, subsetSums } from '../../src/sim/multivariate/balanceSums';
import { createDiscriminantWorkspace, discriminantStart } from '../../src/sim/multivariate/discriminantStart';
import { createGroupMoments, groupMoments, type GroupMoments } from '../../src/sim/multivariate/ancovaOnCovariates';
import type { CovariateSimModel } from '../../src/sim/multivariate/covariateSimModel';
import { createCovariatePools, drawCovariatePools, INDICATOR, WHOLE_NUMBERS, type CovariatePools } from '../../src/sim/multivariate/drawCovariatePools';
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

/*
 * The several-covariate engine's fast paths against the code they replaced,
 * bit for bit (Object.is). Not an outside check: existing plans must give the
 * same numbers to the last bit (a project rule; test/core/existingPlansUnchanged.test.ts
 * checks the built-in examples), so each faster loop must keep every kept
 * double's operations and their order. The replaced code is kept here, only as
 * the reference.
 */

/** drawCovariatePools as it was: variable by variable and term by term, one sweep per term (the reference). */
function drawCovariatePoolsByTerm(pools: CovariatePools, normal: NormalSampler): void {
  const { nComparison: nC, size, variables: p, stride, observed, trueScore, outcome, normals: z } = pools;
  const { sem, errorVariables, recording, beta, residualSD } = pools;
  const nErr = errorVariables.length;
  normal.fillStandard(z, z.length);
  for (let g = 0; g < 2; g++) {
    const programme = g === 1;
    const from = programme ? nC : 0;
    const to = programme ? size : nC;
    const L = programme ? pools.choleskyProgramme : pools.choleskyComparison;
    const mu = programme ? pools.meanProgramme : pools.meanComparison;
    const shift = programme ? pools.programmeShift : 0;
    const cut = programme ? pools.thresholdProgramme : pools.thresholdComparison;
    for (let i = from, at = from * stride + stride - 1; i < to; i++, at += stride) outcome[i] = shift + residualSD * z[at]!;
    for (let a = 0; a < p; a++) {
      const T = trueScore[a]!;
      const O = observed[a]!;
      const m = mu[a]!;
      const ba = beta[a]!;
      const row = a * p;
      const rec = recording[a]!;
      const threshold = cut[a]!;
      for (let i = from; i < to; i++) T[i] = m;
      for (let b = 0; b <= a; b++) {
        const l = L[row + b]!;
        for (let i = from, at = from * stride + b; i < to; i++, at += stride) T[i] = T[i]! + l * z[at]!;
      }
      if (rec === WHOLE_NUMBERS) for (let i = from; i < to; i++) T[i] = Math.round(T[i]!);
      else if (rec === INDICATOR) for (let i = from; i < to; i++) T[i] = T[i]! > threshold ? 1 : 0;
      O.set(T.subarray(from, to), from);
      for (let i = from; i < to; i++) outcome[i] = outcome[i]! + ba * T[i]!;
    }
    for (let e = 0; e < nErr; e++) {
      const a = errorVariables[e]!;
      const O = observed[a]!;
      const s = sem[a]!;
      const rec = recording[a]!;
      for (let i = from, at = from * stride + p + e; i < to; i++, at += stride) {
        const x = O[i]! + s * z[at]!;
        O[i] = rec === WHOLE_NUMBERS ? Math.round(x) : rec === INDICATOR ? (x > 0.5 ? 1 : 0) : x;
      }
    }
  }
}

/**
 * An invented model of p variables (pretest first) cycling through every kind the engine
 * draws: fallible and measured, unmeasured, exact whole numbers (error-free), an exact 0/1
 * indicator, error-free and not exact. Equicorrelated true scores (r = 0.2, positive definite).
 */
function invented(p: number, nP: number, nC: number, shift: number): CovariateSimModel {
  const kinds = Array.from({ length: p }, (_, j) => (j === 0 ? 0 : (j + shift) % 5));
  const sd = kinds.map((k) => (k === 3 ? 0.5 : k === 2 ? 3 : 8));
  const meanC = kinds.map((k, j) => (k === 3 ? 0.5 : k === 2 ? 40 : 50 + 10 * j));
  const meanP = kinds.map((k, j) => (k === 3 ? 0.4 : (meanC[j] as number) - (k === 2 ? 1 : 4)));
  const sigma = Array.from({ length: p }, (_, a) => Array.from({ length: p }, (_, b) => (a === b ? 1 : 0.2) * (sd[a] as number) * (sd[b] as number)));
  return {
    names: kinds.map((k, j) => (j === 0 ? 'Pretest' : `Invented ${j} (kind ${k})`)),
    measured: kinds.map((k) => k !== 1),
    exact: kinds.map((k) => k === 2 || k === 3),
    mean: { programme: meanP, comparison: meanC },
    sem: kinds.map((k) => (k === 0 || k === 1 ? 4 : 0)),
    beta: kinds.map((_, j) => 0.3 / (j + 1)),
    residualSD: 6,
    growthGap: 1,
    effect: 2,
    n: { programme: nP, comparison: nC },
    sigmaT: { programme: sigma, comparison: sigma },
  };
}

describe('drawCovariatePools: one sweep per variable gives the same bits as one sweep per term', () => {
  it('p = 1 … 9 variables of every kind, small and uneven pools, several replications', () => {
    for (let p = 1; p <= 9; p++) {
      for (const shift of [0, 2]) {
        const model = invented(p, 37 + p, 211 + 3 * p, shift);
        const fast = createCovariatePools(model);
        const reference = createCovariatePools(model);
        const rng = new Xoshiro128StarStar();
        const normal = new NormalSampler(rng);
        for (let r = 0; r < 3; r++) {
          rng.reseed(11 + p, r);
          drawCovariatePools(fast, normal);
          const after = rng.nextUint32();
          rng.reseed(11 + p, r);
          drawCovariatePoolsByTerm(reference, normal);
          expect(rng.nextUint32(), 'the stream is left at the same place').toBe(after);
          let differ = 0;
          for (let v = 0; v < p; v++) {
            for (let i = 0; i < fast.size; i++) {
              if (!Object.is(fast.observed[v]![i], reference.observed[v]![i])) differ++;
              if (!Object.is(fast.trueScore[v]![i], reference.trueScore[v]![i])) differ++;
            }
          }
          for (let i = 0; i < fast.size; i++) if (!Object.is(fast.outcome[i], reference.outcome[i])) differ++;
          expect(differ, `p = ${p}, kinds from ${shift}, replication ${r}`).toBe(0);
          // The draw is not degenerate: the indicator and whole-number kinds are both there when p ≥ 6.
          if (p >= 6) expect(fast.recording.some((k) => k === INDICATOR) && fast.recording.some((k) => k === WHOLE_NUMBERS)).toBe(true);
        }
      }
    }
  });
});

/** groupMoments as it was: one sweep per column pair (a, b ≥ a), two running sums each (the reference). */
function groupMomentsByPair(columns: readonly Float64Array[], y: Float64Array, from: number, to: number, weight: ArrayLike<number> | null, out: GroupMoments): void {
  const p = out.p;
  const q = p + 1;
  const shift = new Float64Array(q);
  const sum = new Float64Array(q);
  const prod = new Float64Array(q * q);
  let first = -1;
  for (let i = from; i < to && first < 0; i++) if (!weight || weight[i - from] !== 0) first = i;
  let n = 0;
  if (first >= 0) {
    for (let a = 0; a < p; a++) shift[a] = columns[a]![first]!;
    shift[p] = y[first]!;
    const rows: number[] = [];
    const rowWeight: number[] = [];
    if (weight) {
      for (let i = first; i < to; i++) {
        const w = weight[i - from]!;
        if (w === 0) continue;
        n += w;
        rows.push(i);
        rowWeight.push(w);
      }
    } else n = to - first;
    for (let a = 0; a < q; a++) {
      const xa = a < p ? columns[a]! : y;
      const sa = shift[a]!;
      for (let b = a; b < q; b++) {
        const xb = b < p ? columns[b]! : y;
        const sb = shift[b]!;
        let s = 0;
        let h = 0;
        if (weight) {
          for (let t = 0; t < rows.length; t++) {
            const i = rows[t]!;
            const wa = rowWeight[t]! * (xa[i]! - sa);
            s += wa;
            h += wa * (xb[i]! - sb);
          }
        } else {
          for (let i = first; i < to; i++) {
            const da = xa[i]! - sa;
            s += da;
            h += da * (xb[i]! - sb);
          }
        }
        if (b === a) sum[a] = s;
        prod[a * q + b] = h;
      }
    }
  }
  out.n = n;
  if (n === 0) {
    out.means.fill(0);
    out.meanY = 0;
    out.sxx.fill(0);
    out.sxy.fill(0);
    out.syy = 0;
    return;
  }
  for (let a = 0; a < p; a++) out.means[a] = shift[a]! + sum[a]! / n;
  out.meanY = shift[p]! + sum[p]! / n;
  const centred = (a: number, b: number): number => prod[a * q + b]! - (sum[a]! * sum[b]!) / n;
  for (let a = 0; a < p; a++) {
    for (let b = a; b < p; b++) {
      const v = centred(a, b);
      out.sxx[a * p + b] = v;
      out.sxx[b * p + a] = v;
    }
    out.sxy[a] = centred(a, p);
  }
  out.syy = centred(p, p);
}

describe('groupMoments: up to five products per sweep gives the same bits as one sweep per column pair', () => {
  it('p = 1 … 12 columns (blocks of one to five), unweighted and with whole-number weights (zeros, repeats, a leading zero)', () => {
    const rng = Xoshiro128StarStar.forReplication(404, 0);
    const z = new NormalSampler(rng);
    const n = 157;
    for (let p = 1; p <= 12; p++) {
      // Invented columns far from 0 (as pretests are), one of them 0/1, and an outcome.
      const cols = Array.from({ length: p }, (_, j) => Float64Array.from({ length: n }, () => (j === 2 ? (rng.nextFloat() < 0.4 ? 1 : 0) : 100 * j + (j + 1) * z.next())));
      const y = Float64Array.from({ length: n }, (_, i) => 0.4 * cols[0]![i]! + 3 * z.next());
      const from = 9;
      const uses = Float64Array.from({ length: n - from }, (_, t) => (t === 0 ? 0 : Math.floor(3 * rng.nextFloat())));
      for (const weight of [null, uses]) {
        const fast = createGroupMoments(p);
        const reference = createGroupMoments(p);
        groupMoments(cols, y, from, n, weight, fast);
        groupMomentsByPair(cols, y, from, n, weight, reference);
        const label = `p = ${p}, ${weight ? 'weighted' : 'unweighted'}`;
        expect(fast.n, label).toBe(reference.n);
        expect(Object.is(fast.meanY, reference.meanY) && Object.is(fast.syy, reference.syy), label).toBe(true);
        let differ = 0;
        for (let a = 0; a < p; a++) {
          if (!Object.is(fast.means[a], reference.means[a]) || !Object.is(fast.sxy[a], reference.sxy[a])) differ++;
          for (let b = 0; b < p; b++) if (!Object.is(fast.sxx[a * p + b], reference.sxx[a * p + b])) differ++;
        }
        expect(differ, label).toBe(0);
      }
    }
  });
});

/** The discriminant start as it was, with ml-matrix 6.15.1's objects (the reference). */
function discriminantStartWithLibrary(P: GroupMoments, C: GroupMoments, nP: number, nC: number): number[] | undefined {
  const p = P.p;
  const s = new Matrix(p, p);
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) s.set(a, b, (P.sxx[a * p + b]! + C.sxx[a * p + b]!) / (nP + nC - 2));
  const cho = new CholeskyDecomposition(s);
  if (!cho.isPositiveDefinite()) return undefined;
  const d = Matrix.columnVector(Array.from({ length: p }, (_, a) => P.means[a]! - C.means[a]!));
  const slopes = cho.solve(d).getColumn(0);
  let intercept = Math.log(nP / nC);
  for (let a = 0; a < p; a++) intercept -= (slopes[a]! * (P.means[a]! + C.means[a]!)) / 2;
  return [intercept, ...slopes];
}

describe('discriminantStart: preallocated arrays give the same bits as ml-matrix 6.15.1 (npm)', () => {
  it('a hand-worked case: one covariate, means 1 and 0, Sxx 4 and 4, five people each → slope 1, intercept −0.5', () => {
    const P = createGroupMoments(1);
    const C = createGroupMoments(1);
    P.means[0] = 1;
    C.means[0] = 0;
    P.sxx[0] = 4;
    C.sxx[0] = 4;
    expect(discriminantStart(P, C, 5, 5, createDiscriminantWorkspace(1))).toEqual([-0.5, 1]);
  });

  it('p = 1 … 9 covariates of random moments (invented), and a singular case', () => {
    const rng = Xoshiro128StarStar.forReplication(77, 0);
    const z = new NormalSampler(rng);
    for (let p = 1; p <= 9; p++) {
      const ws = createDiscriminantWorkspace(p);
      for (let r = 0; r < 4; r++) {
        const n = 60 + 10 * p;
        const cols = Array.from({ length: p }, (_, j) => Float64Array.from({ length: n }, () => 10 * j + (j + 1) * z.next()));
        const y = Float64Array.from({ length: n }, () => z.next());
        const P = createGroupMoments(p);
        const C = createGroupMoments(p);
        groupMoments(cols, y, 0, 25, null, P);
        groupMoments(cols, y, 25, n, null, C);
        const fast = discriminantStart(P, C, 25, n - 25, ws);
        const reference = discriminantStartWithLibrary(P, C, 25, n - 25);
        expect(fast, `p = ${p}`).toBeDefined();
        expect(fast!.length).toBe(p + 1);
        for (let j = 0; j <= p; j++) expect(Object.is(fast![j], reference![j]), `p = ${p}, coefficient ${j}`).toBe(true);
      }
      if (p >= 2) {
        // Two identical columns: S is singular, both say so.
        const n = 50;
        const col = Float64Array.from({ length: n }, () => z.next());
        const cols = [col, ...Array.from({ length: p - 1 }, () => col)];
        const y = Float64Array.from({ length: n }, () => z.next());
        const P = createGroupMoments(p);
        const C = createGroupMoments(p);
        groupMoments(cols, y, 0, 20, null, P);
        groupMoments(cols, y, 20, n, null, C);
        expect(discriminantStartWithLibrary(P, C, 20, 30)).toBeUndefined();
        expect(discriminantStart(P, C, 20, 30, ws)).toBeUndefined();
      }
    }
  });
});

describe('balance sums: two columns per sweep give the same bits as one at a time', () => {
  it('a hand-worked case (col 1, 2, 3; row 2 counted twice; shift 1)', () => {
    const out = new Float64Array(6);
    subsetSums(Float64Array.of(1, 2, 3), 0, 3, Int32Array.of(2), Float64Array.of(2), 1, 1, out);
    // Full: d = 0, 1, 2 → n 3, Σd 3, Σd² 5; listed: weight 2, d = 2 → 2, 4, 8.
    expect(Array.from(out)).toEqual([3, 3, 5, 2, 4, 8]);
  });

  it('observed and true columns, matching weights of 1:1, 1:2 and 1:3 sets with reuse (fractions, zeros), both groups', () => {
    const rng = Xoshiro128StarStar.forReplication(909, 0);
    const z = new NormalSampler(rng);
    for (const [nC, nP] of [[400, 60], [97, 31]] as const) {
      const n = nC + nP;
      // Invented columns far from 0 (the engine shifts by the first value).
      const observed = Float64Array.from({ length: n }, () => 80 + 12 * z.next());
      const trueScore = Float64Array.from(observed, (x) => 0.8 * x + 16 + 3 * z.next());
      // Comparison weights as matching leaves them: Σ 1/(set size) over the sets using a member, often 0.
      const setWeight = Float64Array.from({ length: nC }, () => {
        const u = rng.nextFloat();
        return u < 0.6 ? 0 : u < 0.75 ? 1 : u < 0.85 ? 0.5 : u < 0.95 ? 1 / 3 + 0.5 : 2;
      });
      const matchedFlag = Float64Array.from({ length: nP }, () => (rng.nextFloat() < 0.8 ? 1 : 0));
      for (const [weight, from, to] of [[setWeight, 0, nC], [matchedFlag, nC, n]] as const) {
        const rows = new Int32Array(to - from);
        const weights = new Float64Array(to - from);
        const count = countedRows(weight, from, to, rows, weights);
        const a = new Float64Array(6);
        const b = new Float64Array(6);
        const refA = new Float64Array(6);
        const refB = new Float64Array(6);
        pairedSubsetSums(observed, trueScore, from, to, rows, weights, count, observed[0]!, trueScore[0]!, a, b);
        subsetSums(observed, from, to, rows, weights, count, observed[0]!, refA);
        subsetSums(trueScore, from, to, rows, weights, count, trueScore[0]!, refB);
        for (let j = 0; j < 6; j++) {
          expect(Object.is(a[j], refA[j]), `observed, sum ${j}`).toBe(true);
          expect(Object.is(b[j], refB[j]), `true, sum ${j}`).toBe(true);
        }
        expect(count).toBeGreaterThan(0);
      }
    }
  });
});
