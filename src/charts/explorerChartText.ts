import type { ChartText } from './chartTypes';
import { inSentence, type ExplorerChartCell, type ExplorerChartData } from './explorerChartData';
import { fmt } from './svgHelpers';
import { PLANNING_CAUTION } from '../core/planningCaution';

/**
 * A count with thousands separators, e.g. "2,000": the same as n.toLocaleString('en-GB'),
 * with the formatter made once when the module loads (making one takes milliseconds, the
 * first one in a page far more, and the explorer writes counts on every batch of cells).
 */
export function formatCount(n: number): string {
  return COUNT_FORMAT.format(n);
}
const COUNT_FORMAT = new Intl.NumberFormat('en-GB');

/** A share of the effect as a signed percentage, ASCII minus (PDF fonts), e.g. "-42%". */
export function sharePct(x: number, digits = 0): string {
  return `${fmt(x * 100, digits)}%`;
}

/** A cell's simulated share with its MC SE, e.g. "-42% ± 1.5%" ("+/-" in the PDF's Latin-1 fonts is not needed: ± is Latin-1). */
export function shareWithSE(c: Pick<ExplorerChartCell, 'share' | 'shareMCSE'>): string {
  if (c.share === null) return '';
  return c.shareMCSE === null ? sharePct(c.share) : `${sharePct(c.share)} ± ${fmt(c.shareMCSE * 100, 1)}%`;
}

/** A cell's state in a few words, for tables and labels. */
export function cellStateWords(c: ExplorerChartCell): string {
  switch (c.status) {
    case 'pending':
      return 'not simulated yet';
    case 'impossible':
      return `impossible plan: ${c.note ?? ''}`.trim();
    case 'failed':
      return `could not be simulated: ${c.note ?? ''}`.trim();
    case 'done':
      return c.tolerable === true ? 'tolerable' : c.tolerable === false ? 'not tolerable' : '';
  }
}

/**
 * Text alternative to the explorer chart (screen readers, the page's table
 * alternative and the PDF): what was varied, how far the grid has run, which
 * cells are tolerable, the range of the simulated artefact, how cells are
 * judged, the caution; and a table with one row per cell.
 */
export function explorerChartText(data: ExplorerChartData): ChartText {
  // Kept per data object (chart data are never changed in place): the page builds the text
  // and the drawing describes itself with the same sentences, for every batch of cells.
  const kept = texts.get(data);
  if (kept) return kept;
  const text = buildExplorerChartText(data);
  texts.set(data, text);
  return text;
}
const texts = new WeakMap<ExplorerChartData, ChartText>();

function buildExplorerChartText(data: ExplorerChartData): ChartText {
  const { counts } = data;
  const varied = data.axes.map((a) => `${a.label} (${a.valueLabels.join(', ')})`).join(' and ');
  const done = data.cells.filter((c) => c.status === 'done' && c.share !== null);
  const tolerable = done.filter((c) => c.tolerable === true);
  const sentences = [
    `Simulated regression artefact of the ${inSentence(data.analysisLabel)} as a share of the hoped-for effect, in ${counts.total} plan variants: ${varied}. ` +
      `Each variant is simulated with ${formatCount(data.replications)} replications and the same seed (common random numbers), so neighbouring cells differ by the inputs, not by chance.`,
    counts.done === counts.total
      ? `All ${counts.total} variants have been simulated.`
      : `${counts.done} of ${counts.total} variants have been simulated` +
        [counts.pending > 0 ? `, ${counts.pending} not yet` : '', counts.impossible > 0 ? `, ${counts.impossible} impossible` : '', counts.failed > 0 ? `, ${counts.failed} failed` : ''].join('') +
        '.',
  ];
  if (done.length > 0) {
    const lo = done.reduce((a, b) => (b.share! < a.share! ? b : a));
    const hi = done.reduce((a, b) => (b.share! > a.share! ? b : a));
    sentences.push(`The simulated artefact runs from ${shareWithSE(lo)} (${lo.where}) to ${shareWithSE(hi)} (${hi.where}) of the effect.`);
    sentences.push(
      tolerable.length === 0
        ? `No simulated variant keeps the artefact within the ${sharePct(data.tolerableShare)} you can tolerate.`
        : `${tolerable.length} of ${done.length} simulated variants keep the artefact within the ${sharePct(data.tolerableShare)} you can tolerate: ${tolerable.map((c) => c.where).join('; ')}.`,
    );
  }
  // Variants that are not valid plans, or could not be simulated: each reason once, with the cells it concerns.
  for (const status of ['impossible', 'failed'] as const) {
    const bad = data.cells.filter((c) => c.status === status);
    if (bad.length === 0) continue;
    const byNote = new Map<string, string[]>();
    for (const c of bad) byNote.set(c.note ?? '', [...(byNote.get(c.note ?? '') ?? []), c.where]);
    const what = status === 'impossible' ? 'not a valid plan' : 'could not be simulated';
    const n = bad.length;
    sentences.push(
      `${n} variant${n === 1 ? ' is' : 's are'} ${what === 'not a valid plan' && n > 1 ? 'not valid plans' : what} (crossed out): ` +
        [...byNote].map(([note, where]) => `${where.join('; ')}: ${note}`).join(' '),
    );
  }
  sentences.push(
    'Each cell is judged on its simulated artefact alone; its false-positive rate and the drop in power need runs at no effect and without the artefact, so see the closed form for them. ' +
      'Each simulated figure has its Monte Carlo SE; the closed form beside it assumes unlimited pools and exact matching.',
  );
  sentences.push(PLANNING_CAUTION);
  const rows = data.cells.map((c) => [
    ...data.axes.map((a, k) => a.valueLabels[k === 0 ? c.row : c.col]!),
    c.share === null ? (c.status === 'done' ? 'n/a' : c.status === 'pending' ? 'pending' : c.status) : sharePct(c.share, 1),
    c.shareMCSE === null ? '' : `${fmt(c.shareMCSE * 100, 1)}%`,
    c.closedFormShare === null ? '' : sharePct(c.closedFormShare, 1),
    c.discardedShare === null ? '' : sharePct(c.discardedShare, 1),
    c.power === null ? '' : `${sharePct(c.power, 0)}${c.powerMCSE === null ? '' : ` ± ${fmt(c.powerMCSE * 100, 1)}%`}${c.wrongSign !== null && c.wrongSign >= 0.005 ? ` (${sharePct(c.wrongSign, 0)} wrong sign)` : ''}`,
    c.status === 'done' ? (c.tolerable ? 'yes' : 'no') : c.status === 'pending' ? 'not simulated yet' : c.status === 'impossible' ? 'impossible plan (see above)' : 'failed (see above)',
  ]);
  return {
    title: data.title,
    sentences,
    table: {
      caption: `Simulated artefact of the ${inSentence(data.analysisLabel)} in each variant (share of the hoped-for effect), with its Monte Carlo SE`,
      columns: [
        ...data.axes.map((a) => a.label),
        'Simulated artefact (% of effect)',
        'MC SE',
        'Closed form (% of effect)',
        'Discarded (% of programme pool)',
        'Power ± MC SE',
        'Tolerable',
      ],
      rows,
    },
  };
}
