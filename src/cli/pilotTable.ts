import { pilotReliabilityOptions } from '../pilot/pilotPlanUpdate';
import type { PilotEstimates } from '../pilot/types';
import { fmtPoints, fmtReliability, PLANNING_CAUTION } from './formatResultsTable';
import { showControlCharacters as visible } from '../core/visibleText';

/** What the pilot estimates are and are not (shown under the table and in --json). */
export const PILOT_NOTE =
  "Estimates from pilot data, with 95% confidence intervals. Cronbach's alpha is a lower bound to the pretest's reliability " +
  'when the items are not (essentially) tau-equivalent, and the split-half depends on how the test is split. ' +
  'Within-group figures centre each score on its own group\'s mean. The data stay on this machine; a plan keeps only the estimates.';

/**
 * The pilot estimates as a plain-text table for the terminal. Formatting only:
 * every figure comes from estimatePilot (src/pilot).
 * @param est estimates from estimatePilot.
 * @returns text ending in a newline.
 */
export function formatPilotTable(est: PilotEstimates): string {
  const { programme, comparison } = est.groups;
  const programmeValue = est.mapping?.programmeValue;
  const lines: string[] = [];
  lines.push(
    `Pilot file: ${est.fileName === undefined ? '(unnamed)' : visible(est.fileName)}: ${est.rowsRead} rows read, ${est.rowsUsed} used, ${est.rowsDropped} left out.`,
    `  ${est.droppedReason}`,
    '',
  );

  const posttest = programme.nPrePost !== undefined || comparison.nPrePost !== undefined;
  const head = ['', 'n', 'pretest mean', 'pretest SD', ...(posttest ? ['posttest SD', 'pre–post r', 'n (post)'] : [])];
  const row = (label: string, g: typeof programme) => [
    label,
    String(g.n),
    fmtPoints(g.pretestMean),
    fmtPoints(g.pretestSD),
    ...(posttest
      ? [
          g.posttestSD === undefined ? 'n/a' : fmtPoints(g.posttestSD),
          g.prePostCorrelation === undefined ? 'n/a' : fmtReliability(g.prePostCorrelation),
          g.nPrePost === undefined ? 'n/a' : String(g.nPrePost),
        ]
      : []),
  ];
  lines.push(
    ...alignColumns([
      head,
      row(`Programme${programmeValue === undefined ? '' : ` (${visible(programmeValue)})`}`, programme),
      row(`Comparison (${est.groups.comparisonValue})`, comparison),
    ]),
  );
  lines.push(
    `Gap, programme minus comparison: ${fmtPoints(est.gap.points)} points, SMD ${fmtPoints(est.gap.smd)} (pooled within-group SD ${fmtPoints(est.pooledWithinSD)})`,
  );
  if (est.prePostCorrelation) {
    lines.push(`Pre–post correlation, within groups: ${fmtReliability(est.prePostCorrelation.value)} (n = ${est.prePostCorrelation.n})`);
  }
  if (est.prePostByGroup) {
    lines.push(`${est.prePostByGroup.differ ? 'Note: ' : ''}${est.prePostByGroup.message}`);
  }

  const rel = est.reliability;
  const relRows: string[][] = [];
  const ci = (x: { lower: number; upper: number }) => `${fmtReliability(x.lower)} to ${fmtReliability(x.upper)}`;
  if (rel.alpha) {
    relRows.push(["Cronbach's alpha, within groups", fmtReliability(rel.alpha.value), ci(rel.alpha), `n = ${rel.alpha.n}, ${rel.alpha.items} items (Feldt CI)`]);
  }
  if (rel.alphaByGroup) {
    relRows.push(["  alpha, programme group", fmtReliability(rel.alphaByGroup.programme.value), ci(rel.alphaByGroup.programme), `n = ${rel.alphaByGroup.programme.n}`]);
    relRows.push(["  alpha, comparison group", fmtReliability(rel.alphaByGroup.comparison.value), ci(rel.alphaByGroup.comparison), `n = ${rel.alphaByGroup.comparison.n}`]);
  }
  if (rel.splitHalf) {
    relRows.push([
      'Split-half (odd–even), Spearman–Brown',
      fmtReliability(rel.splitHalf.spearmanBrown),
      '',
      `n = ${rel.splitHalf.n}, half-test r = ${fmtReliability(rel.splitHalf.halfCorrelation)}`,
    ]);
  }
  if (rel.testRetest) {
    relRows.push(['Test–retest, within groups', fmtReliability(rel.testRetest.value), ci(rel.testRetest), `n = ${rel.testRetest.n} (Fisher z CI)`]);
  }
  lines.push('', 'Reliability of the pretest');
  if (relRows.length === 0) lines.push('  none: map item columns (--items) or a retest column (--retest) to estimate it.');
  else lines.push(...alignColumns([['', 'estimate', '95% CI', ''], ...relRows], 3).map((l) => `  ${l}`));
  const choices = pilotReliabilityOptions(est);
  const suggested = choices.find((o) => o.recommended);
  if (suggested && choices.length > 1) lines.push(`  For the plan: ${suggested.label} is suggested. ${suggested.why}`);

  if (est.itemTotal && est.itemTotal.length > 0) {
    lines.push('', 'Corrected item–total correlations (within groups)');
    lines.push(...alignColumns(est.itemTotal.map((x) => [visible(x.column), fmtReliability(x.correctedCorrelation)])).map((l) => `  ${l}`));
  }
  if (est.warnings.length > 0) {
    lines.push('', 'Warnings');
    for (const w of est.warnings) lines.push(`  - ${w.message}`);
  }
  lines.push('', PILOT_NOTE, PLANNING_CAUTION);
  return `${lines.join('\n')}\n`;
}

/** Left-align the first column (and any from `leftFrom` on), right-align the others, two spaces apart. */
function alignColumns(rows: string[][], leftFrom = Number.POSITIVE_INFINITY): string[] {
  const widths: number[] = [];
  for (const r of rows) r.forEach((c, i) => (widths[i] = Math.max(widths[i] ?? 0, [...c].length)));
  return rows.map((r) =>
    r
      .map((c, i) => {
        const pad = ' '.repeat((widths[i] ?? 0) - [...c].length);
        return i === 0 || i >= leftFrom ? c + pad : pad + c;
      })
      .join('  ')
      .trimEnd(),
  );
}
