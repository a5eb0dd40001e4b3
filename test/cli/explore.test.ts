import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from './runCli';
import { demoPlan } from '../../src/io/demoPlan';
import { serializePlan } from '../../src/io/planFile';
import { PLANNING_CAUTION } from '../../src/cli/formatResultsTable';
import { runBatchInProcess, runExploration, type ExploreBatchRunner } from '../../src/cli/exploreCommand';
import { createPlanSimulation } from '../../src/sim/multivariate/createPlanSimulation';
import type { ExploreResult, ExploreSpec } from '../../src/core/explore';

/*
 * Invented demo plan: pre–post r .6, SDs 10, programme 10 points below, effect 2.5 points.
 * ANCOVA's artefact is β(1 − ρ)Δ with β = r·SD_Y/(ρ·SD_X) (Lord 1960): at ρ .6 and Δ −10,
 * 1·0.4·(−10) = −4 points = −160% of the effect; at ρ .95, (0.6/.95)(.05)(−10) = −0.316 = −12.6%.
 */
let dir = '';
let plan = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'meanward-explore-'));
  plan = join(dir, 'demo.json');
  writeFileSync(plan, serializePlan(demoPlan()));
});

describe('meanward explore', () => {
  it('--json prints the exploration: every simulated cell within 4 MC SE of the closed form (Lord 1960)', async () => {
    const r = await runCli(['explore', plan, '--vary', 'reliability=0.6:0.95:3', '--vary=groupGap=-10:-4:2', '--analysis', 'ancova', '--replications', '400', '--seed', '9', '--json']);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout) as ExploreResult & { caution: string };
    expect(out.spec).toEqual({
      axes: [{ input: 'reliability', from: 0.6, to: 0.95, steps: 3 }, { input: 'groupGap', from: -10, to: -4, steps: 2 }],
      analysisId: 'ancova', replications: 400, seed: 9,
    });
    expect(out.cells.map((c) => c.values)).toEqual([[0.6, -10], [0.6, -4], [0.775, -10], [0.775, -4], [0.95, -10], [0.95, -4]]);
    expect(out.cells[0]!.closedFormShare).toBeCloseTo(-1.6, 10);
    expect(out.cells[4]!.closedFormShare).toBeCloseTo(((0.6 / 0.95) * 0.05 * -10) / 2.5, 10);
    for (const c of out.cells) {
      expect(c.status).toBe('done');
      // 4 MC SEs: a false alarm about 6e-5 per check.
      expect(Math.abs(c.artefactShare! - c.closedFormShare!)).toBeLessThan(4 * c.artefactShareMCSE!);
      expect(c.discardedShare).toBe(0); // ANCOVA keeps everyone
    }
    expect(out.caution).toBe(PLANNING_CAUTION);
  });

  it('prints a grid (rows the first input, columns the second) with tolerable cells marked, then one line per cell', async () => {
    const r = await runCli(['explore', plan, '--vary', 'reliability=0.6:0.95:2', '--vary', 'groupGap=-10:-2:2', '--analysis', 'ancova', '--reps', '200']);
    expect(r.code).toBe(0);
    const lines = r.stdout.split('\n');
    const head = lines.findIndex((l) => l.startsWith('reliability \\ group gap'));
    expect(head).toBeGreaterThan(0);
    expect(lines[head]).toMatch(/-10\s+-2$/);
    expect(lines[head + 1]).toMatch(/^0\.60\s/);
    expect(lines[head + 2]).toMatch(/^0\.95\s/);
    // Reliability .95 with a gap of −2: (0.6/.95)(.05)(−2)/2.5 = −2.5%, within 25%; reliability .6 with −10: −160%.
    expect(lines[head + 2]!.trim().endsWith('*')).toBe(true);
    expect(lines[head + 1]).not.toContain('*');
    expect(r.stdout).toContain('reliability 0.60, group gap -10: simulated');
    expect(r.stdout).toContain('(closed form −160.0%)');
    expect(r.stdout).toContain('Judged on the simulated artefact only');
    expect(r.stdout.trimEnd().endsWith(PLANNING_CAUTION)).toBe(true);
    expect(r.stderr).toContain('exploring 4 variants of 200 replications each');
  });

  it('impossible variants are listed with their reason, not simulated', async () => {
    const r = await runCli(['explore', plan, '--vary', 'reliability=0.3:0.9:2', '--reps', '100', '--analysis', 'gainScore']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/reliability 0\.30: impossible plan: .*correlation/);
    expect(r.stderr).toContain('exploring 1 variant of 100');
  });

  it('bad flags and specs: plain messages, every problem at once, exit 2', async () => {
    const cases: [string[], RegExp[]][] = [
      [['explore', plan], [/needs one or two --vary input=from:to:steps/]],
      [['explore', '--vary', 'reliability=0.6:0.9:4'], [/needs a plan file/]],
      [['explore', plan, '--vary', 'colour=1:2:3', '--workers', '0', '--replications', '50', '--frobnicate'], [
        /"colour" is not an input the explorer can vary/, /--workers .* from 1 to 64; got "0"/, /--replications .* from 100 to 20000; got "50"/, /Unknown option "--frobnicate"/,
      ]],
      [['explore', plan, '--vary', 'reliability=0.6:0.9:4', '--vary', 'caliper=0.1:0.5:3', '--vary', 'ratio=1:3:3'], [/one or two inputs; got 3/]],
      [['explore', plan, '--vary', 'cutOff=40:60:3'], [/Cut-off of the selection rule cannot be varied for this plan: only a plan whose groups a cut-off rule forms/]],
      [['explore', plan, '--vary', 'reliability=0.6:0.9:9', '--vary', 'caliper=0.1:0.5:8'], [/The grid has 72 cells; at most 64/]],
      [['explore', join(dir, 'missing.json'), '--vary', 'reliability=0.6:0.9:4'], [/missing\.json/]],
    ];
    for (const [argv, patterns] of cases) {
      const r = await runCli(argv);
      expect(r.code, argv.join(' ')).toBe(2);
      expect(r.stdout).toBe('');
      for (const p of patterns) expect(r.stderr).toMatch(p);
    }
  });
});

describe('the cell runner is injected (the thread pool replaces it at merge)', () => {
  const spec: ExploreSpec = { axes: [{ input: 'caliper', from: 0.1, to: 0.4, steps: 3 }], analysisId: 'matchedDifference', replications: 120, seed: 4 };
  it('the in-process runner gives each cell exactly a one-off run of its plan (same numbers, bit for bit)', async () => {
    const result = await runExploration(demoPlan(), spec, { runner: runBatchInProcess, workers: 1 });
    for (const c of result.cells) {
      const run = createPlanSimulation(c.plan!, { replications: 120, seed: 4 });
      run.runChunk(0, 120);
      const direct = run.finish().analyses.matchedDifference!;
      expect(c.artefact).toBe((direct as { meanEstimate: number }).meanEstimate - 2.5);
    }
  });
  it('a runner receives the jobs and the worker count, and its failures become failed cells', async () => {
    const seen: { jobs: number; workers: number }[] = [];
    const failing: ExploreBatchRunner = async (jobs, o) => {
      seen.push({ jobs: jobs.length, workers: o.workers });
      await runBatchInProcess(jobs.slice(0, 2), o);
      o.onError(2, 'This thread stopped.');
    };
    const result = await runExploration(demoPlan(), spec, { runner: failing, workers: 3 });
    expect(seen).toEqual([{ jobs: 3, workers: 3 }]);
    expect(result.cells.map((c) => c.status)).toEqual(['done', 'done', 'failed']);
    expect(result.cells[2]!.failure).toBe('This thread stopped.');
  });
});
