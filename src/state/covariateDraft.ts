import type { CovariateSpec, Plan } from '../core/plan';
import { PLAN_LIMITS } from '../core/planSchema';
import { fieldRule } from '../core/validatePlan';

/**
 * The covariates beyond the pretest, as the researcher typed them. Like the
 * rest of the draft, every number is kept as the raw text of its box, so a
 * half-typed or impossible value is never lost. Paths match the plan file:
 * "covariates.1.sd" is the second covariate's SD, "covariateCorrelations.0.2"
 * the correlation of the pretest (index 0) with the second covariate.
 */
export interface CovariateDraft {
  name: string;
  programmeMean: string;
  comparisonMean: string;
  sd: string;
  reliability: string;
  outcomeCorrelation: string;
  measured: boolean;
  exact: boolean;
}

/** The numeric text fields of a covariate, in the order the form shows them. */
export const COVARIATE_NUMBER_FIELDS = ['programmeMean', 'comparisonMean', 'sd', 'reliability', 'outcomeCorrelation'] as const;
export type CovariateNumberField = (typeof COVARIATE_NUMBER_FIELDS)[number];

/** What the covariate part of a draft holds. The matrix is (1 + k) × (1 + k), pretest first, as typed. */
export interface CovariatesPart {
  covariates: CovariateDraft[];
  covariateCorrelations: string[][];
}

const str = (v: number | undefined): string => (v === undefined || !Number.isFinite(v) ? '' : String(v));

/** Name shown for matrix row/column i (0 = the pretest). */
export function matrixName(covariates: readonly CovariateDraft[], i: number): string {
  if (i === 0) return 'Pretest';
  const c = covariates[i - 1];
  const name = c?.name.trim();
  return name ? name : `Covariate ${i}`;
}

/** The draft text of a plan's covariates and their correlation matrix (numbers printed in full). */
export function covariatesToDraft(plan: Pick<Plan, 'covariates' | 'covariateCorrelations'>): CovariatesPart {
  const covariates: CovariateDraft[] = (plan.covariates ?? []).map((c: CovariateSpec) => ({
    name: c.name,
    programmeMean: str(c.programmeMean),
    comparisonMean: str(c.comparisonMean),
    sd: str(c.sd),
    reliability: str(c.reliability),
    outcomeCorrelation: str(c.outcomeCorrelation),
    measured: c.measured,
    exact: c.exact,
  }));
  const n = covariates.length + 1;
  const given = plan.covariateCorrelations;
  const covariateCorrelations = Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => (i === j ? '1' : str(given?.[i]?.[j]))),
  );
  return { covariates, covariateCorrelations };
}

/**
 * A new covariate that changes nothing until the researcher fills it in: no
 * group difference, SD 1, measured without error, uncorrelated with the
 * outcome. Its name is "Covariate n", the first n not already used.
 */
export function newCovariateDraft(existing: readonly CovariateDraft[]): CovariateDraft {
  const used = new Set(existing.map((c) => c.name.trim().toLowerCase()));
  let n = existing.length + 1;
  while (used.has(`covariate ${n}`)) n += 1;
  return {
    name: `Covariate ${n}`,
    programmeMean: '0',
    comparisonMean: '0',
    sd: '1',
    reliability: '1',
    outcomeCorrelation: '0',
    measured: true,
    exact: false,
  };
}

/** The matrix resized to (1 + k) × (1 + k): kept cells as typed, ones on the diagonal, new cells empty. */
function squareMatrix(m: readonly (readonly string[])[] | undefined, n: number): string[][] {
  return Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => (i === j ? '1' : typeof m?.[i]?.[j] === 'string' ? m[i]![j]! : '')),
  );
}

/**
 * Add a covariate at the end. Its row and column of the matrix start at 0
 * (uncorrelated), so the plan stays valid and its results unchanged.
 * @throws Error when the plan already has the most covariates allowed.
 */
export function addCovariate<D extends CovariatesPart>(draft: D): D {
  if (draft.covariates.length >= PLAN_LIMITS.covariatesMax) {
    throw new Error(`A plan can have at most ${PLAN_LIMITS.covariatesMax} covariates besides the pretest.`);
  }
  const covariates = [...draft.covariates.map((c) => ({ ...c })), newCovariateDraft(draft.covariates)];
  const n = covariates.length + 1;
  const m = squareMatrix(draft.covariateCorrelations, n);
  for (let i = 0; i < n - 1; i++) {
    m[i]![n - 1] = '0';
    m[n - 1]![i] = '0';
  }
  return { ...draft, covariates, covariateCorrelations: m };
}

function checkIndex(draft: CovariatesPart, index: number): void {
  if (!Number.isInteger(index) || index < 0 || index >= draft.covariates.length) {
    throw new Error(`There is no covariate number ${index + 1}; the plan has ${draft.covariates.length}.`);
  }
}

/**
 * Remove covariate `index` (0-based in the covariate list) and its row and
 * column of the matrix (row index + 1, the pretest being row 0).
 * @throws Error for an index outside the list.
 */
export function removeCovariate<D extends CovariatesPart>(draft: D, index: number): D {
  checkIndex(draft, index);
  const drop = index + 1;
  const covariates = draft.covariates.filter((_, i) => i !== index).map((c) => ({ ...c }));
  const m = squareMatrix(draft.covariateCorrelations, draft.covariates.length + 1)
    .filter((_, i) => i !== drop)
    .map((row) => row.filter((_, j) => j !== drop));
  return { ...draft, covariates, covariateCorrelations: m };
}

/**
 * Move covariate `index` one place up (-1) or down (+1). The matrix's rows
 * and columns move with it, so every correlation stays with its pair of
 * variables. The pretest always stays first. Moving past either end is a no-op.
 * @throws Error for an index outside the list.
 */
export function moveCovariate<D extends CovariatesPart>(draft: D, index: number, step: -1 | 1): D {
  checkIndex(draft, index);
  const to = index + step;
  if (to < 0 || to >= draft.covariates.length) return draft;
  const order = draft.covariates.map((_, i) => i);
  order[index] = to;
  order[to] = index;
  const covariates = order.map((i) => ({ ...draft.covariates[i]! }));
  // Matrix permutation: new row r is old row perm[r], pretest fixed at 0.
  const perm = [0, ...order.map((i) => i + 1)];
  const old = squareMatrix(draft.covariateCorrelations, draft.covariates.length + 1);
  const m = perm.map((pi) => perm.map((pj) => old[pi]![pj]!));
  return { ...draft, covariates, covariateCorrelations: m };
}

/**
 * Set the correlation of variables i and j (matrix indices, 0 = pretest) as
 * typed; the mirror cell (j, i) gets the same text, so the matrix stays
 * symmetric. The diagonal is always 1 and cannot be set.
 * @throws Error for an index outside the matrix or a diagonal cell.
 */
export function setCorrelationText<D extends CovariatesPart>(draft: D, i: number, j: number, text: string): D {
  const n = draft.covariates.length + 1;
  for (const v of [i, j]) {
    if (!Number.isInteger(v) || v < 0 || v >= n) throw new Error(`The correlation matrix has rows 0 to ${n - 1}; got ${v}.`);
  }
  if (i === j) throw new Error('The diagonal of a correlation matrix is always 1 and cannot be changed.');
  const m = squareMatrix(draft.covariateCorrelations, n);
  m[i]![j] = text;
  m[j]![i] = text;
  return { ...draft, covariateCorrelations: m };
}

/** The canonical path of a matrix cell (upper triangle: i < j), so (i, j) and (j, i) count as one field. */
export function correlationPath(i: number, j: number): string {
  return `covariateCorrelations.${Math.min(i, j)}.${Math.max(i, j)}`;
}

/**
 * The canonical form of a problem's field path: a lower-triangle matrix cell
 * "covariateCorrelations.2.0" becomes "covariateCorrelations.0.2"; any other
 * path is returned unchanged. Used to keep one message per correlation.
 */
export function canonicalField(field: string): string {
  const m = /^covariateCorrelations\.(\d+)\.(\d+)$/.exec(field);
  return m ? correlationPath(Number(m[1]), Number(m[2])) : field;
}

/** The matrix cell [i, j] a problem's field names, or null when it names no single cell. */
export function cellOfField(field: string): [number, number] | null {
  const m = /^covariateCorrelations\.(\d+)\.(\d+)$/.exec(field);
  if (!m) return null;
  const i = Number(m[1]);
  const j = Number(m[2]);
  return i <= j ? [i, j] : [j, i];
}

const NUMBER_LABEL: Record<CovariateNumberField, string> = {
  programmeMean: 'programme mean',
  comparisonMean: 'comparison mean',
  sd: 'SD',
  reliability: 'reliability',
  outcomeCorrelation: 'correlation with the outcome',
};

/**
 * A plain name for a covariate field or matrix cell, for messages and the
 * list of problems: "Covariate 2 (Attendance) SD", "Correlation of Pretest
 * and Attendance". Returns undefined for paths outside the covariate part.
 */
export function covariateFieldLabel(field: string, covariates: readonly CovariateDraft[]): string | undefined {
  const cell = cellOfField(field);
  if (cell) {
    return `Correlation of ${matrixName(covariates, cell[0])} and ${matrixName(covariates, cell[1])}`;
  }
  const m = /^covariates\.(\d+)(?:\.(\w+))?$/.exec(field);
  if (!m) {
    if (field === 'covariateCorrelations') return 'Covariate correlation matrix';
    if (field === 'covariates') return 'Covariates';
    const row = /^covariateCorrelations\.(\d+)$/.exec(field);
    return row ? `Row for ${matrixName(covariates, Number(row[1]))} in the correlation matrix` : undefined;
  }
  const index = Number(m[1]);
  const name = covariates[index]?.name.trim();
  const plain = `Covariate ${index + 1}`;
  const who = name && name.toLowerCase() !== plain.toLowerCase() ? `${plain} (${name})` : plain;
  const key = m[2];
  if (key === undefined) return who;
  if (key in NUMBER_LABEL) return `${who} ${NUMBER_LABEL[key as CovariateNumberField]}`;
  if (key === 'name') return `${who} name`;
  if (key === 'measured') return `${who} "measured"`;
  if (key === 'exact') return `${who} "exact"`;
  return fieldRule(field)?.label ?? who;
}

/** A number read from a box, or the problem with it (see planDraft.readNumber). */
type ReadNumber = (field: string, raw: string, name: string) => number | undefined;

/**
 * The covariate part of a candidate plan: nothing when there are no
 * covariates (so a plan without them is exactly as before), else the list
 * and the symmetric matrix read from its upper triangle. A cell whose text
 * is not a number is left out (undefined) in both mirror positions; the
 * reader records its problem under the upper-triangle path.
 */
export function covariatesToCandidate(
  part: CovariatesPart,
  read: ReadNumber,
): { covariates?: unknown[]; covariateCorrelations?: unknown[][] } {
  if (part.covariates.length === 0) return {};
  const covariates = part.covariates.map((c, i) => {
    const out: Record<string, unknown> = { name: c.name, measured: c.measured, exact: c.exact };
    for (const f of COVARIATE_NUMBER_FIELDS) {
      const path = `covariates.${i}.${f}`;
      out[f] = read(path, c[f], covariateFieldLabel(path, part.covariates) ?? path);
    }
    return out;
  });
  const n = part.covariates.length + 1;
  const m = squareMatrix(part.covariateCorrelations, n);
  const matrix: unknown[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : undefined)));
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const path = correlationPath(i, j);
      const v = read(path, m[i]![j]!, covariateFieldLabel(path, part.covariates) ?? path);
      matrix[i]![j] = v;
      matrix[j]![i] = v;
    }
  }
  return { covariates, covariateCorrelations: matrix };
}

/** Whether a stored value looks like the covariate part of a draft (restoring an autosave). */
export function isCovariatesPart(x: unknown): x is CovariatesPart {
  if (typeof x !== 'object' || x === null) return false;
  const d = x as Record<string, unknown>;
  if (!Array.isArray(d.covariates) || !Array.isArray(d.covariateCorrelations)) return false;
  for (const c of d.covariates as unknown[]) {
    if (typeof c !== 'object' || c === null) return false;
    const r = c as Record<string, unknown>;
    if (typeof r.name !== 'string' || typeof r.measured !== 'boolean' || typeof r.exact !== 'boolean') return false;
    for (const f of COVARIATE_NUMBER_FIELDS) if (typeof r[f] !== 'string') return false;
  }
  const n = d.covariates.length + 1;
  const m = d.covariateCorrelations as unknown[];
  return m.length === n && m.every((row) => Array.isArray(row) && row.length === n && row.every((v) => typeof v === 'string'));
}
