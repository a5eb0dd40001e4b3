/*
 * Start-up of the command line (part of npm run bench): how long `meanward run <plan> --no-sim`
 * takes from the built bundle (dist-cli/, built first here when missing or stale), against a
 * bare Node process, both measured in this one run.
 *   cliStartRatio    wall time of `node bin/meanward.mjs run public/examples/demo-falls-prevention.json
 *                    --no-sim` ÷ wall time of `node -e 0` (target ≤ 4). The median over ROUNDS
 *                    interleaved rounds (after one warm-up round) of that round's ratio; each round
 *                    runs the two commands back to back, so both see the same load.
 *   cliNoSimSeconds  the median wall time of that command, in seconds (the goal: under 0.3 s
 *                    on the team's machines; machine-dependent, unlike the ratio).
 *   bareNodeSeconds  the median wall time of `node -e 0`.
 *   codeCache        'accepted' when V8 used the build's code cache (the normal case; 'rejected' would
 *                    mean this Node differs from the one that built dist-cli: rebuild).
 * Wall-clock time, not CPU time, because start-up is what the user waits for, and Node's own
 * start-up uses helper threads whose CPU time would count several times over; wall time is
 * noisier on a shared machine, hence the interleaving and the per-round ratio.
 * The `--no-sim` run still includes the closed forms and the quick simulation of the planned
 * matching (src/sim/estimatePlannedProcedure.ts, 144 replications for the demo plan), so part of
 * the time is the planner's own work, not start-up.
 */
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { builtCliState, PROJECT_ROOT } from '../../bin/builtCli.mjs';

const ROUNDS = 9;
const PLAN = join(PROJECT_ROOT, 'public', 'examples', 'demo-falls-prevention.json');

export interface CliStartBench {
  command: string;
  rounds: number;
  cliStartRatio: number;
  cliNoSimSeconds: number;
  bareNodeSeconds: number;
  roundRange: [number, number];
  /** 'built' when dist-cli was current (the normal case); 'sources' if it could not be built. */
  ran: 'built' | 'sources';
  /** Whether V8 took the build's code cache (dist-cli/meanward.cjs.cache) in a plain `node`. */
  codeCache: string;
  targets: { cliStartRatio: string };
  met: { cliStartRatio: boolean };
}

/** Wall time of one `node <args>` in milliseconds; throws when it fails. */
function wallMs(args: string[]): { ms: number; stderr: string } {
  const t0 = performance.now();
  const r = spawnSync(process.execPath, args, { cwd: PROJECT_ROOT, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
  const ms = performance.now() - t0;
  if (r.status !== 0) throw new Error(`node ${args.join(' ')} exited ${r.status}: ${r.stderr}`);
  return { ms, stderr: r.stderr };
}

const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] as number;
const round = (x: number, d: number): number => Math.round(x * 10 ** d) / 10 ** d;

/** Measures the CLI's start (see the header); builds dist-cli first when it is missing or stale. */
export async function cliStartBench(): Promise<CliStartBench> {
  if (builtCliState().state !== 'current') {
    spawnSync(process.execPath, [join(PROJECT_ROOT, 'scripts', 'build-cli.mjs'), '--if-needed'], { cwd: PROJECT_ROOT, stdio: 'ignore' });
  }
  const ran = builtCliState().state === 'current' ? 'built' : 'sources';
  const probe = `import { loadBuiltCli } from ${JSON.stringify(join(PROJECT_ROOT, 'bin', 'builtCli.mjs'))}; process.stdout.write(loadBuiltCli().codeCache);`;
  const codeCache = ran === 'built' ? spawnSync(process.execPath, ['--input-type=module', '-e', probe], { encoding: 'utf8' }).stdout : 'not used';
  const cli = [join(PROJECT_ROOT, 'bin', 'meanward.mjs'), 'run', PLAN, '--no-sim'];
  const bare = ['-e', '0'];
  wallMs(bare);
  wallMs(cli);
  const cliMs: number[] = [];
  const bareMs: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    // Alternate which goes first, so neither always follows the other.
    const first = r % 2 === 0;
    const b1 = first ? wallMs(bare).ms : 0;
    cliMs.push(wallMs(cli).ms);
    bareMs.push(first ? b1 : wallMs(bare).ms);
  }
  const ratios = cliMs.map((c, i) => c / (bareMs[i] as number));
  const ratio = median(ratios);
  return {
    command: 'node bin/meanward.mjs run public/examples/demo-falls-prevention.json --no-sim  vs  node -e 0',
    rounds: ROUNDS,
    cliStartRatio: round(ratio, 2),
    cliNoSimSeconds: round(median(cliMs) / 1000, 3),
    bareNodeSeconds: round(median(bareMs) / 1000, 3),
    roundRange: [round(Math.min(...ratios), 2), round(Math.max(...ratios), 2)],
    ran,
    codeCache,
    targets: { cliStartRatio: '<= 4' },
    met: { cliStartRatio: ratio <= 4 },
  };
}
