// Every design's closed forms, registered in the engine registry (src/core/engineRegistry.ts).
import '../core/allEngines';
import type { AnalyticResults } from '../core/analyticResults';
import { firstNonFinite as findNonFinite } from '../core/assertFiniteOutput';
import type { Plan } from '../core/plan';
import type { PlanProblem } from '../core/validatePlan';
import { demoPlan } from '../io/demoPlan';
import { parsePlanText, serializePlan } from '../io/planFile';
import { formatResultsTable, PLANNING_CAUTION } from './formatResultsTable';
import { parseCommandLine } from './parseCommandLine';
import { createPlanSimulation } from '../sim/multivariate/createPlanSimulation';
import { estimateRunSeconds } from '../sim/estimateRunSeconds';
import { defaultThreadCount, runPlanOnThreads } from '../sim/pool/nodeSimulationPool';
import { fmtDuration, fmtInt } from '../format/numbers';
import type { SimulationResult } from '../sim/types';
import { analysePlannedProcedure } from '../sim/analysePlannedProcedure';
import { quickFiguresAgreement } from '../sim/quickFiguresAgreement';
import { formatSimulationTable } from './formatSimulationTable';
import { createProgressBar, type ProgressStream } from './progressBar';
import { simulationJson, type SimulationJson } from './simulationJson';
import { formatComparisonTable, runCompareCommand } from './compareCommand';
import { runExploreCommand } from './exploreCommand';
import { readInputFile } from './readInputFile';
import { capProblemList } from '../core/capProblemList';
import { plainErrorMessage } from '../core/plainErrorMessage';
import { showControlCharacters } from '../core/visibleText';

/** Dotted path of the first NaN or infinite number in a result, or null (the core's walk). */
const firstNonFinite = (x: unknown, path: string): string | null => findNonFinite(x, path)?.path ?? null;

/** Where the command line writes (process.stdout / process.stderr, or a test double). */
export interface CliIO {
  stdout: { write(s: string): unknown };
  stderr: ProgressStream;
  /** Clock in milliseconds for the run-time estimate and --max-seconds (default performance.now; a fake in tests). */
  now?: () => number;
  /** Worker threads when --workers is not given (default: cores − 1, at least 1; tests pin it so results do not depend on the machine). */
  defaultWorkers?: number;
}

/** Exit codes: 0 done; 1 an internal fault; 2 bad command line, unreadable file or invalid plan. */
export const EXIT_OK = 0;
export const EXIT_INTERNAL = 1;
export const EXIT_USAGE = 2;

export const HELP_TEXT = `meanward: plan a non-randomised two-group study that matches or adjusts on a
pretest measured with error, and see the regression-toward-the-mean artefact
before any data are collected.

Usage:
  meanward run <plan.json> [--json] [--reps N] [--seed S] [--no-sim] [--estimates]
               [--max-seconds N] [--workers N]
  meanward pilot <file.csv> --group COLUMN --programme VALUE
                 (--pretest COLUMN | --items COL,COL,...) [--combine sum|mean]
                 [--retest COLUMN] [--posttest COLUMN] [--delimiter ,|tab|;]
                 [--no-header] [--json]
  meanward methods <plan.json> [--format md|docx] [-o FILE]
  meanward compare <a.json> <b.json> [... up to 6] [--json]
  meanward explore <plan.json> --vary INPUT=FROM:TO:STEPS [--vary ...] [--json]
                   [--replications N] [--seed S] [--analysis ID] [--workers N]
  meanward demo            print the built-in demo plan (an invented example)
  meanward --help          this text

run options:
  --json      print one JSON object: { plan, analytic, simulation }
  --reps N    simulated replications (2 to 100000), instead of the plan's
  --seed S    simulation seed (0 to 4294967295), instead of the plan's
  --no-sim    closed-form results only
  --estimates with --json, also print every replication's estimates and the
              first replication's matched sets (large)
  --max-seconds N  stop the simulation after about N seconds and summarise the
              replications done by then, labelled partial (at least 2 run);
              --json: simulation.partial true, simulation.replications done,
              simulation.replicationsPlanned
  --workers N simulate on N worker threads side by side (1 to 64; default:
              the machine's cores less one, at least 1); the figures are the
              same for every N

Before simulating, "run" times its first replications and prints the
estimated time on stderr.

pilot: estimate plan inputs from a pilot (or earlier-wave) CSV/TSV file: group
  means and SDs, the gap, Cronbach's alpha (within groups and per group) with
  Feldt's CI, odd-even split-half, test-retest, posttest SD and pre-post r.
  --items COL,COL,...  item columns (the pretest is their sum, or --combine mean)
  --delimiter D        ",", "tab" or ";" (detected when left out)
  --no-header          the first row is data; columns are "column 1", "column 2", ...
  --json               print the estimates as one JSON object
  The file never leaves this machine. See docs/pilot-data.md.

methods: a methods paragraph for a proposal or pre-registration (design,
  matching, reliability and its source, the expected artefact, power,
  references and the planning caution), from the same figures as "run --no-sim".
  --format md    Markdown (the default), on stdout or in -o FILE
  --format docx  a Word document; needs -o FILE
compare: two to six plan files side by side (closed forms, each plan's
  headline analysis): artefact and its share of the effect, false-positive
  rate, power, programme members used, share discarded, and whom the estimate
  describes. --json prints one JSON array, one object per file.

explore: the design explorer. Vary one or two inputs over a grid and simulate
  every variant of the plan (the same seed in every cell): the simulated
  regression artefact as a share of the hoped-for effect ± its Monte Carlo SE,
  the closed form, the share of the programme pool discarded and power; "*"
  marks cells within your tolerable share (judged on the artefact alone).
  --vary INPUT=FROM:TO:STEPS  once or twice; INPUT is reliability, caliper,
               ratio, programmePool, comparisonPool, groupGap, cutOff or
               clusterSize (those the plan's design has); 2 to 12 steps,
               at most 64 cells. Example: --vary reliability=0.6:0.95:8
  --replications N  per cell, 100 to 20000 (default 2000)
  --seed S     the seed of every cell (default: the plan's)
  --analysis ID  the analysis mapped (default: the design's headline one)
  --workers N  threads to run the cells on (1 to 64)
  --json       print the whole exploration as one JSON object
  See docs/explorer.md.

With covariates in the plan, the matched difference is for the plan's matching
distance, ANCOVA adjusts for every measured covariate, and the results add the
unmeasured part of the bias (--json: analytic.unmeasuredBias) and the expected
balance per covariate (docs/covariates.md).

Exit status: 0 done, 2 bad command line, unreadable file or invalid plan
(every problem is printed on stderr, one per line), 1 internal fault.
The plan file format is described in docs/plan-file.md.
`;

/** The line printed when something fails that no input should make fail (exit 1). */
const FAULT_LINE =
  'Meanward stopped because of a fault of its own, not because of anything in your input. Please report it with the command and the file you used.';

/**
 * The command line: "meanward run | demo | --help". Every figure printed comes
 * from analysePlannedProcedure (src/core closed forms with the quick simulation of the planned procedure from src/sim) and the simulation; this file only reads, checks and formats.
 * Text from the plan or the pilot file is printed with control characters
 * escaped (showControlCharacters); lists of problems stop after 50 (capProblemList).
 * @returns the exit code. Never throws: an unexpected failure prints one plain
 *   line (never a stack trace) and exits 1.
 */
export async function main(argv: string[], io: CliIO): Promise<number> {
  try {
    return await runCommand(argv, io);
  } catch (err) {
    const detail = plainErrorMessage(err, '');
    return failWith(io, [detail === '' ? FAULT_LINE : `${FAULT_LINE} (${detail})`], EXIT_INTERNAL);
  }
}

async function runCommand(argv: string[], io: CliIO): Promise<number> {
  const parsed = parseCommandLine(argv);
  if (!parsed.ok) return failWith(io, parsed.problems);
  const cmd = parsed.value;
  if (cmd.command === 'help') {
    io.stdout.write(HELP_TEXT);
    return EXIT_OK;
  }
  if (cmd.command === 'demo') {
    io.stdout.write(serializePlan(demoPlan()));
    return EXIT_OK;
  }
  if (cmd.command === 'pilot') {
    // Estimates come from src/pilot; runPilotCommand reads and formats only. Loaded on use
    // (as is methods) so that `run` starts quickly from the built bundle.
    const { runPilotCommand } = await import('./pilotCommand');
    const pilot = await runPilotCommand(cmd);
    if (!pilot.ok) return failWith(io, pilot.problems, pilot.internal ? EXIT_INTERNAL : EXIT_USAGE);
    const bad = firstNonFinite(pilot.estimates, 'estimates');
    if (bad !== null) return failWith(io, [`${FAULT_LINE} (The pilot estimate ${bad} is not a finite number.)`], EXIT_INTERNAL);
    io.stdout.write(visibleOutput(pilot.output, cmd.json));
    return EXIT_OK;
  }

  if (cmd.command === 'methods') {
    // The text and its figures come from src/core (methodsText over analysePlannedProcedure); this only writes it.
    const { runMethodsCommand } = await import('./methodsCommand');
    const methods = await runMethodsCommand(cmd);
    if (!methods.ok) return failWith(io, methods.problems);
    if (methods.wrote !== null) io.stderr.write(`meanward: wrote the methods text to ${showControlCharacters(methods.wrote)}.\n`);
    else io.stdout.write(visibleOutput(methods.stdout, false));
    return EXIT_OK;
  }
  if (cmd.command === 'compare') {
    // Figures come from comparePlans (src/core); this only reads and formats.
    const compared = await runCompareCommand(cmd);
    if (!compared.ok) return failWith(io, compared.problems);
    const bad = firstNonFinite(compared.rows, 'rows');
    if (bad !== null) return failWith(io, [`${FAULT_LINE} (The figure ${bad} is not a finite number.)`], EXIT_INTERNAL);
    if (cmd.json) {
      const out = compared.rows.map((row, i) => ({ file: cmd.files[i], title: compared.plans[i]!.title, ...row, caution: PLANNING_CAUTION }));
      io.stdout.write(visibleOutput(`${JSON.stringify(out, null, 2)}\n`, true));
    } else io.stdout.write(visibleOutput(`${formatComparisonTable(compared.rows)}\n\n${PLANNING_CAUTION}\n`, false));
    return EXIT_OK;
  }

  if (cmd.command === 'explore') {
    // Every figure comes from src/core (cells, closed forms, summaries) and src/sim; this reads, runs and formats.
    const explored = await runExploreCommand(cmd, io.stderr, undefined, io.defaultWorkers);
    if (!explored.ok) return failWith(io, explored.problems);
    const bad = firstNonFinite(explored.result.cells, 'cells');
    if (bad !== null) return failWith(io, [`${FAULT_LINE} (The figure ${bad} is not a finite number.)`], EXIT_INTERNAL);
    if (cmd.json) io.stdout.write(visibleOutput(`${JSON.stringify({ ...explored.result, caution: PLANNING_CAUTION }, null, 2)}\n`, true));
    else io.stdout.write(visibleOutput(`${explored.text}\n\n${PLANNING_CAUTION}\n`, false));
    return EXIT_OK;
  }

  const read = await readInputFile(cmd.file, 'plan');
  if (!read.ok) return failWith(io, [read.problem]);
  const checked = parsePlanText(read.text);
  if (!checked.ok) return failWith(io, checked.problems.map((p) => problemLine(cmd.file, p)));
  const plan: Plan = structuredClone(checked.plan);
  if (cmd.replications !== undefined) plan.simulation.replications = cmd.replications;
  if (cmd.seed !== undefined) plan.simulation.seed = cmd.seed;

  let analytic: AnalyticResults;
  try {
    analytic = analysePlannedProcedure(plan);
  } catch (err) {
    // analysePlannedProcedure (via analysePlan) throws researcher-readable messages for inputs validation cannot foresee.
    return failWith(io, [`${cmd.file}: ${plainErrorMessage(err, ANALYSIS_FAILED)}`]);
  }
  const bad = firstNonFinite(analytic, 'analytic');
  if (bad !== null) {
    return failWith(io, [`${FAULT_LINE} (The figure ${bad} is not a finite number.)`], EXIT_INTERNAL);
  }

  // ── SIMULATION ─────────────────────────────────────────────────────────
  // The Monte Carlo engine (src/sim) simulates the planned procedure; every simulated figure printed comes from it.
  let simulation: SimulationJson | null = null;
  let simulationText = 'Monte Carlo simulation: skipped (--no-sim).\n';
  if (cmd.simulate) {
    const now = io.now ?? (() => performance.now());
    let result: SimulationResult;
    let bar: ReturnType<typeof createProgressBar> = null;
    try {
      const workers = cmd.workers ?? io.defaultWorkers ?? defaultThreadCount();
      result =
        workers === 1
          ? runWithTimeLimit(plan, now, cmd.maxSeconds, io, (made) => (bar = made))
          : await runOnThreads(plan, now, cmd.maxSeconds, workers, io, (made) => (bar = made));
    } catch (err) {
      (bar as ReturnType<typeof createProgressBar>)?.done();
      return failWith(io, [`${cmd.file}: ${plainErrorMessage(err, ANALYSIS_FAILED)}`]);
    }
    simulation = simulationJson(result, cmd.estimates === true);
    const badSim = firstNonFinite(simulation, 'simulation');
    if (badSim !== null) {
      return failWith(io, [`${FAULT_LINE} (The simulated figure ${badSim} is not a finite number.)`], EXIT_INTERNAL);
    }
    simulationText = formatSimulationTable(result, analytic);
    const disagreements = quickFiguresAgreement(analytic, result);
    if (disagreements.length > 0) simulationText += `\n${disagreements.map((d) => `Note: ${d.note}`).join('\n')}\n`;
  }
  // ───────────────────────────────────────────────────────────────────────

  if (cmd.json) {
    io.stdout.write(visibleOutput(`${JSON.stringify({ plan, analytic, simulation, caution: PLANNING_CAUTION }, null, 2)}\n`, true));
  } else {
    io.stdout.write(visibleOutput(`${formatResultsTable(plan, analytic)}\n${simulationText}\n${PLANNING_CAUTION}\n`, false));
  }
  return EXIT_OK;
}

/**
 * Simulate a plan for the command line: time a pilot of the first replications (estimateRunSeconds)
 * and print the estimate on stderr, then run the rest in chunks of about 0.2 s, stopping once
 * `maxSeconds` have passed (after at least 2 replications) with a summary of those done, marked
 * partial (SimulationRun.finishPartial). Chunking never changes the numbers.
 */
function runWithTimeLimit(
  plan: Plan,
  now: () => number,
  maxSeconds: number | undefined,
  io: CliIO,
  onBar: (bar: ReturnType<typeof createProgressBar>) => void,
): SimulationResult {
  const run = createPlanSimulation(plan);
  const start = now();
  const estimate = estimateRunSeconds(run, now);
  const limitNote =
    maxSeconds !== undefined && estimate.seconds > maxSeconds
      ? ` The --max-seconds ${maxSeconds} limit will stop it early; the summary will cover the replications done by then, labelled partial.`
      : '';
  io.stderr.write(`meanward: estimated simulation time ${fmtDuration(estimate.seconds)} (${estimate.method}).${limitNote}\n`);
  const bar = createProgressBar(io.stderr, 'Simulating');
  onBar(bar);
  const total = run.total;
  const chunk = Math.max(1, Math.min(1000, Math.floor(0.2 / Math.max(estimate.secondsPerReplication, 1e-6))));
  let from = run.completed;
  bar?.update(from, total);
  let stopped = false;
  while (from < total) {
    if (maxSeconds !== undefined && from >= 2 && (now() - start) / 1000 >= maxSeconds) {
      stopped = true;
      break;
    }
    const to = Math.min(total, from + chunk);
    run.runChunk(from, to);
    from = to;
    bar?.update(from, total);
  }
  bar?.done();
  if (stopped) {
    io.stderr.write(`meanward: stopped at the ${maxSeconds} s limit after ${fmtInt(from)} of ${fmtInt(total)} replications; the simulated figures below are partial.\n`);
    return run.finishPartial();
  }
  return run.finish();
}

/**
 * Simulate a plan for the command line on `workers` threads (runPlanOnThreads): the same pilot,
 * estimate line, progress bar and --max-seconds stop as runWithTimeLimit, and the same numbers
 * bit for bit (the pool merges the threads' blocks of replications; docs/simulation.md, "The worker pool").
 */
async function runOnThreads(
  plan: Plan,
  now: () => number,
  maxSeconds: number | undefined,
  workers: number,
  io: CliIO,
  onBar: (bar: ReturnType<typeof createProgressBar>) => void,
): Promise<SimulationResult> {
  let bar: ReturnType<typeof createProgressBar> = null;
  const result = await runPlanOnThreads(plan, {
    workers,
    now,
    ...(maxSeconds !== undefined ? { maxSeconds } : {}),
    onEstimate: (estimate) => {
      const limitNote =
        maxSeconds !== undefined && estimate.seconds > maxSeconds
          ? ` The --max-seconds ${maxSeconds} limit will stop it early; the summary will cover the replications done by then, labelled partial.`
          : '';
      io.stderr.write(`meanward: estimated simulation time ${fmtDuration(estimate.seconds)} (${estimate.method}).${limitNote}\n`);
      bar = createProgressBar(io.stderr, 'Simulating');
      onBar(bar);
    },
    onProgress: (done, total) => bar?.update(done, total),
  });
  (bar as ReturnType<typeof createProgressBar>)?.done();
  if (result.partial) {
    io.stderr.write(
      `meanward: stopped at the ${maxSeconds} s limit after ${fmtInt(result.replications)} of ${fmtInt(result.replicationsPlanned ?? result.replications)} replications; the simulated figures below are partial.\n`,
    );
  }
  return result;
}

/** A plan the analysis could not finish, in plain words (when its own message is program text). */
const ANALYSIS_FAILED =
  'The figures for this plan could not be computed. Check the values near the ends of their ranges (docs/plan-file.md lists them); if the plan looks sensible, please report it.';

/** Problems on stderr, one per line: at most 50 of them, control characters escaped. */
function failWith(io: CliIO, lines: string[], code: number = EXIT_USAGE): number {
  for (const l of capProblemList(lines)) io.stderr.write(`meanward: ${showControlCharacters(l)}\n`);
  return code;
}

/** Output text with control characters escaped: line by line for a table, as JSON escapes for JSON. */
function visibleOutput(text: string, json: boolean): string {
  return json ? showControlCharacters(text, 'json') : text.split('\n').map((line) => showControlCharacters(line)).join('\n');
}

function problemLine(file: string, p: PlanProblem): string {
  return p.field === '' ? `${file}: ${p.message}` : `${file}: ${p.field}: ${p.message}`;
}

