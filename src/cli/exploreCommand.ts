import { defaultThreadCount, runBatchOnThreads } from '../sim/pool/nodeSimulationPool';
import type { AnalysisId, Plan } from '../core/plan';
import { ANALYSIS_IDS } from '../core/plan';
import type { ExploreAxis, ExploreCellSummary, ExploreResult, ExploreSpec } from '../core/explore/exploreTypes';
import { EXPLORE_LIMITS, defaultExploreSpec, parseVary, validateExploreSpec } from '../core/explore/exploreSpec';
import { EXPLORE_TOLERANCE_NOTE, exploreCells, exploreResult, exploreVariantName, failedCellSummary, formatExploreValue, pendingCellSummary, summariseExploreCell } from '../core/explore/exploreCells';
import { exploreInputWords } from '../core/explore/exploreInputs';
import { PLAN_LIMITS } from '../core/planSchema';
import { plainErrorMessage } from '../core/plainErrorMessage';
import { fmt, fmtInt, fmtPct } from '../format/numbers';
import { createPlanSimulation } from '../sim/multivariate/createPlanSimulation';
import type { SimulationResult } from '../sim/types';
import { eachArgument } from './flagParts';
import { parsePlanText } from '../io/planFile';
import { analysePlan } from '../core/analysePlan';
import { readInputFile } from './readInputFile';
import { createProgressBar, type ProgressStream } from './progressBar';

/** "meanward explore plan.json --vary input=from:to:steps [--vary …] [--replications N] [--seed S] [--analysis id] [--json] [--workers N]". */
export interface ExploreCommandLine {
  command: 'explore';
  file: string;
  axes: ExploreAxis[];
  replications?: number;
  seed?: number;
  analysisId?: AnalysisId;
  json: boolean;
  /** Threads to spread the cells over (1 = in this process). Absent: the runner's default. */
  workers?: number;
}

/** Most worker threads `--workers` accepts. */
export const EXPLORE_WORKERS_MAX = 64;

const quote = (s: string): string => JSON.stringify(s);

function wholeNumber(v: string | undefined, min: number, max: number): number | undefined {
  if (v === undefined || !/^\d+$/.test(v)) return undefined;
  const n = Number(v);
  return n >= min && n <= max ? n : undefined;
}

/**
 * Read the arguments after "explore"; every problem at once, in plain words
 * quoting what was typed. Whether each input applies to the plan and its
 * range is allowed is checked once the plan is read (validateExploreSpec).
 */
export function parseExploreCommandLine(args: readonly string[]): { ok: true; value: ExploreCommandLine } | { ok: false; problems: string[] } {
  const problems: string[] = [];
  const files: string[] = [];
  const axes: ExploreAxis[] = [];
  let json = false;
  let replications: number | undefined;
  let seed: number | undefined;
  let analysisId: AnalysisId | undefined;
  let workers: number | undefined;
  for (const { word: a, flag, inline, takeValue } of eachArgument(args)) {
    switch (flag) {
      case '--json':
        json = true;
        break;
      case '--vary': {
        const v = takeValue();
        if (v === undefined) {
          problems.push('--vary needs a value of the form input=from:to:steps, e.g. --vary reliability=0.6:0.95:8.');
          break;
        }
        const parsed = parseVary(v);
        if (parsed.ok) axes.push(parsed.axis);
        else problems.push(parsed.problem);
        break;
      }
      case '--replications':
      case '--reps': {
        const v = takeValue();
        const n = wholeNumber(v, EXPLORE_LIMITS.replicationsMin, EXPLORE_LIMITS.replicationsMax);
        if (n === undefined) {
          problems.push(`${flag} (replications per cell) must be a whole number from ${EXPLORE_LIMITS.replicationsMin} to ${EXPLORE_LIMITS.replicationsMax}; got ${v === undefined ? 'nothing' : quote(v)}.`);
        } else replications = n;
        break;
      }
      case '--seed': {
        const v = takeValue();
        const n = wholeNumber(v, 0, PLAN_LIMITS.seedMax);
        if (n === undefined) problems.push(`--seed (the seed of every cell) must be a whole number from 0 to ${PLAN_LIMITS.seedMax}; got ${v === undefined ? 'nothing' : quote(v)}.`);
        else seed = n;
        break;
      }
      case '--analysis': {
        const v = takeValue();
        if (v !== undefined && (ANALYSIS_IDS as readonly string[]).includes(v)) analysisId = v as AnalysisId;
        else problems.push(`--analysis must name an analysis: ${ANALYSIS_IDS.join(', ')}; got ${v === undefined ? 'nothing' : quote(v)}.`);
        break;
      }
      case '--workers': {
        const v = takeValue();
        const n = wholeNumber(v, 1, EXPLORE_WORKERS_MAX);
        if (n === undefined) problems.push(`--workers (threads to run the cells on) must be a whole number from 1 to ${EXPLORE_WORKERS_MAX}; got ${v === undefined ? 'nothing' : quote(v)}.`);
        else workers = n;
        break;
      }
      default:
        if (a.startsWith('-') && a !== '-') {
          problems.push(`Unknown option ${quote(a)}. "meanward explore" takes --vary input=from:to:steps (once or twice), --replications N, --seed S, --analysis ID, --json and --workers N.`);
        } else files.push(a);
    }
  }
  if (files.length === 0) problems.push('"meanward explore" needs a plan file, e.g. "meanward explore plan.json --vary reliability=0.6:0.95:8".');
  if (files.length > 1) problems.push(`"meanward explore" takes one plan file; got ${files.length}: ${files.map(quote).join(', ')}.`);
  if (axes.length === 0 && !problems.some((p) => p.startsWith('--vary'))) {
    problems.push('"meanward explore" needs one or two --vary input=from:to:steps, e.g. --vary reliability=0.6:0.95:8 --vary caliper=0.05:0.5:4.');
  }
  if (axes.length > 2) problems.push(`"meanward explore" varies one or two inputs; got ${axes.length} --vary options.`);
  if (problems.length > 0) return { ok: false, problems };
  return {
    ok: true,
    value: {
      command: 'explore',
      file: files[0]!,
      axes,
      json,
      ...(replications !== undefined ? { replications } : {}),
      ...(seed !== undefined ? { seed } : {}),
      ...(analysisId !== undefined ? { analysisId } : {}),
      ...(workers !== undefined ? { workers } : {}),
    },
  };
}

/** The exploration a command line asks for on a plan (defaults: the design's headline analysis, 2,000 replications, the plan's seed). */
export function exploreSpecFromCommandLine(plan: Plan, cmd: ExploreCommandLine): ExploreSpec {
  const base = defaultExploreSpec(plan);
  return {
    axes: cmd.axes as ExploreSpec['axes'],
    analysisId: cmd.analysisId ?? base.analysisId,
    replications: cmd.replications ?? base.replications,
    seed: cmd.seed ?? base.seed,
  };
}

/** One simulation job of a batch: a whole simulation of one plan. */
export interface ExploreJob {
  plan: Plan;
  replications: number;
  seed: number;
}

/**
 * Runs whole simulations, each job on its own, and reports each as it ends:
 * the shape of runBatchOnThreads (src/sim/pool/nodeSimulationPool.ts), so that
 * the thread pool can replace the in-process runner below.
 */
export type ExploreBatchRunner = (
  jobs: readonly ExploreJob[],
  options: {
    workers: number;
    onResult(index: number, result: SimulationResult): void;
    onError(index: number, message: string): void;
    onProgress?(done: number, total: number): void;
  },
) => Promise<void>;

/**
 * The in-process runner: every job in turn in this thread (createPlanSimulation
 * in chunks), whatever `workers` says. The same numbers as any other runner:
 * each job is one whole seeded simulation.
 */
export const runBatchInProcess: ExploreBatchRunner = async (jobs, options) => {
  const total = jobs.reduce((s, j) => s + j.replications, 0);
  let done = 0;
  options.onProgress?.(0, total);
  for (let index = 0; index < jobs.length; index++) {
    const job = jobs[index]!;
    try {
      const run = createPlanSimulation(job.plan, { replications: job.replications, seed: job.seed });
      for (let from = 0; from < job.replications; from += 250) {
        const to = Math.min(job.replications, from + 250);
        run.runChunk(from, to);
        options.onProgress?.(done + to, total);
      }
      options.onResult(index, run.finish());
    } catch (err) {
      options.onError(index, plainErrorMessage(err, 'This variant could not be simulated.'));
    }
    done += job.replications;
    // Let the event loop breathe between cells (progress output, signals).
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
};

/**
 * The runner `meanward explore` uses: one worker runs the cells in this
 * process (runBatchInProcess); more run them side by side on worker threads
 * (runBatchOnThreads, src/sim/pool/nodeSimulationPool.ts). Every cell is a
 * whole run with its own seeded streams, so the numbers are the same either way.
 * Default threads: the cores less one (defaultThreadCount).
 */
const runCellsOnThreadsOrHere: ExploreBatchRunner = (jobs, options) =>
  options.workers <= 1 ? runBatchInProcess(jobs, options) : runBatchOnThreads(jobs, options);

export const EXPLORE_RUNNER: { runBatch: ExploreBatchRunner; defaultWorkers: () => number } = {
  runBatch: runCellsOnThreadsOrHere,
  defaultWorkers: defaultThreadCount,
};

/**
 * Simulate every possible cell of an exploration with `runner` and summarise
 * each (summariseExploreCell); impossible cells stay 'impossible', a cell the
 * engine rejects becomes 'failed' with its message.
 * @returns the ExploreResult, cells in index order.
 */
export async function runExploration(
  plan: Plan,
  spec: ExploreSpec,
  options: { runner?: ExploreBatchRunner; workers?: number; onProgress?(done: number, total: number): void } = {},
): Promise<ExploreResult> {
  const cells = exploreCells(plan, spec);
  const summaries: ExploreCellSummary[] = cells.map(pendingCellSummary);
  const runnable = cells.filter((c) => c.plan !== null);
  const jobs = runnable.map((c) => ({ plan: c.plan as Plan, replications: spec.replications, seed: spec.seed }));
  const runner = options.runner ?? EXPLORE_RUNNER.runBatch;
  await runner(jobs, {
    workers: options.workers ?? EXPLORE_RUNNER.defaultWorkers(),
    onResult: (i, result) => {
      const cell = runnable[i]!;
      summaries[cell.index] = summariseExploreCell(cell, result, spec);
    },
    onError: (i, message) => {
      const cell = runnable[i]!;
      summaries[cell.index] = failedCellSummary(cell, message);
    },
    ...(options.onProgress ? { onProgress: options.onProgress } : {}),
  });
  return exploreResult(plan, spec, summaries);
}

/** A cell's simulated share ± MC SE for the text table (formatting only), "*" when tolerable. */
function shareCell(c: ExploreCellSummary): string {
  switch (c.status) {
    case 'done':
      return c.artefactShare === undefined
        ? 'n/a'
        : `${fmtPct(c.artefactShare)} ± ${fmt((c.artefactShareMCSE ?? 0) * 100, 1)}%${c.tolerable ? ' *' : ''}`;
    case 'impossible':
      return 'impossible';
    case 'failed':
      return 'failed';
    case 'pending':
      return 'not run';
  }
}

/**
 * The exploration as text: a grid (rows = the first input, columns = the
 * second) of the simulated artefact share ± MC SE with tolerable cells marked
 * "*", then one line per cell with the closed form, the discarded share and
 * power, and the notes on impossible or failed cells. Formatting only.
 */
export function formatExploreTable(result: ExploreResult, analysisName: string): string {
  const { spec, cells } = result;
  const [a0, a1] = spec.axes;
  const w0 = exploreInputWords(a0.input);
  const values0 = [...new Set(cells.map((c) => c.values[0]!))];
  const lines: string[] = [];
  lines.push(
    `Design explorer: simulated regression artefact of the ${analysisName} as a share of the hoped-for effect ± Monte Carlo SE ` +
      `(${fmtInt(spec.replications)} replications per cell, seed ${spec.seed} in every cell; * = tolerable).`,
  );
  lines.push('');
  if (a1 === undefined) {
    const head = [w0.shortLabel, 'simulated share ± MC SE'];
    const body = cells.map((c) => [formatExploreValue(c.values[0]!), shareCell(c)]);
    lines.push(...textGrid(head, body));
  } else {
    const w1 = exploreInputWords(a1.input);
    const values1 = [...new Set(cells.map((c) => c.values[1]!))];
    const head = [`${w0.shortLabel} \\ ${w1.shortLabel}`, ...values1.map(formatExploreValue)];
    const body = values0.map((v0) => [formatExploreValue(v0), ...values1.map((v1) => shareCell(cells.find((c) => c.values[0] === v0 && c.values[1] === v1)!))]);
    lines.push(...textGrid(head, body));
  }
  lines.push('');
  lines.push('Each cell:');
  for (const c of cells) {
    const name = exploreVariantName(spec, c).replace(/^Explorer: /, '');
    if (c.status === 'done') {
      lines.push(
        `  ${name}: simulated ${c.artefactShare === undefined ? 'n/a' : `${fmtPct(c.artefactShare)} ± ${fmt((c.artefactShareMCSE ?? 0) * 100, 1)}%`}` +
          ` (closed form ${c.closedFormShare === undefined ? 'n/a' : fmtPct(c.closedFormShare)}), discarded ${fmtPct(c.discardedShare)}, ` +
          `power ${fmtPct(c.power)} ± ${fmt((c.powerMCSE ?? 0) * 100, 1)}%${c.wrongSignRate === undefined ? '' : ` (${fmtPct(c.wrongSignRate)} in the wrong direction)`}, ${c.tolerable ? 'tolerable' : 'not tolerable'}.`,
      );
    } else if (c.status === 'impossible') lines.push(`  ${name}: impossible plan: ${c.problem ?? ''}`);
    else if (c.status === 'failed') lines.push(`  ${name}: could not be simulated: ${c.failure ?? ''}`);
    else lines.push(`  ${name}: not run.`);
  }
  lines.push('');
  lines.push(EXPLORE_TOLERANCE_NOTE);
  lines.push('The closed form assumes unlimited pools and exact matching; the simulated figures are for the procedure as planned, each with its Monte Carlo SE.');
  return lines.join('\n');
}

function textGrid(head: string[], body: string[][]): string[] {
  const widths = head.map((h, j) => Math.max(h.length, ...body.map((b) => b[j]!.length)));
  const line = (cells: string[]) => cells.map((c, j) => (j === 0 ? c.padEnd(widths[j]!) : c.padStart(widths[j]!))).join('   ').trimEnd();
  return [line(head), ...body.map(line)];
}

/**
 * "meanward explore": read and check the plan file, build and check the
 * exploration (validateExploreSpec: every problem names the input), simulate
 * every cell with the runner (a progress bar on a terminal's stderr) and
 * format the result. Every problem is returned at once, one line each.
 */
export async function runExploreCommand(
  cmd: ExploreCommandLine,
  stderr: ProgressStream,
  runner: ExploreBatchRunner = EXPLORE_RUNNER.runBatch,
  defaultWorkers?: number,
): Promise<{ ok: true; result: ExploreResult; text: string } | { ok: false; problems: string[] }> {
  const read = await readInputFile(cmd.file, 'plan');
  if (!read.ok) return { ok: false, problems: [read.problem] };
  const checked = parsePlanText(read.text);
  if (!checked.ok) return { ok: false, problems: checked.problems.map((p) => (p.field === '' ? `${cmd.file}: ${p.message}` : `${cmd.file}: ${p.field}: ${p.message}`)) };
  const plan = checked.plan;
  const spec = exploreSpecFromCommandLine(plan, cmd);
  const problems = validateExploreSpec(plan, spec);
  if (problems.length > 0) return { ok: false, problems: problems.map((p) => `${cmd.file}: ${p}`) };
  const possible = exploreCells(plan, spec).filter((c) => c.plan !== null).length;
  stderr.write(`meanward: exploring ${possible} variant${possible === 1 ? '' : 's'} of ${fmtInt(spec.replications)} replications each.\n`);
  const bar = createProgressBar(stderr, 'Exploring');
  try {
    const result = await runExploration(plan, spec, { runner, workers: cmd.workers ?? defaultWorkers, onProgress: (done, total) => bar?.update(done, total) });
    bar?.done();
    let name: string = spec.analysisId;
    try {
      name = analysePlan(plan).analyses[spec.analysisId]?.name ?? name;
    } catch {
      // The plan's own name for the analysis is a nicety; the id stands in.
    }
    return { ok: true, result, text: formatExploreTable(result, name.length > 1 && name[1] === name[1]!.toLowerCase() ? name[0]!.toLowerCase() + name.slice(1) : name) };
  } catch (err) {
    bar?.done();
    return { ok: false, problems: [`${cmd.file}: ${plainErrorMessage(err, 'The exploration could not be run.')}`] };
  }
}
