import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main';
import { simulationJson } from '../../src/cli/simulationJson';
import { demoPlan } from '../../src/io/demoPlan';
import { serializePlan } from '../../src/io/planFile';
import { simulatePlan } from '../../src/sim/simulatePlan';

/** Run the CLI in-process with a fake clock that advances `stepMs` at every reading (no real timing). */
async function run(argv: string[], stepMs?: number) {
  let stdout = '';
  let stderr = '';
  let t = 0;
  const now = stepMs === undefined ? undefined : () => (t += stepMs);
  const code = await main(argv, { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) }, now, defaultWorkers: 1 });
  return { code, stdout, stderr };
}

let file = '';
beforeAll(() => {
  file = join(mkdtempSync(join(tmpdir(), 'meanward-maxsec-')), 'plan.json');
  const plan = demoPlan();
  plan.simulation.replications = 400;
  writeFileSync(file, serializePlan(plan));
});

describe('meanward run: the estimated time and --max-seconds', () => {
  it('prints the estimate on stderr before simulating', async () => {
    const r = await run(['run', file, '--json', '--reps', '20'], 10);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^meanward: estimated simulation time (about \d+ s|under 1 s) \(timed the first \d+ of 20 replications on this device and scaled their pace to the rest\)\.\n$/);
    expect(JSON.parse(r.stdout).simulation.partial).toBeUndefined();
  });

  it('stops at the limit with a partial summary: the first k replications, bit for bit, labelled in the JSON and the table', async () => {
    // The fake clock says 1 s passes per reading, so a 6 s limit stops the run after a few replications.
    const r = await run(['run', file, '--json', '--max-seconds', '6'], 1000);
    expect(r.code).toBe(0);
    const sim = JSON.parse(r.stdout).simulation;
    expect(sim.partial).toBe(true);
    expect(sim.replicationsPlanned).toBe(400);
    expect(sim.replications).toBeGreaterThanOrEqual(2);
    expect(sim.replications).toBeLessThan(400);
    const plan = demoPlan();
    const { partial: _p, replicationsPlanned: _r, ...summary } = sim;
    expect(summary).toEqual(JSON.parse(JSON.stringify(simulationJson(simulatePlan(plan, { replications: sim.replications }), false))));
    expect(r.stderr).toContain('The --max-seconds 6 limit will stop it early');
    expect(r.stderr).toContain(`meanward: stopped at the 6 s limit after ${sim.replications} of 400 replications; the simulated figures below are partial.`);

    const table = await run(['run', file, '--max-seconds', '6'], 1000);
    expect(table.stdout).toContain(`Simulated results, PARTIAL: stopped at the time limit after ${sim.replications} of 400 planned replications`);
  });

  it('runs everything when the limit is not reached', async () => {
    const r = await run(['run', file, '--json', '--reps', '30', '--max-seconds', '1000'], 1);
    const sim = JSON.parse(r.stdout).simulation;
    expect(sim.partial).toBeUndefined();
    expect(sim.replications).toBe(30);
  });

  it('rejects a bad --max-seconds with a clear message', async () => {
    for (const bad of ['0', '-5', 'soon', '40000000']) {
      const r = await run(['run', file, '--max-seconds', bad]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain(`--max-seconds (time limit for the simulation) must be a number of seconds above 0 and at most 31536000 (a year); got ${JSON.stringify(bad)}.`);
    }
    expect((await run(['run', file, '--max-seconds'])).stderr).toContain('got nothing.');
  });
});
