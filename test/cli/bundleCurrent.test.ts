import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  builtCliState,
  CLI_BUILD_INFO,
  CLI_BUILD_INFO_FORMAT,
  CLI_BUNDLE,
  CLI_BUNDLE_CJS,
  CLI_ENTRIES,
  cliFingerprintNow,
  digestOf,
  fingerprintOf,
  PROJECT_ROOT,
  readCliBuildInfo,
} from '../../bin/builtCli.mjs';

// The built command line (dist-cli/, vite.cli.config.ts) must be current for the sources and
// print exactly what the sources print through tsx. This test builds nothing: `npm test` (and
// `npm run test:unit`) build dist-cli first when it is missing or stale, `npm ci` builds it too.
const REBUILD = 'The built command line in dist-cli/ is missing or out of date: run npm run build:cli';
const bin = join(PROJECT_ROOT, 'bin', 'meanward.mjs');
const demoPlanFile = join(PROJECT_ROOT, 'public', 'examples', 'demo-falls-prevention.json');
const pilotArgs = [
  'pilot',
  join(PROJECT_ROOT, 'public', 'examples', 'pilot', 'invented-pilot-cohort.csv'),
  '--group', 'group', '--programme', 'reading support',
  '--items', 'r1,r2,r3,r4,r5,r6,r7,r8', '--retest', 'retest_total', '--posttest', 'posttest_total',
];

/** `node bin/meanward.mjs ...`, from the built bundle or (fromSource) from the sources through tsx. */
function meanward(args: string[], fromSource: boolean): { status: number | null; stdout: string; stderr: string } {
  const env = { ...process.env, MEANWARD_CLI_FROM_SOURCE: fromSource ? '1' : '0' };
  const r = spawnSync(process.execPath, [bin, ...args], { cwd: PROJECT_ROOT, encoding: 'utf8', env });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('the built command line (dist-cli/)', () => {
  it('is current: the fingerprint recorded at build time equals the one computed now from the same files', () => {
    const now = cliFingerprintNow();
    expect(now, REBUILD).not.toBeNull();
    expect(now!.changed, `${REBUILD} (changed since the build: ${now!.changed.join(', ')})`).toEqual([]);
    expect(now!.now, REBUILD).toBe(now!.recorded);
    // The quick check bin/meanward.mjs makes at start agrees.
    expect(builtCliState(), REBUILD).toEqual({ state: 'current' });
    // It was built from the CLI's own sources (and this file's siblings are among them).
    const info = readCliBuildInfo()!;
    expect(Object.keys(info.files)).toContain('src/cli/main.ts');
    expect(Object.keys(info.files)).toContain('package-lock.json');
  });

  it('prints exactly what the sources print through tsx: run <demo plan> --no-sim --json', () => {
    const built = meanward(['run', demoPlanFile, '--no-sim', '--json'], false);
    const source = meanward(['run', demoPlanFile, '--no-sim', '--json'], true);
    expect(built.stderr, REBUILD).toBe('');
    expect(built.status).toBe(0);
    expect(source.status).toBe(0);
    expect(built.stdout).toBe(source.stdout);
    // Not an empty agreement: the output is the demo plan's full set of figures.
    expect(JSON.parse(built.stdout).analytic.analyses.ancova.expectedEstimate).toEqual(expect.any(Number));
  });

  it('prints exactly what the sources print through tsx: pilot on the invented demo pilot file (a chunk loaded on use)', () => {
    const built = meanward(pilotArgs, false);
    const source = meanward(pilotArgs, true);
    expect(built.stderr, REBUILD).toBe('');
    expect(built.status).toBe(0);
    expect(source.status).toBe(0);
    expect(built.stdout).toBe(source.stdout);
    expect(built.stdout).toContain('240 rows read');
  });

  it('keeps what `run` does not need out of the start: the Word writer and the pilot reader are chunks of their own', () => {
    for (const [file, ext] of [[CLI_BUNDLE, 'mjs'], [CLI_BUNDLE_CJS, 'cjs']] as const) {
      const bundle = readFileSync(join(PROJECT_ROOT, file), 'utf8');
      // The build is not minified, so each bundled module starts with a comment naming its path.
      expect(bundle, file).toContain('// src/cli/main.ts');
      expect(bundle, file).not.toContain('// node_modules/docx/');
      expect(bundle, file).not.toContain('// src/cli/methodsDocx.ts');
      expect(bundle, file).not.toContain('// src/pilot/estimatePilot.ts');
      const chunks = readdirSync(join(PROJECT_ROOT, 'dist-cli', 'chunks'));
      expect(chunks.some((f) => f.startsWith('methodsDocx-') && f.endsWith(`.${ext}`)), file).toBe(true);
      expect(chunks.some((f) => f.startsWith('pilotCommand-') && f.endsWith(`.${ext}`)), file).toBe(true);
    }
  });

  it('starts from V8\u2019s code cache made at build time: a plain `node` accepts it', () => {
    const script = `import { loadBuiltCli } from ${JSON.stringify(join(PROJECT_ROOT, 'bin', 'builtCli.mjs'))}; process.stdout.write(loadBuiltCli().codeCache);`;
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { cwd: PROJECT_ROOT, encoding: 'utf8', env: { ...process.env, NODE_OPTIONS: '' } });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout, REBUILD).toBe('accepted');
  });

  it('the ES module form of the build (dist-cli/meanward.mjs) prints the same as the CommonJS form bin/meanward.mjs runs', () => {
    const args = ['run', demoPlanFile, '--no-sim', '--json'];
    const script = `const cli = await import(${JSON.stringify(join(PROJECT_ROOT, CLI_BUNDLE))}); process.exitCode = await cli.main(${JSON.stringify(args)}, { stdout: process.stdout, stderr: process.stderr });`;
    const esm = spawnSync(process.execPath, ['--input-type=module', '-e', script], { cwd: PROJECT_ROOT, encoding: 'utf8' });
    expect(esm.status, esm.stderr).toBe(0);
    expect(esm.stdout).toBe(meanward(args, false).stdout);
  });

  it('builds the simulation threads\u2019 entry next to the CLI when its source exists', () => {
    const present = existsSync(join(PROJECT_ROOT, CLI_ENTRIES.simulationThread));
    expect(existsSync(join(PROJECT_ROOT, 'dist-cli', 'simulationThread.mjs'))).toBe(present);
    expect(readCliBuildInfo()!.entries.includes('simulationThread')).toBe(present);
  });
});

describe('the quick check at start (builtCliState) on a made-up project folder', () => {
  const root = mkdtempSync(join(tmpdir(), 'meanward-built-cli-'));
  afterAll(() => rmSync(root, { recursive: true, force: true }));
  const write = (path: string, text: string): void => {
    mkdirSync(dirname(join(root, path)), { recursive: true });
    writeFileSync(join(root, path), text);
  };
  /** Sets a file's modification time, in ms since 1970. */
  const setTime = (path: string, ms: number): void => utimesSync(join(root, path), ms / 1000, ms / 1000);

  it('says current, then stale or missing exactly when the recorded files or entries differ', () => {
    expect(builtCliState(root).state).toBe('missing');
    write('src/cli/main.ts', 'export const a = 1;\n');
    write('src/core/b.ts', 'export const b = 2;\n');
    write(CLI_BUNDLE_CJS, '// built\n');
    const builtAt = Date.now() - 60_000;
    const files = { 'src/cli/main.ts': digestOf('export const a = 1;\n'), 'src/core/b.ts': digestOf('export const b = 2;\n') };
    write(CLI_BUILD_INFO, JSON.stringify({ format: CLI_BUILD_INFO_FORMAT, builtAt, entries: ['meanward'], files, fingerprint: fingerprintOf(['meanward'], files) }));
    setTime('src/cli/main.ts', builtAt - 1000);
    setTime('src/core/b.ts', builtAt - 1000);
    expect(builtCliState(root)).toEqual({ state: 'current' });
    expect(cliFingerprintNow(root)).toMatchObject({ changed: [], now: fingerprintOf(['meanward'], files) });

    // Touched after the build but the same bytes: still current (it is hashed, not trusted by time).
    setTime('src/core/b.ts', builtAt + 1000);
    expect(builtCliState(root)).toEqual({ state: 'current' });

    // Changed after the build: stale, naming the file.
    write('src/core/b.ts', 'export const b = 3;\n');
    expect(builtCliState(root)).toEqual({ state: 'stale', why: 'src/core/b.ts changed since it was built' });

    // Changed, but dated before the build (a clock set back): the quick check trusts the time,
    // the full check (this test's first case) still catches it.
    setTime('src/core/b.ts', builtAt - 1000);
    expect(builtCliState(root)).toEqual({ state: 'current' });
    const full = cliFingerprintNow(root)!;
    expect(full.changed).toEqual(['src/core/b.ts']);
    expect(full.now).not.toBe(full.recorded);
    write('src/core/b.ts', 'export const b = 2;\n');
    setTime('src/core/b.ts', builtAt - 1000);

    // A recorded file removed: stale.
    rmSync(join(root, 'src/cli/main.ts'));
    expect(builtCliState(root)).toEqual({ state: 'stale', why: 'src/cli/main.ts is gone since it was built' });
    write('src/cli/main.ts', 'export const a = 1;\n');
    expect(builtCliState(root)).toEqual({ state: 'current' });

    // The simulation threads' entry appears: the build lacks an entry, so stale.
    write(CLI_ENTRIES.simulationThread, 'export {};\n');
    expect(builtCliState(root).state).toBe('stale');
    expect(cliFingerprintNow(root)!.now).not.toBe(cliFingerprintNow(root)!.recorded);
    rmSync(join(root, CLI_ENTRIES.simulationThread));

    // The bundle itself removed, or a build record of another layout: missing.
    rmSync(join(root, CLI_BUNDLE_CJS));
    expect(builtCliState(root).state).toBe('missing');
    write(CLI_BUNDLE_CJS, '// built\n');
    write(CLI_BUILD_INFO, JSON.stringify({ format: CLI_BUILD_INFO_FORMAT + 1, builtAt, entries: ['meanward'], files }));
    expect(builtCliState(root).state).toBe('missing');
  });
});
