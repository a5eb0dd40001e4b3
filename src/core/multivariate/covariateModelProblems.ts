import type { ModelParameters } from '../modelParameters';
import type { Plan } from '../plan';
import type { PlanProblem } from '../validatePlan';
import { formatApart, formatNumber } from '../inputChecks';
import { showControlCharacters } from '../visibleText';
import { block, dot, isPositiveDefinite, pick, range, solvePositiveDefinite } from './linearAlgebra';

/**
 * What the covariate checks need from a plan. Every field is optional: a
 * field that is absent or failed its own rule (type, range) is left
 * undefined, and the checks that need it are skipped (its own message
 * already says what is wrong).
 */
export interface CovariateCheckInput {
  /** One entry per listed covariate (fields undefined when unusable). */
  covariates: Array<{
    name?: string;
    sd?: number;
    reliability?: number;
    outcomeCorrelation?: number;
    measured?: boolean;
    exact?: boolean;
  }>;
  /** The observed correlation matrix as given; undefined when absent; null when a cell failed its own rule. */
  correlations: number[][] | undefined | null;
  /** Observed pretest SD per group, test points. */
  pretestSD: { programme?: number; comparison?: number };
  /** The pretest's SEM (given, or derived from its reliability), test points. */
  sem?: number;
  /** Within-group pre–post correlation (the pretest's correlation with the outcome). */
  prePostCorrelation?: number;
  /** Pool sizes (for the pooled covariance the corrected ANCOVA uses). */
  poolSize: { programme?: number; comparison?: number };
  /** Reliability the corrected ANCOVA assumes for the pretest. */
  assumedReliability?: number;
}

/**
 * The CovariateCheckInput of a plan that passed its field rules.
 * @param plan a plan. @param m its one-pretest model parameters (for the SEM).
 * @returns the check input. @throws never.
 * @example covariateCheckInput(demoPlan(), deriveModelParameters(demoPlan())).covariates // []
 */
export function covariateCheckInput(plan: Plan, m: ModelParameters): CovariateCheckInput {
  return {
    covariates: (plan.covariates ?? []).map((c) => ({ ...c })),
    correlations: plan.covariateCorrelations,
    pretestSD: { programme: plan.groups.programme.pretestSD, comparison: plan.groups.comparison.pretestSD },
    sem: m.sem,
    prePostCorrelation: plan.outcome.prePostCorrelation,
    poolSize: { programme: plan.groups.programme.poolSize, comparison: plan.groups.comparison.poolSize },
    assumedReliability: plan.analysis.assumedReliability,
  };
}

/**
 * Every problem with a plan's covariates that involves several fields, at once
 * (each field's own type and range are planSchema's job):
 * - the correlation matrix is missing, has the wrong shape (it must be
 *   (1 + k) × (1 + k), pretest first), is not symmetric, or has a diagonal
 *   entry other than 1;
 * - the observed correlations are impossible together (not positive definite);
 * - the reliabilities are too low for the observed correlations (the
 *   true-score covariance Sigma_T = Sigma_X − diag(SEM²) is not positive
 *   definite: a correlation corrected for attenuation would pass 1);
 * - the outcome correlations are too high for the reliabilities (residual
 *   outcome variance posttestSD² − beta' Sigma_T beta ≤ 0);
 * - an exact covariate with reliability below 1, or one that is not measured;
 * - two covariates with the same name, or one named like the pretest;
 * - the corrected ANCOVA's assumed reliabilities make its own true-score
 *   covariance matrix not positive definite.
 * Each message names the covariates involved: the smallest set of variables
 * whose matrix already fails (all subsets are searched, smallest first; at
 * most 2⁹ of them).
 *
 * Reference: positive definiteness of correlation and covariance matrices
 * (common practice); Spearman (1904) correction for attenuation; the bounds on
 * a third correlation given two others, r12·r13 ± sqrt((1 − r12²)(1 − r13²))
 * (common practice, from the 3 × 3 determinant).
 *
 * @param input see CovariateCheckInput.
 * @returns problems with dotted field paths ("covariateCorrelations.0.1",
 *   "covariates.1.reliability", …); empty when all is well. Never throws.
 * @example a 3 × 3 matrix with r12 = .9, r13 = .9, r23 = 0 → one problem: impossible together
 */
export function covariateModelProblems(input: CovariateCheckInput): PlanProblem[] {
  const out: PlanProblem[] = [];
  const covs = input.covariates;
  const k = covs.length;
  const p = k + 1;
  const name = (i: number): string => {
    const given = i === 0 ? undefined : covs[i - 1]?.name;
    return i === 0 ? 'the pretest' : given === undefined ? `covariate ${i}` : showControlCharacters(given);
  };
  const Name = (i: number): string => capitalise(name(i));
  const list = (idx: number[]): string => joinNames(idx.map(name));

  // Each covariate on its own terms: exact needs measured and error-free; names distinct.
  const seen = new Map<string, number>();
  covs.forEach((c, j) => {
    const label = `Covariate ${j + 1}${c.name !== undefined ? ` (${showControlCharacters(c.name)})` : ''}`;
    if (c.exact === true && c.measured === false) {
      out.push({
        field: `covariates.${j}.exact`,
        message: `${label} is marked exact but not measured: a covariate that is never observed cannot be matched exactly. Mark it measured, or clear "exact".`,
      });
    }
    if (c.exact === true && c.measured !== false && c.reliability !== undefined && c.reliability < 1) {
      out.push({
        field: `covariates.${j}.reliability`,
        message: `${label} is matched exactly, so it must be recorded without error: its reliability must be 1; got ${formatApart(1, c.reliability)[1]}.`,
      });
    }
    if (c.name !== undefined) {
      const key = c.name.trim().toLowerCase();
      if (key === 'pretest') {
        out.push({
          field: `covariates.${j}.name`,
          message: `Covariate ${j + 1} name must differ from "Pretest", the name Meanward gives the pretest; got ${showControlCharacters(JSON.stringify(c.name), 'json')}.`,
        });
      }
      const first = seen.get(key);
      if (first !== undefined) {
        out.push({
          field: `covariates.${j}.name`,
          message: `Covariate names must differ: covariates ${first + 1} and ${j + 1} are both called ${showControlCharacters(JSON.stringify(c.name), 'json')}.`,
        });
      } else seen.set(key, j);
    }
  });

  // The matrix: present, square (1 + k), symmetric, ones on the diagonal.
  const R = input.correlations;
  const order = `${list(range(p))}, in that order`;
  if (R === undefined) {
    if (k > 0) {
      out.push({
        field: 'covariateCorrelations',
        message: `The covariate correlation matrix is missing: with ${k} covariate${k === 1 ? '' : 's'}, give a ${p} × ${p} matrix of observed within-group correlations (${order}).`,
      });
    }
    return out;
  }
  if (R === null) return out;
  if (R.length !== p) {
    out.push({
      field: 'covariateCorrelations',
      message:
        k === 0
          ? `The covariate correlation matrix must be 1 × 1 (the pretest alone), since no covariates are listed; got ${R.length} rows.`
          : `The covariate correlation matrix must be ${p} × ${p} (${order}); got ${R.length} row${R.length === 1 ? '' : 's'}.`,
    });
    return out;
  }
  let shapeOk = true;
  R.forEach((row, i) => {
    if (row.length !== p) {
      shapeOk = false;
      out.push({
        field: `covariateCorrelations.${i}`,
        message: `Row ${i + 1} of the covariate correlation matrix (${name(i)}) must have ${p} numbers, one per variable (${order}); got ${row.length}.`,
      });
    }
  });
  if (!shapeOk) return out;
  let entriesOk = true;
  for (let i = 0; i < p; i++) {
    const d = R[i]![i]!;
    if (Math.abs(d - 1) > 1e-12) {
      entriesOk = false;
      out.push({
        field: `covariateCorrelations.${i}.${i}`,
        message: `The correlation of ${name(i)} with itself (row ${i + 1}, column ${i + 1}) must be 1; got ${formatApart(1, d)[1]}.`,
      });
    }
    for (let j = i + 1; j < p; j++) {
      const a = R[i]![j]!;
      const b = R[j]![i]!;
      if (Math.abs(a - b) > 1e-9) {
        entriesOk = false;
        out.push({
          field: `covariateCorrelations.${i}.${j}`,
          message: `The correlation between ${name(i)} and ${name(j)} must be the same in row ${i + 1}, column ${j + 1} and in row ${j + 1}, column ${i + 1}; got ${formatApart(a, b).join(' and ')}.`,
        });
      }
    }
  }
  if (!entriesOk || k === 0) return out;
  const corr = R.map((row, i) => row.map((x, j) => (j >= i ? x : R[j]![i]!)));

  // Observed correlations possible together?
  const observedBad = smallestFailingSet(p, (s) => !isPositiveDefinite(block(corr, s, s)));
  if (observedBad) {
    out.push({ field: matrixField(observedBad), message: impossibleObservedMessage(observedBad, corr, name) });
    return out;
  }

  // True-score covariances: reliability on the diagonal of the correlation matrix
  // (Sigma_T,g = D_g R_rho D_g). The group with the lower pretest reliability binds.
  const sem = input.sem;
  const sds = [input.pretestSD.programme, input.pretestSD.comparison].filter((x): x is number => x !== undefined);
  const rels = covs.map((c) => c.reliability);
  if (sem === undefined || sds.length < 2 || sds.some((sd) => !(sem < sd)) || rels.some((r) => r === undefined)) return out;
  const rhoPretest = { programme: 1 - (sem / input.pretestSD.programme!) ** 2, comparison: 1 - (sem / input.pretestSD.comparison!) ** 2 };
  const lowerGroup = rhoPretest.programme < rhoPretest.comparison ? 'programme' : 'comparison';
  const withDiagonal = (d: number[]): number[][] => corr.map((row, i) => row.map((x, j) => (i === j ? d[i]! : x)));
  const relLow = [rhoPretest[lowerGroup], ...(rels as number[])];
  const trueBad = smallestFailingSet(p, (s) => !isPositiveDefinite(block(withDiagonal(relLow), s, s)));
  if (trueBad) {
    const groupNote =
      trueBad.includes(0) && Math.abs(rhoPretest.programme - rhoPretest.comparison) > 1e-12
        ? ` (the pretest's within-group reliability in the ${lowerGroup} group)`
        : '';
    out.push({ field: matrixField(trueBad), message: tooUnreliableMessage(trueBad, corr, relLow, name, list, groupNote) });
    return out;
  }

  // The outcome: residual variance posttestSD²·(1 − r' R_rho^-1 r) must stay above 0 (comparison group).
  const r0 = input.prePostCorrelation;
  const rOut = covs.map((c) => c.outcomeCorrelation);
  const relC = [rhoPretest.comparison, ...(rels as number[])];
  if (r0 !== undefined && r0 * r0 <= relC[0]! + 1e-12 && rOut.every((r) => r !== undefined)) {
    const r = [r0, ...(rOut as number[])];
    const RC = withDiagonal(relC);
    const explained = (s: number[]): number => dot(pick(r, s), solvePositiveDefinite(block(RC, s, s), pick(r, s)));
    const outcomeBad = smallestFailingSet(p, (s) => explained(s) >= 1 - 1e-12, 1);
    if (outcomeBad) {
      const last = outcomeBad[outcomeBad.length - 1]!;
      out.push({
        field: last === 0 ? 'outcome.prePostCorrelation' : `covariates.${last - 1}.outcomeCorrelation`,
        message: outcomeTooHighMessage(outcomeBad, r, relC, name, Name, list, explained(outcomeBad)),
      });
    }
  }

  // The corrected ANCOVA's own true-score matrix: pooled observed covariances
  // of the measured variables with the assumed reliabilities on the diagonal.
  const rhoA = input.assumedReliability;
  const nP = input.poolSize.programme;
  const nC = input.poolSize.comparison;
  const measuredOk = covs.every((c) => c.measured !== undefined);
  if (rhoA !== undefined && nP !== undefined && nC !== undefined && measuredOk) {
    const sP = input.pretestSD.programme!;
    const sC = input.pretestSD.comparison!;
    const shrink = (nP * sP + nC * sC) / (nP + nC) / Math.sqrt((nP * sP * sP + nC * sC * sC) / (nP + nC));
    // Pooled covariance in correlation form: the pretest's covariances shrink by
    // mean(SD_g) / sqrt(mean(SD_g²)) (pool-size weights); the diagonal holds the assumed reliabilities.
    const assumed = [rhoA, ...(rels as number[])];
    const analyst = corr.map((row, i) => row.map((x, j) => (i === j ? assumed[i]! : i === 0 || j === 0 ? x * shrink : x)));
    const m = range(p).filter((i) => i === 0 || covs[i - 1]!.measured === true);
    const analystBad = smallestFailingSet(m.length, (s) => {
      const idx = s.map((t) => m[t]!);
      return !isPositiveDefinite(block(analyst, idx, idx));
    });
    if (analystBad && analystBad.includes(0)) {
      const idx = analystBad.map((t) => m[t]!);
      out.push({
        field: 'analysis.assumedReliability',
        message:
          `The reliability-corrected ANCOVA cannot use an assumed pretest reliability of ${fmt(rhoA)}: with ` +
          `${joinNames(idx.slice(1).map((i) => `${name(i)}'s reliability (${fmt(assumed[i]!)})`))}, the observed ` +
          (idx.length === 2
            ? `correlation between ${list(idx)} would pass 1 once corrected for measurement error. `
            : `correlations among ${list(idx)} would be impossible together once corrected for measurement error. `) +
          'Raise the assumed reliability.',
      });
    }
  }
  return out;
}

/**
 * The smallest set of variable indices (size ≥ minSize, then in index order)
 * for which `fails` is true; null when none fails. Exhaustive over 2^p subsets.
 */
/**
 * The field a correlation problem belongs to: the one cell when two variables
 * are involved (so the editor can mark it), else the matrix as a whole.
 */
function matrixField(set: number[]): string {
  if (set.length !== 2) return 'covariateCorrelations';
  const [i, j] = [Math.min(set[0] as number, set[1] as number), Math.max(set[0] as number, set[1] as number)];
  return `covariateCorrelations.${i}.${j}`;
}

function smallestFailingSet(p: number, fails: (s: number[]) => boolean, minSize = 2): number[] | null {
  const sets: number[][] = [];
  for (let mask = 1; mask < 1 << p; mask++) {
    const s = range(p).filter((i) => (mask >> i) & 1);
    if (s.length >= minSize) sets.push(s);
  }
  sets.sort((a, b) => a.length - b.length || compareLex(a, b));
  for (const s of sets) if (fails(s)) return s;
  return null;
}

function compareLex(a: number[], b: number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i]! - b[i]!;
  return 0;
}

function impossibleObservedMessage(s: number[], R: number[][], name: (i: number) => string): string {
  if (s.length === 2) {
    const [a, b] = s as [number, number];
    return (
      `The correlation between ${name(a)} and ${name(b)} is ${formatApart(1, Math.abs(R[a]![b]!), R[a]![b]!)[2]}: two different variables cannot be perfectly ` +
      'correlated within groups (one would merely repeat the other). Drop one of them or check the value.'
    );
  }
  const head =
    `The correlations among ${joinNames(s.map(name))} are impossible together: no group of people could show all of them at once ` +
    '(the correlation matrix is not positive definite).';
  if (s.length === 3) {
    const [a, b, c] = s as [number, number, number];
    const rab = R[a]![b]!;
    const rac = R[a]![c]!;
    const half = Math.sqrt((1 - rab * rab) * (1 - rac * rac));
    const [low, high, got] = formatApart(rab * rac - half, rab * rac + half, R[b]![c]!);
    return (
      `${head} Given the other two, the correlation between ${name(b)} and ${name(c)} must lie between ` +
      `${low} and ${high}; got ${got}.`
    );
  }
  return `${head} Every smaller set of them is possible, so check these correlations together.`;
}

function tooUnreliableMessage(
  s: number[],
  R: number[][],
  rel: number[],
  name: (i: number) => string,
  list: (idx: number[]) => string,
  groupNote: string,
): string {
  const reliabilities = joinNames(s.map((i) => `${name(i)} ${fmt(rel[i]!)}${i === 0 ? groupNote : ''}`));
  if (s.length === 2) {
    const [a, b] = s as [number, number];
    const r = R[a]![b]!;
    return (
      `The observed correlation between ${name(a)} and ${name(b)} (${fmt(r)}) is too high for their reliabilities ` +
      `(${reliabilities}): corrected for measurement error it would be ${formatApart(1, Math.abs(r / Math.sqrt(rel[a]! * rel[b]!)), r / Math.sqrt(rel[a]! * rel[b]!))[2]}, beyond 1 in size. ` +
      'Raise the reliabilities or check the correlation.'
    );
  }
  return (
    `The observed correlations among ${list(s)} are too high for their reliabilities (${reliabilities}): corrected ` +
    'for measurement error they are impossible together (the true-score covariance matrix is not positive definite). ' +
    'Raise the reliabilities or check the correlations.'
  );
}

function outcomeTooHighMessage(
  s: number[],
  r: number[],
  rel: number[],
  name: (i: number) => string,
  Name: (i: number) => string,
  list: (idx: number[]) => string,
  explained: number,
): string {
  if (s.length === 1) {
    const i = s[0]!;
    const [got, , limit] = formatApart(r[i]!, Math.abs(r[i]!), Math.sqrt(rel[i]!));
    return (
      `${Name(i)}'s correlation with the outcome (${got}) is too high for its reliability (${fmt(rel[i]!)}): ` +
      `an observed correlation cannot exceed the square root of the reliability (${limit}) in size.`
    );
  }
  return (
    `Together, the correlations of ${list(s)} with the outcome (${joinNames(s.map((i) => fmt(r[i]!)))}) are too high for their ` +
    `reliabilities (${joinNames(s.map((i) => fmt(rel[i]!)))}) and their correlations with each other: their true scores would ` +
    `explain ${Math.round(explained * 100)}% of the outcome's variance, and it must stay below 100%. Lower one of these ` +
    'correlations, or check the reliabilities.'
  );
}

/** "a", "a and b", "a, b and c". */
export function joinNames(names: string[]): string {
  if (names.length <= 1) return names[0] ?? '';
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

function capitalise(s: string): string {
  return s.length === 0 ? s : s[0]!.toUpperCase() + s.slice(1);
}

const fmt = formatNumber;
