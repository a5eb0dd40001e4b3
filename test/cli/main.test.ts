import { spawnSync } from 'node:child_process';
import { runCli } from './runCli';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlannedProcedure } from '../../src/sim/analysePlannedProcedure';
import { TWO_GROUP_ANALYSIS_IDS } from '../../src/core/plan';
import { fmtPercent, fmtPoints, fmtReliability, fmtSD, PLANNING_CAUTION } from '../../src/cli/formatResultsTable';
import { DEMO_PLAN, demoPlan } from '../../src/io/demoPlan';
import { serializePlan } from '../../src/io/planFile';

const root = join(__dirname, '..', '..');

const run = runCli;

let dir = '';
let demoFile = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'meanward-cli-'));
  demoFile = join(dir, 'demo.json');
  writeFileSync(demoFile, serializePlan(demoPlan()));
});

describe('meanward demo and --help', () => {
  it('demo prints the demo plan file', async () => {
    expect(await run(['demo'])).toEqual({ code: 0, stdout: serializePlan(DEMO_PLAN), stderr: '' });
  });
  it('--help prints usage to stdout', async () => {
    const r = await run(['--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('meanward run <plan.json> [--json] [--reps N] [--seed S] [--no-sim]');
    expect(r.stderr).toBe('');
  });
});

describe('meanward run (table)', () => {
  it('shows every analysis with the numbers analysePlannedProcedure gives, the reliabilities and SEM, break-even and the caution', async () => {
    const r = await run(['run', demoFile, '--no-sim']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const res = analysePlannedProcedure(DEMO_PLAN);
    const lines = r.stdout.split('\n');
    for (const id of TWO_GROUP_ANALYSIS_IDS) {
      const a = res.analyses[id]!;
      const row = lines.find((l) => l.startsWith(a.name));
      expect(row, a.name).toBeDefined();
      const cells = row!.slice(a.name.length).trim().split(/\s{2,}/);
      expect(cells).toEqual([
        fmtPoints(a.expectedEstimate),
        ...(a.expectedEstimateMCSE === null ? [] : [`(${fmtPoints(a.expectedEstimateMCSE)})`]),
        fmtPoints(a.formulaEstimate),
        fmtPoints(a.bias),
        fmtSD(a.biasSD),
        fmtPercent(a.biasShare),
        fmtPoints(a.se!),
        fmtPercent(a.power),
        fmtPercent(a.falsePositiveRate),
        a.nProgramme.toFixed(0),
      ]);
    }
    expect(r.stdout).toContain(`reliability, programme:  ${fmtReliability(res.reliability.programme)}`);
    expect(r.stdout).toContain(`reliability, comparison: ${fmtReliability(res.reliability.comparison)}`);
    expect(r.stdout).toContain(`(SEM):  ${fmtPoints(res.reliability.sem)} points`);
    expect(r.stdout).toContain('Break-even reliability: ');
    if (res.breakEven.reliability !== null) expect(r.stdout).toContain(fmtReliability(res.breakEven.reliability));
    expect(r.stdout).toContain('Monte Carlo simulation: skipped (--no-sim).');
    expect(r.stdout.trimEnd().endsWith(PLANNING_CAUTION)).toBe(true);
  });
  it('the demo table shows the closed-form artefact: the formula for unlimited pools gives 0.50 for an effect of 2.50', async () => {
    // Demo: SEM 10*sqrt(.25) = 5, rho .75, beta = .6*10/(10*.75) = .8, Delta = -10.
    // Matched difference: tau + beta(1 - rho)Delta = 2.5 - 2 = 0.5 (Thorndike 1942; closed form
    // in REFERENCES, computed). Printed to 2 decimals, so the check is exact on the text. ANCOVA's
    // expected estimate is the same closed form (Lord 1960), its bias -2.00.
    const r = await run(['run', demoFile, '--no-sim']);
    const res = analysePlannedProcedure(DEMO_PLAN);
    const md = r.stdout.split('\n').find((l) => l.startsWith(res.analyses.matchedDifference!.name))!;
    expect(md.trim().split(/\s{2,}/)[3]).toBe('0.50');
    const an = r.stdout.split('\n').find((l) => l.startsWith(res.analyses.ancova!.name))!;
    expect(an.trim().split(/\s{2,}/).slice(1, 4)).toEqual(['0.50', '0.50', '-2.00']);
  });
  it('without --no-sim it adds the simulated results (details in test/cli/simulation.test.ts)', async () => {
    const r = await run(['run', demoFile, '--reps', '50', '--seed', '9']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Simulated results (50 replications, seed 9;');
  });
});

describe('meanward run --json', () => {
  it('prints one JSON object equal to { plan, analytic: analysePlannedProcedure(plan) }', async () => {
    const r = await run(['run', demoFile, '--json', '--no-sim']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const out = JSON.parse(r.stdout);
    expect(out.plan).toEqual(DEMO_PLAN);
    // JSON round trip of doubles is exact (shortest round-trip text), so toEqual is exact.
    expect(out.analytic).toEqual(JSON.parse(JSON.stringify(analysePlannedProcedure(DEMO_PLAN))));
    for (const id of ['matchedDifference', 'ancova', 'gainScore', 'correctedAncova']) {
      for (const k of ['expectedEstimate', 'bias', 'biasSD']) expect(typeof out.analytic.analyses[id]![k]).toBe('number');
    }
    for (const k of ['programme', 'comparison', 'sem']) expect(typeof out.analytic.reliability[k]).toBe('number');
    expect(out.simulation).toBeNull();
  });
  it('the demo biases match the published closed forms', async () => {
    // Closed forms (REFERENCES, computed; Thorndike 1942, Lord 1960, Porter 1967):
    // matched and ANCOVA beta(1-rho)Delta = .8*.25*(-10) = -2; gain (beta-1)Delta = (-.2)(-10) = 2;
    // corrected ANCOVA with assumed rho' = rho: beta(1 - rho/rho')Delta = 0.
    // Tolerance 1e-9: double rounding only, the formulas are exact here.
    const out = JSON.parse((await run(['run', demoFile, '--json', '--no-sim'])).stdout);
    const a = out.analytic.analyses;
    // The matched difference's expected estimate is for the planned procedure; its formula is the closed form.
    expect(Math.abs(a.matchedDifference.formulaEstimate - 0.5)).toBeLessThan(1e-9);
    expect(Math.abs(a.ancova.bias - -2)).toBeLessThan(1e-9);
    expect(Math.abs(a.gainScore.bias - 2)).toBeLessThan(1e-9);
    expect(Math.abs(a.correctedAncova.bias)).toBeLessThan(1e-9);
    expect(Math.abs(a.ancova.biasSD - -0.2)).toBeLessThan(1e-9); // -2 / posttest SD 10
    expect(Math.abs(out.analytic.reliability.sem - 5)).toBeLessThan(1e-9); // 10 * sqrt(1 - .75)
  });
  it('--reps and --seed replace the plan file values', async () => {
    const out = JSON.parse((await run(['run', demoFile, '--json', '--reps=30', '--seed', '4294967295'])).stdout);
    expect(out.plan.simulation).toEqual({ replications: 30, seed: 4294967295 });
  });
});

describe('failures: exit code 2, every problem on stderr, nothing on stdout', () => {
  it('an invalid plan lists each problem with its field', async () => {
    const p = demoPlan() as unknown as Record<string, any>;
    p.pretest.reliability = 1.4;
    p.matching.ratio = 9;
    const file = join(dir, 'bad.json');
    writeFileSync(file, JSON.stringify(p));
    const r = await run(['run', file]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe(
      `meanward: ${file}: pretest.reliability: Pretest reliability must be a number between 0 and 1 (exclusive); got 1.4.\n` +
        `meanward: ${file}: matching.ratio: Matching ratio must be a whole number from 1 to 5; got 9.\n`,
    );
  });
  it('a file that is not JSON', async () => {
    const file = join(dir, 'notes.txt');
    writeFileSync(file, 'reliability = 0.8\n');
    const r = await run(['run', file, '--json']);
    expect(r).toEqual({ code: 2, stdout: '', stderr: `meanward: ${file}: This file is not a plan file: it is not valid JSON.\n` });
  });
  it('a missing file', async () => {
    const file = join(dir, 'nowhere.json');
    expect(await run(['run', file])).toEqual({
      code: 2,
      stdout: '',
      stderr: `meanward: Cannot read the plan file ${JSON.stringify(file)}: there is no such file.\n`,
    });
  });
  it('bad flags, all reported together', async () => {
    const r = await run(['run', demoFile, '--reps', '0', '--seed', '-3', '--fast']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect((await run(['run', demoFile, '--seed'])).stderr).toBe(
      'meanward: --seed (simulation seed) must be a whole number from 0 to 4294967295; got nothing.\n',
    );
    expect(r.stderr.trimEnd().split('\n')).toEqual([
      'meanward: --reps (number of simulated replications) must be a whole number from 2 to 100000; got "0".',
      'meanward: --seed (simulation seed) must be a whole number from 0 to 4294967295; got "-3".',
      'meanward: Unknown option "--fast". "meanward run" takes --json, --reps N, --seed S, --no-sim, --estimates, --max-seconds N and --workers N.',
    ]);
  });
  it('an unknown command, no command, run without a file', async () => {
    expect(await run(['simulate', demoFile])).toEqual({
      code: 2,
      stdout: '',
      stderr: 'meanward: Unknown command "simulate". The commands are "run", "pilot", "methods", "compare", "explore" and "demo"; see "meanward --help".\n',
    });
    expect((await run([])).code).toBe(2);
    expect(await run(['run', '--json'])).toEqual({
      code: 2,
      stdout: '',
      stderr: 'meanward: "meanward run" needs a plan file, e.g. "meanward run plan.json".\n',
    });
  });
});

describe('the installed entry point', () => {
  it('node bin/meanward.mjs demo prints the demo plan, and a bad command exits 2', () => {
    const ok = spawnSync(process.execPath, [join(root, 'bin', 'meanward.mjs'), 'demo'], { cwd: root, encoding: 'utf8' });
    expect(ok.status).toBe(0);
    expect(ok.stdout).toBe(serializePlan(DEMO_PLAN));
    const bad = spawnSync(process.execPath, [join(root, 'bin', 'meanward.mjs'), 'frobnicate'], { cwd: root, encoding: 'utf8' });
    expect(bad.status).toBe(2);
    expect(bad.stdout).toBe('');
    expect(bad.stderr).toContain('Unknown command "frobnicate"');
  });
});

describe('a plan whose matching nobody survives (invented: groups 6 SDs apart, caliper 0.05)', () => {
  const unmatchableFile = (): string => {
    const p = demoPlan();
    p.groups.programme.pretestMean = 20;
    p.groups.comparison.pretestMean = 80;
    p.matching.caliper = 0.05;
    const file = join(dir, 'unmatchable.json');
    writeFileSync(file, serializePlan(p));
    return file;
  };
  it('node bin/meanward.mjs run plan.json --no-sim --json exits 0; the matched difference is not feasible, the others finite', () => {
    const file = unmatchableFile();
    const r = spawnSync(process.execPath, [join(root, 'bin', 'meanward.mjs'), 'run', file, '--no-sim', '--json'], { cwd: root, encoding: 'utf8' });
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    const md = out.analytic.analyses.matchedDifference!;
    expect(md.feasible).toBe(false);
    expect(md.infeasibleReason).toMatch(/widen the caliper/);
    expect(md.power).toBeNull();
    expect(md.falsePositiveRate).toBeNull();
    expect(md.requiredNPerGroup).toBeNull();
    for (const id of ['ancova', 'gainScore', 'correctedAncova']) {
      const a = out.analytic.analyses[id]!;
      expect(a.feasible).toBe(true);
      for (const key of ['se', 'df', 'power', 'falsePositiveRate']) expect(Number.isFinite(a[key]), `${id}.${key}`).toBe(true);
    }
  });
  it('the table shows a dash for its power and false-positive rate and prints the reason', async () => {
    const file = unmatchableFile();
    const r = await run(['run', file, '--no-sim']);
    expect(r.code).toBe(0);
    const name = analysePlannedProcedure(demoPlan()).analyses.matchedDifference!.name;
    const row = r.stdout.split('\n').find((l) => l.startsWith(name))!;
    // SE, power and false-positive rate are dashes; the last column is the expected programme n.
    expect(row.trim().split(/\s{2,}/).slice(-4, -1)).toEqual(['—', '—', '—']);
    expect(r.stdout).toContain(`  ${name}: not feasible. `);
  });
});
