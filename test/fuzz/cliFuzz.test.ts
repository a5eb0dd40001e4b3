import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { pilotCase } from './pilotFiles';
import { firstNonFinite, planMutation, PROGRAM_TEXT, RAW_CONTROL } from './planMutations';

// Seeded fuzz through the real command line (seed fixed; 260 plan files and 60
// pilot files; about 20–40 s on 2 cores). Most go through test/fuzz/cliBatch.mjs,
// which runs src/cli/main.ts in one Node process per batch exactly as
// bin/meanward.mjs does (reading the files, printing, exit codes), two batches
// at a time; a few go through bin/meanward.mjs itself. Pools are capped at 300
// so the quick simulation of each plan stays short. Rule: exit 0 with finite
// numbers, or exit 2 with plain lines on stderr (docs/plan-file.md); tolerance: none.

const root = join(__dirname, '..', '..');
interface Outcome {
  argv: string[];
  code: number;
  stdout: string;
  stderr: string;
}

function runBatch(dir: string, name: string, jobs: string[][]): Promise<Outcome[]> {
  const jobsFile = join(dir, `${name}.jobs.json`);
  writeFileSync(jobsFile, JSON.stringify(jobs));
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [join(root, 'test', 'fuzz', 'cliBatch.mjs'), jobsFile], { cwd: root });
    let out = '';
    let err = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (err += d));
    child.on('error', reject);
    child.on('close', (code) => {
      if (code !== 0) reject(new Error(`batch ${name} exited ${code}: ${err}`));
      else resolve(out.trim().split('\n').map((l) => JSON.parse(l) as Outcome));
    });
  });
}

function checkOutcome(o: Outcome, what: string): 'ok' | 'refused' {
  const label = `${what} → exit ${o.code}: ${o.stderr.slice(0, 300)}`;
  expect([0, 2], label).toContain(o.code);
  if (o.code === 0) {
    expect(firstNonFinite(JSON.parse(o.stdout)), label).toBeNull();
    return 'ok';
  }
  const lines = o.stderr.trimEnd().split('\n');
  expect(lines.length, label).toBeGreaterThan(0);
  expect(lines.length, label).toBeLessThanOrEqual(51);
  for (const l of lines) {
    expect(l, label).toMatch(/^meanward: \S/);
    expect(l, label).not.toMatch(PROGRAM_TEXT);
    expect(l, label).not.toMatch(RAW_CONTROL);
  }
  return 'refused';
}

describe('fuzz: plan and pilot files through the real CLI', () => {
  it('260 mutated plans (240 --no-sim --json, 20 with 3 replications) and 60 pilot files: exit 0 with finite numbers or exit 2 with plain lines', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'meanward-cli-fuzz-'));
    const plans = fc.sample(planMutation({ maxPool: 300 }), { seed: 4191, numRuns: 260 });
    const jobs = plans.map((m, i) => {
      const f = join(dir, `plan${i}.json`);
      writeFileSync(f, JSON.stringify(m.plan));
      return i < 240 ? ['run', f, '--no-sim', '--json'] : ['run', f, '--reps', '3', '--json'];
    });
    const pilots = fc.sample(pilotCase, { seed: 4192, numRuns: 60 });
    const pilotJobs = pilots.map((c, i) => {
      const f = join(dir, `pilot${i}.csv`);
      writeFileSync(f, c.text);
      const p = c.mapping.pretest;
      return [
        'pilot', f, '--group', 'group', '--programme', 'club',
        ...(p.kind === 'total' ? ['--pretest', p.column] : ['--items', p.columns.join(','), '--combine', p.combine]),
        ...(c.mapping.retest ? ['--retest', c.mapping.retest] : []),
        ...(c.mapping.posttest ? ['--posttest', c.mapping.posttest] : []),
        '--json',
      ];
    });
    const all = [...jobs, ...pilotJobs];
    const half = Math.ceil(all.length / 2);
    const [a, b] = await Promise.all([runBatch(dir, 'a', all.slice(0, half)), runBatch(dir, 'b', all.slice(half))]);
    const outcomes = [...a, ...b];
    expect(outcomes).toHaveLength(all.length);
    const tally = { ok: 0, refused: 0 };
    outcomes.forEach((o, i) => {
      const what = i < plans.length ? plans[i]!.changes : pilots[i - plans.length]!.describe;
      tally[checkOutcome(o, what)]++;
    });
    // Both outcomes are exercised.
    expect(tally.ok).toBeGreaterThan(40);
    expect(tally.refused).toBeGreaterThan(100);

    // A few through the installed entry point itself (bin/meanward.mjs), same rule.
    for (const i of [0, 1, 2, 3]) {
      const r = spawnSync(process.execPath, [join(root, 'bin', 'meanward.mjs'), ...jobs[i]!], { cwd: root, encoding: 'utf8' });
      expect(r.status).toBe(outcomes[i]!.code);
      checkOutcome({ argv: jobs[i]!, code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr }, plans[i]!.changes);
    }
  }, 180_000);
});
