import { readFile } from 'node:fs/promises';
import { analysePlan } from '../core/analysePlan';
import type { AnalyticResults } from '../core/analyticResults';
import type { Plan } from '../core/plan';
import type { PlanProblem } from '../core/validatePlan';
import { demoPlan } from '../io/demoPlan';
import { parsePlanText, serializePlan } from '../io/planFile';
import { formatResultsTable, PLANNING_CAUTION } from './formatResultsTable';
import { parseCommandLine } from './parseCommandLine';

/** Where the command line writes (process.stdout / process.stderr, or a test double). */
export interface CliIO {
  stdout: { write(s: string): unknown };
  stderr: { write(s: string): unknown };
}

/** Exit codes: 0 done; 1 an internal fault; 2 bad command line, unreadable file or invalid plan. */
export const EXIT_OK = 0;
export const EXIT_INTERNAL = 1;
export const EXIT_USAGE = 2;

export const HELP_TEXT = `meanward: plan a non-randomised two-group study that matches or adjusts on a
pretest measured with error, and see the regression-toward-the-mean artefact
before any data are collected.

Usage:
  meanward run <plan.json> [--json] [--reps N] [--seed S] [--no-sim]
  meanward demo            print the built-in demo plan (an invented example)
  meanward --help          this text

run options:
  --json      print one JSON object: { plan, analytic, simulation }
  --reps N    simulated replications (1 to 100000), instead of the plan's
  --seed S    simulation seed (0 to 4294967295), instead of the plan's
  --no-sim    closed-form results only

Exit status: 0 done, 2 bad command line, unreadable file or invalid plan
(every problem is printed on stderr, one per line), 1 internal fault.
The plan file format is described in docs/plan-file.md.
`;

/**
 * The command line: "meanward run | demo | --help". Every figure printed comes
 * from analysePlan (src/core); this file only reads, checks and formats.
 * @returns the exit code. Never throws.
 */
export async function main(argv: string[], io: CliIO): Promise<number> {
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

  let text: string;
  try {
    text = await readFile(cmd.file, 'utf8');
  } catch (err) {
    return failWith(io, [`Cannot read the plan file ${JSON.stringify(cmd.file)}: ${readFailure(err)}.`]);
  }
  const checked = parsePlanText(text);
  if (!checked.ok) return failWith(io, checked.problems.map((p) => problemLine(cmd.file, p)));
  const plan: Plan = structuredClone(checked.plan);
  if (cmd.replications !== undefined) plan.simulation.replications = cmd.replications;
  if (cmd.seed !== undefined) plan.simulation.seed = cmd.seed;

  let analytic: AnalyticResults;
  try {
    analytic = analysePlan(plan);
  } catch (err) {
    // analysePlan throws researcher-readable messages for inputs validation cannot foresee.
    return failWith(io, [`${cmd.file}: ${err instanceof Error ? err.message : String(err)}`]);
  }
  const bad = firstNonFinite(analytic, 'analytic');
  if (bad !== null) {
    return failWith(io, [`Internal fault: ${bad} is not a finite number. Please report this with your plan file.`], EXIT_INTERNAL);
  }

  // ── SIMULATION HOOK ────────────────────────────────────────────────────
  // The Monte Carlo engine (src/sim) is connected here once it exists:
  //   const simulation = cmd.simulate ? simulatePlan(plan, { replications, seed, rng }) : null;
  // Until then no simulated figure is printed or invented: `simulation` is null
  // and the table says the simulation was not run.
  const simulation = null;
  const simulationNote = cmd.simulate
    ? `Monte Carlo simulation (${plan.simulation.replications} replications, seed ${plan.simulation.seed}): not run; the command line's simulation runner is not connected yet.`
    : 'Monte Carlo simulation: skipped (--no-sim).';
  // ───────────────────────────────────────────────────────────────────────

  if (cmd.json) {
    io.stdout.write(`${JSON.stringify({ plan, analytic, simulation, caution: PLANNING_CAUTION }, null, 2)}\n`);
  } else {
    io.stdout.write(`${formatResultsTable(plan, analytic)}\n${simulationNote}\n\n${PLANNING_CAUTION}\n`);
  }
  return EXIT_OK;
}

function failWith(io: CliIO, lines: string[], code: number = EXIT_USAGE): number {
  for (const l of lines) io.stderr.write(`meanward: ${l}\n`);
  return code;
}

function problemLine(file: string, p: PlanProblem): string {
  return p.field === '' ? `${file}: ${p.message}` : `${file}: ${p.field}: ${p.message}`;
}

function readFailure(err: unknown): string {
  const code = (err as { code?: string } | null)?.code;
  if (code === 'ENOENT') return 'there is no such file';
  if (code === 'EISDIR') return 'it is a folder, not a file';
  if (code === 'EACCES' || code === 'EPERM') return 'permission denied';
  return err instanceof Error ? err.message : String(err);
}

/** Dotted path of the first NaN or infinite number in a result, or null. */
function firstNonFinite(x: unknown, path: string): string | null {
  if (typeof x === 'number') return Number.isFinite(x) ? null : path;
  if (Array.isArray(x)) {
    for (let i = 0; i < x.length; i++) {
      const r = firstNonFinite(x[i], `${path}[${i}]`);
      if (r !== null) return r;
    }
    return null;
  }
  if (typeof x === 'object' && x !== null) {
    for (const [k, v] of Object.entries(x)) {
      const r = firstNonFinite(v, `${path}.${k}`);
      if (r !== null) return r;
    }
  }
  return null;
}
