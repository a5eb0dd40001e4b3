import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { demoPlan } from '../../src/io/demoPlan';
import { serializePlan } from '../../src/io/planFile';
import { simulatePlan } from '../../src/sim/simulatePlan';

async function run(argv: string[], stderrIsTTY = false) {
  let stdout = '';
  let stderr = '';
  const code = await main(argv, {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s), isTTY: stderrIsTTY, columns: 100 },
  });
  return { code, stdout, stderr };
}

let demoFile = '';
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'meanward-cli-sim-'));
  demoFile = join(dir, 'demo.json');
  writeFileSync(demoFile, serializePlan(demoPlan()));
});

const ANALYSIS_KEYS = ['meanEstimate', 'bias', 'empiricalSE', 'rmse', 'coverage', 'rejectionRate', 'wrongSignRate'];
const MATCHING_KEYS = [
  'meanMatchedProgramme',
  'discardedProgrammeShare',
  'observedDifferenceBefore',
  'observedDifferenceAfter',
  'trueDifferenceAfter',
];

describe('meanward run: simulated figures', () => {
  it('--json adds simulation.analyses.* and simulation.matching.* exactly as the engine computes them', async () => {
    const r = await run(['run', demoFile, '--json', '--reps', '40', '--seed', '3']);
    expect(r.code).toBe(0);
    // stderr: only the run-time estimate (one line, before the run).
    expect(r.stderr).toMatch(/^meanward: estimated simulation time [^\n]+\.\n$/);
    const out = JSON.parse(r.stdout);
    const plan = demoPlan();
    plan.simulation = { replications: 40, seed: 3 };
    const direct = simulatePlan(plan);
    for (const id of ['matchedDifference', 'ancova', 'gainScore', 'correctedAncova'] as const) {
      for (const k of ANALYSIS_KEYS) {
        const v = out.simulation.analyses[id]![k];
        expect(typeof v, `${id}.${k}`).toBe('number');
        // JSON round trip of doubles is exact, so the CLI shows the engine's own figure.
        expect(v).toBe((direct.analyses[id]! as unknown as Record<string, number>)[k]);
      }
    }
    for (const k of MATCHING_KEYS) {
      expect(out.simulation.matching[k]).toBe((direct.matching as unknown as Record<string, number>)[k]);
    }
    expect(out.simulation.replications).toBe(40);
    expect(out.simulation.seed).toBe(3);
    // The big per-replication arrays stay out unless asked for.
    expect(out.simulation.estimates).toBeUndefined();
    expect(out.simulation.example).toBeUndefined();
  });

  it('the simulated demo shows the regression artefact: hidden true-score gap ≈ (1 - rho) × pretest gap', async () => {
    // Kelley (1947) / Thorndike (1942): after matching on X the true scores differ by (1 - rho) Delta
    // = 0.25 × (-10) = -2.5 points. Tolerance 3 MCSE of the simulated figure plus 0.1 point for the caliper's residual gap.
    const out = JSON.parse((await run(['run', demoFile, '--json', '--reps', '60'])).stdout);
    const m = deriveModelParameters(demoPlan());
    const expected = (1 - m.reliability.comparison) * m.pretestGap;
    expect(Math.abs(out.simulation.matching.trueDifferenceAfter - expected)).toBeLessThan(
      3 * out.simulation.matching.trueDifferenceAfterMCSE + 0.1,
    );
  });

  it('--estimates adds the per-replication estimates and the example replication', async () => {
    const out = JSON.parse((await run(['run', demoFile, '--json', '--reps', '5', '--estimates'])).stdout);
    expect(out.simulation.estimates.ancova!).toHaveLength(5);
    expect(out.simulation.example.pairs.length).toBeGreaterThan(0);
  });

  it('the table gains a simulated section; no progress bar when stderr is not a terminal', async () => {
    const r = await run(['run', demoFile, '--reps', '20', '--seed', '5']);
    expect(r.code).toBe(0);
    // No progress bar: stderr holds only the run-time estimate line.
    expect(r.stderr).toMatch(/^meanward: estimated simulation time [^\n]+\.\n$/);
    expect(r.stdout).toContain('Simulated results (20 replications, seed 5;');
    expect(r.stdout).toMatch(/True-score difference \(hidden imbalance\)/);
    expect(r.stdout).toMatch(/Caution: Meanward is a planning aid/);
  });

  it('draws a progress bar on stderr only when it is a terminal, and erases it', async () => {
    const r = await run(['run', demoFile, '--reps', '300'], true);
    expect(r.code).toBe(0);
    expect(r.stderr).toContain('100% (300/300)');
    expect(r.stderr.endsWith('\r\u001b[K')).toBe(true);
  });

  it('--no-sim skips the simulation', async () => {
    const out = JSON.parse((await run(['run', demoFile, '--json', '--no-sim'])).stdout);
    expect(out.simulation).toBeNull();
  });

  it('a plan in which nobody can be matched still runs: exit 0, the matched analyses marked not computed with a reason, the rest reported', async () => {
    const bad = demoPlan();
    bad.matching.caliper = 0.0001;
    bad.groups.comparison.pretestMean = 150; // 10 SD away: no one is ever matched
    const file = join(dir, 'unmatchable.json');
    writeFileSync(file, serializePlan(bad));
    const text = await run(['run', file, '--reps', '3']);
    expect(text.code).toBe(0);
    expect(text.stdout).toMatch(/not computed\. The matched post-test difference could be computed in only 0 of 3 simulated studies/);
    const json = await run(['run', file, '--json', '--reps', '3']);
    expect(json.code).toBe(0);
    const sim = JSON.parse(json.stdout).simulation;
    expect(sim.analyses.matchedDifference!).toEqual({
      id: 'matchedDifference',
      sample: 'matched',
      feasible: false,
      reason: expect.stringMatching(/only 0 of 3 simulated studies.*widen the caliper/),
      replications: 0,
    });
    expect(sim.ancovaMatchedSample.feasible).toBe(false);
    for (const id of ['ancova', 'gainScore', 'correctedAncova']) {
      expect(sim.analyses[id]!.feasible).toBe(true);
      expect(sim.analyses[id]!.replications).toBe(3);
      for (const k of ANALYSIS_KEYS) expect(Number.isFinite(sim.analyses[id]![k])).toBe(true);
    }
  });

  it('the same through the installed command (node bin/meanward.mjs run plan.json --json): exit 0', () => {
    const bad = demoPlan();
    bad.matching.caliper = 0.0001;
    bad.groups.comparison.pretestMean = 150;
    const file = join(dir, 'unmatchable-bin.json');
    writeFileSync(file, serializePlan(bad));
    const root = join(__dirname, '..', '..');
    const r = spawnSync(process.execPath, [join(root, 'bin', 'meanward.mjs'), 'run', file, '--json', '--reps', '3'], { cwd: root, encoding: 'utf8' });
    expect(r.status).toBe(0);
    const sim = JSON.parse(r.stdout).simulation;
    expect(sim.analyses.matchedDifference!.feasible).toBe(false);
    expect(sim.analyses.matchedDifference!.reason).toMatch(/caliper/);
    expect(sim.analyses.ancova!.feasible).toBe(true);
  }, 60_000);
});
