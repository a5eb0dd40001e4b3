import type { AnalysisId, Plan } from '../plan';
import type { ExploreCell, ExploreCellSummary, ExploreResult, ExploreSpec } from './exploreTypes';
import { analysePlan } from '../analysePlan';
import { analysisSettings } from '../analysisSettings';
import { judgeTolerable } from '../judgeTolerable';
import { shareOfEffect } from '../shareOfEffect';
import { validatePlan } from '../validatePlan';
import { formatNumber } from '../inputChecks';
import { axisValues } from './exploreSpec';
import { exploreInputWords, withExploreInput } from './exploreInputs';

/**
 * The grid of an exploration, row-major (axis 0 varies slowest): each cell's
 * values, its variant plan (the inputs set by withExploreInput, then checked
 * again by validatePlan, which also derives a selection plan's groups) and
 * the closed form's regression artefact as a share of the effect for the
 * spec's analysis (analysePlan's own regressionArtefactShare: formula basis,
 * i.e. unlimited pools and exact matching for the matched difference). An
 * impossible variant keeps plan null and the first problems in plain words.
 * Reference: closed forms of src/core (Thorndike 1942; Lord 1960; Porter 1967).
 * @param plan a validated plan. @param spec a spec validateExploreSpec accepts.
 * @param options closedForms: false leaves closedFormShare out (fill it with withExploreClosedForm).
 * @returns one cell per combination of axis values. @throws never.
 * @example exploreCells(demoPlan(), spec).length // steps0 × steps1
 */
export function exploreCells(plan: Plan, spec: ExploreSpec, options: { closedForms?: boolean } = {}): ExploreCell[] {
  const grids = spec.axes.map((axis) => axisValues(plan, axis));
  const combos: number[][] = grids.length === 1 ? grids[0]!.map((v) => [v]) : grids[0]!.flatMap((a) => grids[1]!.map((b) => [a, b]));
  return combos.map((values, index) => {
    let variant = plan;
    spec.axes.forEach((axis, k) => {
      variant = withExploreInput(variant, axis.input, values[k]!);
    });
    const check = validatePlan(variant);
    if (!check.ok) {
      return { index, values, plan: null, problem: check.problems.slice(0, 2).map((p) => p.message).join(' ') };
    }
    const cell: ExploreCell = { index, values, plan: check.plan };
    return options.closedForms === false ? cell : withExploreClosedForm(cell, spec);
  });
}

/**
 * A cell with its closed-form share filled in: analysePlan(variant)'s own
 * regressionArtefactShare for the spec's analysis. analysePlan takes some
 * milliseconds per plan, so a page may build the grid with
 * `exploreCells(plan, spec, { closedForms: false })` and fill the cells in
 * with this one at a time. A variant analysePlan refuses becomes impossible,
 * with its message. Cells without a plan come back unchanged.
 */
export function withExploreClosedForm(cell: ExploreCell, spec: ExploreSpec): ExploreCell {
  if (cell.plan === null) return cell;
  const { index, values } = cell;
  try {
    const record = analysePlan(cell.plan).analyses[spec.analysisId];
    if (record === undefined) return { index, values, plan: null, problem: `This variant has no analysis "${spec.analysisId}".` };
    const share = record.regressionArtefactShare;
    return share === null ? { index, values, plan: cell.plan } : { index, values, plan: cell.plan, closedFormShare: share };
  } catch (e) {
    return { index, values, plan: null, problem: e instanceof Error ? e.message : String(e) };
  }
}

/** The closed-form caution of a simulated cell's tolerance: what the simulation at the hoped-for effect cannot check. */
export const EXPLORE_TOLERANCE_NOTE =
  'Judged on the simulated artefact only: the cell is simulated at the hoped-for effect, so its false-positive rate (which needs a run with no effect) ' +
  'and the drop in power (which needs a run without the artefact) are not simulated here; see the closed form of that variant for them.';

/**
 * The parts of a simulation result (src/sim's SimulationResult) a cell's
 * summary reads, as plain data: core stays free of the engine, and a
 * SimulationResult fits this shape as it is.
 */
export interface ExploreSimulatedFigures {
  tau: number;
  analyses: Partial<
    Record<
      AnalysisId,
      | { feasible?: true; meanEstimate: number; meanEstimateMCSE: number; rejectionRate: number; rejectionRateMCSE: number; wrongSignRate?: number; wrongSignRateMCSE?: number }
      | { feasible: false; reason: string }
    >
  >;
  matching: { discardedProgrammeShare: number };
}

/** A cell before its simulation: 'pending', or 'impossible' when its variant plan is not valid. */
export function pendingCellSummary(cell: ExploreCell): ExploreCellSummary {
  return { ...cell, status: cell.plan === null ? 'impossible' : 'pending' };
}

/** A cell whose simulation failed (the engine's message, or the analysis could not be computed). */
export function failedCellSummary(cell: ExploreCell, message: string): ExploreCellSummary {
  return { ...cell, status: 'failed', failure: message };
}

/**
 * One cell's simulated figures, from its SimulationResult (src/sim) for the
 * spec's analysis:
 *  - artefact = mean estimate − tau − the assumed growth gap (the regression
 *    artefact: the engine adds the growth gap exactly, and the verdicts judge
 *    the artefact without it; see docs/verdicts.md), with MC SE = meanEstimateMCSE;
 *  - artefactShare = artefact ÷ tau (shareOfEffect), MC SE = MCSE ÷ |tau|;
 *  - discardedShare = the programme pool's discarded share from
 *    result.matching for the matched difference, 0 for analyses of the full
 *    pools (nobody is discarded);
 *  - power = the rejection rate with its MC SE;
 *  - tolerable by judgeTolerable on the simulated artefact and the plan's
 *    tolerable share; the false-positive rate and the power drop are passed
 *    as unknown (null) and EXPLORE_TOLERANCE_NOTE says so in tolerableReason.
 * An analysis the simulation could not compute gives status 'failed' with its reason.
 * Reference: Morris, White & Crowther (2019), Table 6 (Monte Carlo SEs of bias and rejection rates).
 * @param cell a cell with a valid plan. @param result its simulation. @param spec the exploration.
 * @returns the summary with status 'done' (or 'failed').
 * @throws never for a cell with a plan (a cell without one comes back 'impossible').
 */
export function summariseExploreCell(cell: ExploreCell, result: ExploreSimulatedFigures, spec: ExploreSpec): ExploreCellSummary {
  if (cell.plan === null) return pendingCellSummary(cell);
  const a = result.analyses[spec.analysisId];
  if (a === undefined) return failedCellSummary(cell, `The simulation has no analysis "${spec.analysisId}".`);
  if (a.feasible === false) return failedCellSummary(cell, a.reason);
  const s = analysisSettings(cell.plan, 0);
  const tau = result.tau;
  const artefact = a.meanEstimate - tau - (s.growthGap ?? 0);
  const artefactMCSE = a.meanEstimateMCSE;
  const share = shareOfEffect(artefact, tau);
  const judged = judgeTolerable({
    tau,
    regressionArtefact: artefact,
    tolerableShare: s.tolerableBiasShare,
    alpha: s.alpha,
    falsePositiveRate: null,
    power: a.rejectionRate,
    powerWithoutBias: null,
    whyRatesUnknown: '', // EXPLORE_TOLERANCE_NOTE below says why, in this context
  });
  const discardedShare = spec.analysisId === 'matchedDifference' ? result.matching.discardedProgrammeShare : 0;
  return {
    ...cell,
    status: 'done',
    artefact,
    artefactMCSE,
    ...(share === null ? {} : { artefactShare: share, artefactShareMCSE: artefactMCSE / Math.abs(tau) }),
    discardedShare,
    power: a.rejectionRate,
    powerMCSE: a.rejectionRateMCSE,
    ...(a.wrongSignRate === undefined ? {} : { wrongSignRate: a.wrongSignRate, wrongSignRateMCSE: a.wrongSignRateMCSE ?? 0 }),
    tolerable: judged.tolerable,
    tolerableReason: `${judged.reason} ${EXPLORE_TOLERANCE_NOTE}`,
  };
}

/** The whole exploration: the base plan, the spec and the cells (in index order). */
export function exploreResult(plan: Plan, spec: ExploreSpec, cells: ExploreCellSummary[]): ExploreResult {
  return { plan, spec, cells: [...cells].sort((a, b) => a.index - b.index) };
}

/** A value for a name or a label: whole numbers as is, others to at most 3 decimals, at least 2. */
export function formatExploreValue(x: number): string {
  if (Number.isInteger(x)) return String(x);
  const s = formatNumber(x);
  const dot = s.indexOf('.');
  return dot >= 0 && s.length - dot - 1 < 2 ? x.toFixed(2) : s;
}

/**
 * The name of a candidate plan made from a cell, e.g. "Explorer: reliability 0.80, caliper 0.20".
 * @example exploreVariantName(spec, { values: [0.8, 0.2] }) // "Explorer: reliability 0.80, caliper 0.20"
 */
export function exploreVariantName(spec: ExploreSpec, cell: Pick<ExploreCell, 'values'>): string {
  const parts = spec.axes.map((axis, k) => `${exploreInputWords(axis.input).shortLabel} ${formatExploreValue(cell.values[k]!)}`);
  return `Explorer: ${parts.join(', ')}`;
}

/**
 * The tolerable region: the indices of the cells whose simulated artefact is
 * tolerable, and of those not (cells without figures in neither).
 */
export function tolerableRegion(result: ExploreResult): { tolerable: number[]; notTolerable: number[] } {
  const done = result.cells.filter((c) => c.status === 'done' && c.tolerable !== undefined);
  return {
    tolerable: done.filter((c) => c.tolerable === true).map((c) => c.index),
    notTolerable: done.filter((c) => c.tolerable === false).map((c) => c.index),
  };
}
