import { PLAN_LIMITS } from '../core/planSchema';
import { eachArgument } from './flagParts';
import { MAX_POOL_WORKERS } from '../sim/pool/defaultPoolSize';
import { parsePilotCommandLine, type PilotCommandLine } from './pilotCommandLine';
import { parseMethodsCommandLine, type MethodsCommandLine } from './methodsCommandLine';
import { parseCompareCommandLine, type CompareCommandLine } from './compareCommand';
import { parseExploreCommandLine, type ExploreCommandLine } from './exploreCommand';

/** What the command line asked for, after checking every flag. */
export type CommandLine =
  | { command: 'help' }
  | { command: 'demo' }
  | {
      command: 'run';
      file: string;
      json: boolean;
      /** false with --no-sim. */
      simulate: boolean;
      /** --reps N overrides the plan's simulation.replications. */
      replications?: number;
      /** --seed S overrides the plan's simulation.seed. */
      seed?: number;
      /** --estimates: include per-replication estimates and the example replication in --json. */
      estimates?: boolean;
      /** --max-seconds N: stop the simulation after about N seconds and summarise what has run (labelled partial). */
      maxSeconds?: number;
      /** --workers N: simulate on N worker threads (1..64; default cores − 1, at least 1). */
      workers?: number;
    }
  | PilotCommandLine
  | MethodsCommandLine
  | CompareCommandLine
  | ExploreCommandLine;

export type ParsedCommandLine = { ok: true; value: CommandLine } | { ok: false; problems: string[] };

/**
 * Read the arguments after "meanward": `run <plan.json> [--json] [--reps N]
 * [--seed S] [--no-sim] [--estimates] [--max-seconds N] [--workers N]`, `demo`, or `--help`. Reports every problem at once.
 */
export function parseCommandLine(argv: readonly string[]): ParsedCommandLine {
  const args = [...argv];
  if (args.length === 0) return { ok: false, problems: ['No command given. Try "meanward --help".'] };
  if (args.includes('--help') || args.includes('-h') || args[0] === 'help') return { ok: true, value: { command: 'help' } };
  const [command, ...rest] = args;
  if (command === 'demo') {
    if (rest.length > 0) return { ok: false, problems: [`"meanward demo" takes no arguments; got ${rest.map(quote).join(' ')}.`] };
    return { ok: true, value: { command: 'demo' } };
  }
  if (command === 'pilot') return parsePilotCommandLine(rest);
  if (command === 'methods') return parseMethodsCommandLine(rest);
  if (command === 'compare') return parseCompareCommandLine(rest);
  if (command === 'explore') return parseExploreCommandLine(rest);
  if (command !== 'run') {
    return { ok: false, problems: [`Unknown command ${quote(command ?? '')}. The commands are "run", "pilot", "methods", "compare", "explore" and "demo"; see "meanward --help".`] };
  }
  const problems: string[] = [];
  const files: string[] = [];
  let json = false;
  let simulate = true;
  let estimates = false;
  let replications: number | undefined;
  let seed: number | undefined;
  let maxSeconds: number | undefined;
  let workers: number | undefined;
  for (const { word: a, flag, inline, takeValue } of eachArgument(rest)) {
    switch (flag) {
      case '--json':
        json = true;
        break;
      case '--no-sim':
        simulate = false;
        break;
      case '--estimates':
        estimates = true;
        break;
      case '--reps': {
        const v = takeValue();
        const n = wholeNumber(v, PLAN_LIMITS.replicationsMin, PLAN_LIMITS.replicationsMax);
        if (n === undefined) {
          problems.push(`--reps (number of simulated replications) must be a whole number from ${PLAN_LIMITS.replicationsMin} to ${PLAN_LIMITS.replicationsMax}; got ${v === undefined ? 'nothing' : quote(v)}.`);
        } else replications = n;
        break;
      }
      case '--seed': {
        const v = takeValue();
        const n = wholeNumber(v, 0, PLAN_LIMITS.seedMax);
        if (n === undefined) {
          problems.push(`--seed (simulation seed) must be a whole number from 0 to ${PLAN_LIMITS.seedMax}; got ${v === undefined ? 'nothing' : quote(v)}.`);
        } else seed = n;
        break;
      }
      case '--max-seconds': {
        const v = takeValue();
        const n = v !== undefined && /^\d+(\.\d+)?$/.test(v) ? Number(v) : Number.NaN;
        if (!(n > 0 && n <= MAX_SECONDS_LIMIT)) {
          problems.push(`--max-seconds (time limit for the simulation) must be a number of seconds above 0 and at most ${MAX_SECONDS_LIMIT} (a year); got ${v === undefined ? 'nothing' : quote(v)}.`);
        } else maxSeconds = n;
        break;
      }
      case '--workers': {
        const v = takeValue();
        const n = wholeNumber(v, 1, MAX_POOL_WORKERS);
        if (n === undefined) {
          problems.push(`--workers (worker threads for the simulation) must be a whole number from 1 to ${MAX_POOL_WORKERS}; got ${v === undefined ? 'nothing' : quote(v)}.`);
        } else workers = n;
        break;
      }
      default:
        if (a.startsWith('-') && a !== '-') problems.push(`Unknown option ${quote(a)}. "meanward run" takes --json, --reps N, --seed S, --no-sim, --estimates, --max-seconds N and --workers N.`);
        else files.push(a);
    }
  }
  if (files.length === 0) problems.push('"meanward run" needs a plan file, e.g. "meanward run plan.json".');
  if (files.length > 1) problems.push(`"meanward run" takes one plan file; got ${files.length}: ${files.map(quote).join(', ')}.`);
  if (problems.length > 0) return { ok: false, problems };
  return {
    ok: true,
    value: { command: 'run', file: files[0]!, json, simulate, replications, seed, estimates, ...(maxSeconds !== undefined ? { maxSeconds } : {}), ...(workers !== undefined ? { workers } : {}) },
  };
}

/** The largest --max-seconds accepted: a year. */
const MAX_SECONDS_LIMIT = 31_536_000;

function wholeNumber(v: string | undefined, min: number, max: number): number | undefined {
  if (v === undefined || !/^\d+$/.test(v)) return undefined;
  const n = Number(v);
  return n >= min && n <= max ? n : undefined;
}

function quote(s: string): string {
  return JSON.stringify(s);
}
