import { spawnSync } from 'node:child_process';
import { runCli } from './runCli';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fmtPoints, fmtReliability, PLANNING_CAUTION } from '../../src/cli/formatResultsTable';
import { PILOT_NOTE } from '../../src/cli/pilotTable';
import { DEMO_PILOT_MAPPING, DEMO_PILOT_PATH } from '../../src/pilot/demoPilotCohort';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import type { PilotMapping } from '../../src/pilot/types';

// The CLI formats what estimatePilot computes: each check compares the printed text or JSON
// with estimatePilot's own result on the same file (exact, after the CLI's number formats).

const root = join(__dirname, '..', '..');
const demoFile = join(root, 'public', DEMO_PILOT_PATH);
const mapping = DEMO_PILOT_MAPPING as unknown as PilotMapping;
const demoArgs = [
  'pilot',
  demoFile,
  '--group',
  'group',
  '--programme',
  'reading support',
  '--items',
  'r1,r2,r3,r4,r5,r6,r7,r8',
  '--retest',
  'retest_total',
  '--posttest',
  'posttest_total',
];

const run = runCli;

const expected = () => estimatePilot(parseDelimitedText(readFileSync(demoFile, 'utf8')), mapping, 'invented-pilot-cohort.csv');

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'meanward-pilot-'));
});

describe('meanward pilot (table)', () => {
  it('prints the group rows, gap, reliability with CIs, item–total, the note and the caution', async () => {
    const r = await run(demoArgs);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const est = expected();
    const lines = r.stdout.split('\n');
    const cells = (prefix: string) => lines.find((l) => l.startsWith(prefix))!.slice(prefix.length).trim().split(/\s{2,}/);
    const p = est.groups.programme;
    expect(cells('Programme (reading support)')).toEqual([
      String(p.n),
      fmtPoints(p.pretestMean),
      fmtPoints(p.pretestSD),
      fmtPoints(p.posttestSD!),
      fmtReliability(p.prePostCorrelation!),
      String(p.nPrePost),
    ]);
    const c = est.groups.comparison;
    expect(cells('Comparison (comparison)').slice(0, 3)).toEqual([String(c.n), fmtPoints(c.pretestMean), fmtPoints(c.pretestSD)]);
    expect(r.stdout).toContain(
      `Gap, programme minus comparison: ${fmtPoints(est.gap.points)} points, SMD ${fmtPoints(est.gap.smd)} (pooled within-group SD ${fmtPoints(est.pooledWithinSD)})`,
    );
    const a = est.reliability.alpha!;
    expect(cells("  Cronbach's alpha, within groups")).toEqual([
      fmtReliability(a.value),
      `${fmtReliability(a.lower)} to ${fmtReliability(a.upper)}`,
      `n = ${a.n}, 8 items (Feldt CI)`,
    ]);
    const t = est.reliability.testRetest!;
    expect(cells('  Test–retest, within groups')).toEqual([fmtReliability(t.value), `${fmtReliability(t.lower)} to ${fmtReliability(t.upper)}`, `n = ${t.n} (Fisher z CI)`]);
    expect(cells('  Split-half (odd–even), Spearman–Brown')[0]).toBe(fmtReliability(est.reliability.splitHalf!.spearmanBrown));
    expect(cells('  r4')).toEqual([fmtReliability(est.itemTotal![3]!.correctedCorrelation)]);
    expect(r.stdout).toContain(est.droppedReason);
    expect(r.stdout).toContain(PILOT_NOTE);
    expect(r.stdout.trimEnd().endsWith(PLANNING_CAUTION)).toBe(true);
  });
  it('lists warnings in plain words', async () => {
    const file = join(dir, 'small.csv');
    writeFileSync(file, 'group,score\nA,1\nA,3\nA,4\nB,2\nB,5\nB,5\n');
    const r = await run(['pilot', file, '--group', 'group', '--programme', 'A', '--pretest', 'score']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Warnings\n  - The programme group ("A") has 3 usable rows, fewer than 30');
    expect(r.stdout).toContain('Reliability of the pretest\n  none: map item columns (--items) or a retest column (--retest) to estimate it.');
  });
});

describe('meanward pilot --json', () => {
  it('prints the estimates object (groups, reliability.alpha, alphaByGroup, splitHalf, testRetest, prePostCorrelation) with the note and caution', async () => {
    const r = await run([...demoArgs, '--json']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const json = JSON.parse(r.stdout);
    const { note, caution, ...rest } = json;
    expect(note).toBe(PILOT_NOTE);
    expect(caution).toBe(PLANNING_CAUTION);
    expect(rest).toEqual(JSON.parse(JSON.stringify(expected())));
    for (const g of ['programme', 'comparison']) {
      for (const k of ['n', 'pretestMean', 'pretestSD']) expect(typeof json.groups[g][k]).toBe('number');
      for (const k of ['value', 'lower', 'upper']) expect(typeof json.reliability.alphaByGroup[g][k]).toBe('number');
    }
    for (const k of ['value', 'lower', 'upper']) expect(typeof json.reliability.alpha[k]).toBe('number');
    expect(Object.keys(json.reliability.splitHalf)).toEqual(['halfCorrelation', 'spearmanBrown', 'n']);
    expect(Object.keys(json.reliability.testRetest)).toEqual(['value', 'lower', 'upper', 'level', 'n']);
    expect(Object.keys(json.prePostCorrelation)).toEqual(['value', 'n']);
  });
  it('reads a tab-separated file with --delimiter tab, and a file without header with --no-header', async () => {
    const tsv = join(dir, 'p.tsv');
    writeFileSync(tsv, 'g\tx\nA\t1\nA\t2\nA\t4\nB\t3\nB\t3\nB\t5\n');
    const r = await run(['pilot', tsv, '--group', 'g', '--programme', 'A', '--pretest', 'x', '--delimiter', 'tab', '--json']);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).groups.programme.pretestMean).toBeCloseTo(7 / 3, 12);
    const bare = join(dir, 'bare.csv');
    writeFileSync(bare, 'A,1\nA,2\nA,4\nB,3\nB,3\nB,5\n');
    const r2 = await run(['pilot', bare, '--group', 'column 1', '--programme', 'A', '--pretest', 'column 2', '--no-header', '--json']);
    expect(r2.code).toBe(0);
    expect(JSON.parse(r2.stdout).groups.comparison.pretestMean).toBeCloseTo(11 / 3, 12);
  });
});

describe('meanward pilot: bad input gives exit code 2 and the message on stderr', () => {
  it('a command line without group, programme or pretest lists every problem', async () => {
    const r = await run(['pilot', demoFile]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe(
      'meanward: --group COLUMN is required: the column that says which group each row is in.\n' +
        'meanward: --programme VALUE is required: the value of the group column that marks the programme group.\n' +
        'meanward: The pretest is required: --pretest COLUMN (a total score) or --items COL,COL,... (item scores).\n',
    );
  });
  it('both --pretest and --items, a bad --delimiter, --combine without items, an unknown option', async () => {
    const r = await run(['pilot', demoFile, '--group', 'group', '--programme', 'x', '--pretest', 'r1', '--items', 'r1,r2', '--delimiter', '|', '--frob']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--delimiter must be "," (comma), "tab" or ";" (semicolon); got "|".');
    expect(r.stderr).toContain('Unknown option "--frob".');
    expect(r.stderr).toContain('either as --pretest COLUMN (a total score) or as --items COL,COL,...; not both.');
    const r2 = await run(['pilot', demoFile, '--group', 'group', '--programme', 'x', '--pretest', 'r1', '--combine', 'mean']);
    expect(r2.stderr).toBe('meanward: --combine applies to --items only.\n');
  });
  it('a missing file', async () => {
    const r = await run(['pilot', join(dir, 'nope.csv'), '--group', 'g', '--programme', 'A', '--pretest', 'x']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^meanward: Cannot read the pilot file ".*nope\.csv": there is no such file\.\n$/);
  });
  it('a programme value not in the file names the values found', async () => {
    const args = [...demoArgs];
    args[5] = 'Reading support';
    const r = await run(args);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe(
      `meanward: ${demoFile}: The programme value "Reading support" does not occur in the group column "group". The values found are "comparison" (136 rows) and "reading support" (104 rows).\n`,
    );
  });
  it('an empty file, a binary file, and a non-numeric cell (column and row named)', async () => {
    const empty = join(dir, 'empty.csv');
    writeFileSync(empty, '');
    expect((await run(['pilot', empty, '--group', 'g', '--programme', 'A', '--pretest', 'x'])).stderr).toContain('The file is empty.');
    const binary = join(dir, 'book.xlsx');
    writeFileSync(binary, Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00, 0x08, 0x00]));
    const rb = await run(['pilot', binary, '--group', 'g', '--programme', 'A', '--pretest', 'x']);
    expect(rb.code).toBe(2);
    expect(rb.stderr).toContain('This is not a text file: it contains NUL bytes');
    const text = join(dir, 'typo.csv');
    writeFileSync(text, 'g,x\nA,1\nA,2\nB,3o\nB,4\n');
    const rt = await run(['pilot', text, '--group', 'g', '--programme', 'A', '--pretest', 'x']);
    expect(rt.code).toBe(2);
    expect(rt.stderr).toContain('Column "x" must hold numbers, but row 4 holds "3o".');
  });
  it('through bin/meanward.mjs: exit 0 with JSON, exit 2 with the message', () => {
    const ok = spawnSync(process.execPath, [join(root, 'bin', 'meanward.mjs'), ...demoArgs, '--json'], { cwd: root, encoding: 'utf8' });
    expect(ok.status).toBe(0);
    expect(JSON.parse(ok.stdout).rowsRead).toBe(240);
    const bad = spawnSync(process.execPath, [join(root, 'bin', 'meanward.mjs'), 'pilot', demoFile, '--group', 'grp', '--programme', 'A', '--pretest', 'r1'], {
      cwd: root,
      encoding: 'utf8',
    });
    expect(bad.status).toBe(2);
    expect(bad.stdout).toBe('');
    expect(bad.stderr).toContain('The group column "grp" is not in the file.');
  });
});
