import { comparePlans, COMPARE_MAX_PLANS, COMPARE_MIN_PLANS, type PlanComparisonRow } from '../core/comparePlans';
import type { Plan } from '../core/plan';
import { plainErrorMessage } from '../core/plainErrorMessage';
import { parsePlanText } from '../io/planFile';
import { fmtPercent, fmtPoints } from './formatResultsTable';
import { readInputFile } from './readInputFile';

/** "meanward compare a.json b.json … [--json]" after checking the flags. */
export interface CompareCommandLine {
  command: 'compare';
  files: string[];
  json: boolean;
}

/** Read the arguments after "compare"; every problem at once. */
export function parseCompareCommandLine(args: readonly string[]): { ok: true; value: CompareCommandLine } | { ok: false; problems: string[] } {
  const problems: string[] = [];
  const files: string[] = [];
  let json = false;
  for (const a of args) {
    if (a === '--json') json = true;
    else if (a.startsWith('-') && a !== '-') problems.push(`Unknown option ${JSON.stringify(a)}. "meanward compare" takes plan files and --json.`);
    else files.push(a);
  }
  if (files.length < COMPARE_MIN_PLANS || files.length > COMPARE_MAX_PLANS) {
    problems.push(`"meanward compare" needs ${COMPARE_MIN_PLANS} to ${COMPARE_MAX_PLANS} plan files, e.g. "meanward compare a.json b.json"; got ${files.length}.`);
  }
  return problems.length > 0 ? { ok: false, problems } : { ok: true, value: { command: 'compare', files, json } };
}

/**
 * Read every plan file, then compare them (comparePlans: closed forms, each
 * plan's headline analysis). All bad files are reported at once.
 * @returns the rows, or the problems (one line each, naming the file).
 */
export async function runCompareCommand(cmd: CompareCommandLine): Promise<{ ok: true; plans: Plan[]; rows: PlanComparisonRow[] } | { ok: false; problems: string[] }> {
  const problems: string[] = [];
  const plans: Plan[] = [];
  for (const file of cmd.files) {
    const read = await readInputFile(file, 'plan');
    if (!read.ok) {
      problems.push(read.problem);
      continue;
    }
    const checked = parsePlanText(read.text);
    if (!checked.ok) {
      for (const p of checked.problems) problems.push(p.field === '' ? `${file}: ${p.message}` : `${file}: ${p.field}: ${p.message}`);
      continue;
    }
    plans.push(checked.plan);
  }
  if (problems.length > 0) return { ok: false, problems };
  try {
    return { ok: true, plans, rows: comparePlans(plans.map((plan, i) => ({ name: cmd.files[i]!, plan }))) };
  } catch (err) {
    return { ok: false, problems: [plainErrorMessage(err, 'The plans could not be compared; check the values near the ends of their ranges.')] };
  }
}

/** The comparison as a fixed-width text table, one row per plan (figures formatted, never computed). */
export function formatComparisonTable(rows: readonly PlanComparisonRow[]): string {
  const head = ['Plan', 'Analysis', 'Artefact', 'Share', 'False pos.', 'Power', 'Power if unbiased', 'Programme n', 'Discarded'];
  const body = rows.map((r) => [
    r.name,
    r.analysisName,
    fmtPoints(r.artefact),
    fmtPercent(r.artefactShare),
    `${fmtPercent(r.falsePositiveRate)} (α ${fmtPercent(r.alpha)})`,
    fmtPercent(r.power),
    fmtPercent(r.powerWithoutBias),
    `${Math.round(r.programmeN)} of ${r.programmePool}`,
    fmtPercent(r.discardedShare),
  ]);
  const widths = head.map((h, j) => Math.max(h.length, ...body.map((b) => b[j]!.length)));
  const line = (cells: string[]) => cells.map((c, j) => c.padEnd(widths[j]!)).join('  ').trimEnd();
  const estimands = rows.map((r) => `  ${r.name}: ${r.estimand}`);
  return [
    'Candidate plans side by side (closed forms; artefact in posttest points, share of the hoped-for effect):',
    line(head),
    ...body.map(line),
    '',
    'Whom each estimate describes:',
    ...estimands,
  ].join('\n');
}
