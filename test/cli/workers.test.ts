import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { serializePlan } from '../../src/io/planFile';
import { runCli } from './runCli';
import { main } from '../../src/cli/main';
import { simulationJson } from '../../src/cli/simulationJson';
import { simulatePlan } from '../../src/sim/simulatePlan';

// --workers N splits the simulation across worker threads and merges their blocks of replications;
// the check is bit identity of the whole --json output with --workers 1 (nothing excluded: the
// JSON has no timing fields). Replication i always draws from its own stream (seed, i).
let demoFile = '';
let covariatesFile = '';
beforeAll(() => {
  const dir = mkdtempSync(join(tmpdir(), 'meanward-workers-'));
  const demo = structuredClone(EXAMPLE_PLANS[0]!.plan);
  demo.simulation = { replications: 120, seed: 77 };
  demoFile = join(dir, 'demo.json');
  writeFileSync(demoFile, serializePlan(demo));
  const cov = structuredClone(EXAMPLE_PLANS.find((e) => e.id === 'after-school-maths')!.plan);
  cov.simulation = { replications: 16, seed: 5 };
  covariatesFile = join(dir, 'covariates.json');
  writeFileSync(covariatesFile, serializePlan(cov));
});

describe('meanward run --workers', () => {
  it('--workers 2 prints exactly the JSON of --workers 1 (one-pretest and propensity plans)', async () => {
    for (const file of [demoFile, covariatesFile]) {
      const one = await runCli(['run', file, '--json', '--estimates', '--workers', '1']);
      const two = await runCli(['run', file, '--json', '--estimates', '--workers=2']);
      expect(one.code).toBe(0);
      expect(two.code).toBe(0);
      expect(two.stdout).toBe(one.stdout);
      expect(two.stderr).toMatch(/shared among 2 workers running side by side/);
    }
  }, 60_000);

  it('--max-seconds on 2 threads stops handing out ranges and summarises the first replications, bit for bit', async () => {
    let stdout = '';
    let stderr = '';
    let t = 0;
    // A fake clock: 1 s passes at every reading, so a 6 s limit stops the run early.
    const io = { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) }, now: () => (t += 1000) };
    const code = await main(['run', demoFile, '--json', '--reps', '400', '--max-seconds', '6', '--workers', '2'], io);
    expect(code).toBe(0);
    const sim = JSON.parse(stdout).simulation;
    expect(sim.partial).toBe(true);
    expect(sim.replicationsPlanned).toBe(400);
    expect(sim.replications).toBeGreaterThanOrEqual(2);
    expect(sim.replications).toBeLessThan(400);
    const plan = structuredClone(EXAMPLE_PLANS[0]!.plan);
    const { partial: _p, replicationsPlanned: _r, ...summary } = sim;
    expect(summary).toEqual(JSON.parse(JSON.stringify(simulationJson(simulatePlan(plan, { replications: sim.replications, seed: 77 }), false))));
    expect(stderr).toContain(`meanward: stopped at the 6 s limit after ${sim.replications} of 400 replications`);
  }, 60_000);

  it('says plainly what a bad --workers is', async () => {
    for (const bad of ['0', '65', '1.5', 'many']) {
      const r = await runCli(['run', demoFile, '--workers', bad]);
      expect(r.code).toBe(2);
      expect(r.stderr).toBe(`meanward: --workers (worker threads for the simulation) must be a whole number from 1 to 64; got "${bad}".\n`);
    }
    const none = await runCli(['run', demoFile, '--workers']);
    expect(none.stderr).toContain('got nothing.');
  });

  it('works from the real command (bin/meanward.mjs through tsx), threads and all', () => {
    const args = ['bin/meanward.mjs', 'run', demoFile, '--json', '--reps', '40'];
    const one = spawnSync(process.execPath, [...args, '--workers', '1'], { encoding: 'utf8', timeout: 60_000 });
    const three = spawnSync(process.execPath, [...args, '--workers', '3'], { encoding: 'utf8', timeout: 60_000 });
    expect(one.status).toBe(0);
    expect(three.status).toBe(0);
    expect(three.stdout).toBe(one.stdout);
  }, 90_000);
});
