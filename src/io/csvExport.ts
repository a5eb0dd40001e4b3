import Papa from 'papaparse';
import { presentAnalysisIds } from '../core/presentAnalyses';
import type { AnalysisId } from '../core/plan';
import type { SimulationResult } from '../sim/types';

/**
 * Neutralise a text cell that a spreadsheet would run as a formula: a cell
 * beginning with =, +, -, @, a tab or a carriage return gets a leading
 * apostrophe (OWASP "CSV injection" guidance; common practice). Only for text
 * cells such as labels and titles: numbers are written as numbers.
 * @example neutraliseCsvText('=HYPERLINK("x")') === '\'=HYPERLINK("x")'
 */
export function neutraliseCsvText(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

/** Column names of the estimates file, by analysis. */
export const ESTIMATE_COLUMNS: Record<AnalysisId, string> = {
  matchedDifference: 'matched_difference',
  ancova: 'ancova_observed_pretest',
  gainScore: 'gain_score',
  correctedAncova: 'reliability_corrected_ancova',
  regressionDiscontinuity: 'regression_discontinuity',
  prePostChange: 'pre_post_change',
  personLevelAncova: 'person_level_ancova',
};

/**
 * The per-replication estimates of a simulation as CSV text (RFC 4180 via
 * papaparse): one row per simulated study with its replication number, the
 * seed, each analysis' estimate of the programme effect (posttest points; an
 * empty cell where an analysis could not be computed), and the plan's title.
 * The title is user text and is neutralised; estimates stay numeric, so
 * "-1.23" is a number, not a formula.
 */
export function estimatesCsv(sim: SimulationResult): string {
  const ids = presentAnalysisIds(sim.estimates);
  const n = Math.max(0, ...ids.map((id) => (sim.estimates[id] as number[]).length));
  const title = neutraliseCsvText(sim.plan.title);
  const fields = ['replication', 'seed', ...ids.map((id) => ESTIMATE_COLUMNS[id]), 'plan_title'];
  const data: (string | number)[][] = [];
  for (let i = 0; i < n; i++) {
    const cells: (string | number)[] = [i + 1, sim.seed];
    for (const id of ids) {
      const v = (sim.estimates[id] as number[])[i];
      cells.push(typeof v === 'number' && Number.isFinite(v) ? v : '');
    }
    cells.push(title);
    data.push(cells);
  }
  return Papa.unparse({ fields, data }, { newline: '\r\n', quotes: false, escapeFormulae: false });
}
