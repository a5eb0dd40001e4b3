import { mkdtempSync, writeFileSync } from 'node:fs';
import { runCli } from './runCli';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { applyRemedy } from '../../src/core/applyRemedy';
import { PLANNING_CAUTION } from '../../src/cli/formatResultsTable';
import { demoPlan } from '../../src/io/demoPlan';
import { serializePlan } from '../../src/io/planFile';

const run = runCli;

/*
 * Demo plan (invented): within-group reliability .75, beta 0.8, observed gap
 * −10, effect 2.5. Matched-difference artefact beta(1 − rho)Delta = −2.0
 * (Cochran & Rubin 1973, from memory); with four averaged forms rho = 12/13
 * (Spearman 1910; Brown 1910), artefact 0.8·(1/13)·(−10) = −0.615.
 */
let dir = '';
let a = '';
let b = '';
let c = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'meanward-compare-'));
  a = join(dir, 'as-planned.json');
  b = join(dir, 'four-forms.json');
  c = join(dir, 'wide-caliper.json');
  writeFileSync(a, serializePlan(demoPlan()));
  const forms = applyRemedy(demoPlan(), 'more-reliable-pretest');
  const wide = applyRemedy(demoPlan(), 'looser-caliper');
  if (!forms.ok || !wide.ok) throw new Error('remedy not applicable');
  writeFileSync(b, serializePlan(forms.plan));
  writeFileSync(c, serializePlan(wide.plan));
});

describe('meanward compare', () => {
  it('--json prints one array, one object per file, with the artefacts by hand', async () => {
    const r = await run(['compare', a, b, c, '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const rows = JSON.parse(r.stdout) as { file: string; artefact: number; artefactShare: number; discardedShare: number; power: number; caution: string }[];
    expect(Array.isArray(rows)).toBe(true);
    expect(rows.map((x) => x.file)).toEqual([a, b, c]);
    expect(rows[0]!.artefact).toBeCloseTo(-2, 9);
    expect(rows[0]!.artefactShare).toBeCloseTo(-0.8, 9);
    expect(rows[1]!.artefact).toBeCloseTo((0.8 * (1 / 13)) * -10, 9);
    expect(rows[2]!.artefact).toBeCloseTo(-2, 9);
    // A caliper twice as wide discards fewer programme members.
    expect(rows[2]!.discardedShare).toBeLessThan(rows[0]!.discardedShare);
    // A smaller artefact against a positive effect leaves more power.
    expect(rows[1]!.power).toBeGreaterThan(rows[0]!.power);
    expect(rows[0]!.caution).toBe(PLANNING_CAUTION);
  });

  it('prints a table with one row per file, the estimands and the caution', async () => {
    const r = await run(['compare', a, b]);
    expect(r.code).toBe(0);
    const lines = r.stdout.split('\n');
    const rowA = lines.find((l) => l.startsWith(a));
    expect(rowA).toContain('-2.00');
    expect(rowA).toContain('-80.0%');
    expect(lines.find((l) => l.startsWith(b))).toContain('-0.62');
    expect(r.stdout).toContain('Whom each estimate describes:');
    expect(r.stdout).toContain('matched members');
    expect(r.stdout).toContain(PLANNING_CAUTION);
  });

  it('exits 2 with plain messages naming each bad file, all at once', async () => {
    const broken = join(dir, 'broken.json');
    writeFileSync(broken, '{ "format": "meanward-plan", ');
    const missing = join(dir, 'missing.json');
    const r = await run(['compare', a, broken, missing]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    const lines = r.stderr.trim().split('\n');
    expect(lines.length).toBeGreaterThanOrEqual(2);
    expect(lines.some((l) => l.includes('broken.json'))).toBe(true);
    expect(lines.some((l) => l.includes('missing.json'))).toBe(true);
    expect(r.stderr).not.toMatch(/at .*\.ts:\d+/);
  });

  it('exits 2 for one file, seven files or an unknown option', async () => {
    expect((await run(['compare', a])).stderr).toContain('2 to 6 plan files');
    expect((await run(['compare', a, a, a, a, a, a, a])).code).toBe(2);
    const r = await run(['compare', a, b, '--csv']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('Unknown option "--csv"');
  });
});
