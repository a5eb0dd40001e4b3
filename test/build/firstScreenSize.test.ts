// The built page: the first screen's size (what index.html loads before any user action), that
// its paths are relative (any static host, any sub-path), and that the service worker precaches
// every built file (offline use). Builds the page once into a temporary folder (a few seconds).
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { build } from 'vite';
import {
  FIRST_SCREEN_BUDGET_KB,
  FIRST_SCREEN_LIMIT_KB,
  firstScreenFiles,
  firstScreenLine,
  firstScreenSize,
} from '../../scripts/build/firstScreenSize';

let dist: string;

beforeAll(async () => {
  dist = mkdtempSync(join(tmpdir(), 'meanward-build-'));
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production'; // Vitest sets "test"; the page is built as for release.
  try {
    await build({ configFile: 'vite.config.ts', mode: 'production', logLevel: 'silent', build: { outDir: dist, emptyOutDir: true } });
  } finally {
    process.env.NODE_ENV = nodeEnv;
  }
}, 120_000);

afterAll(() => rmSync(dist, { recursive: true, force: true }));

function allFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? allFiles(p) : [relative(dist, p)];
  });
}

describe('the first screen', () => {
  it('is the entry script, its static imports and the stylesheet; the deferred panels, the pilot reader, the PDF and the workers are not in it', () => {
    const files = firstScreenFiles(dist);
    const html = readFileSync(join(dist, 'index.html'), 'utf8');
    const entry = html.match(/<script type="module" crossorigin src="\.\/(assets\/index-[^"]+\.js)"/)?.[1];
    expect(entry).toBeDefined();
    expect(files).toContain(entry);
    expect(files.some((f) => /^assets\/index-.+\.css$/.test(f))).toBe(true);
    for (const lazy of ['ComparisonTable-', 'RemediesPanel-', 'ChartsPanel-', 'MethodsPanel-', 'VariantsPanel-', 'PilotBody-', 'ExportPanel-', 'buildReportPdf-', 'worker-', 'pilotWorker-', 'svgHelpers-']) {
      expect(files.filter((f) => f.includes(lazy)), lazy).toEqual([]);
      // …and each of those really is a separate file of the build (so the check above can fail).
      expect(allFiles(dist).some((f) => f.includes(lazy)), lazy).toBe(true);
    }
  });

  it('carries neither jStat nor ml-matrix (the closed forms use verbatim copies of the few functions they need)', () => {
    // A string each library keeps in its minified code: jStat's F distribution, ml-matrix's Matrix constructor check.
    const markers = { jStat: 'centralF', 'ml-matrix': 'nColumns must be' };
    const firstScreen = firstScreenFiles(dist).filter((f) => f.endsWith('.js')).map((f) => readFileSync(join(dist, f), 'utf8'));
    const lazyJs = allFiles(dist).filter((f) => f.endsWith('.js') && !firstScreenFiles(dist).includes(f)).map((f) => readFileSync(join(dist, f), 'utf8'));
    for (const [library, marker] of Object.entries(markers)) {
      expect(firstScreen.some((code) => code.includes(marker)), library).toBe(false);
      // …while the workers that simulate still carry the library itself (so the check can fail).
      expect(lazyJs.some((code) => code.includes(marker)), library).toBe(true);
    }
  });

  it('leaves out the engines for covariates, clusters and selection rules, the explorer\'s actions and core, and the pilot reader\'s actions', () => {
    // A string each moved module keeps in its minified code (a message or a key of its own).
    const markers = {
      'covariate checks (src/core/multivariate/covariateModelProblems.ts)': 'Raise the reliabilities or check the correlation',
      'cluster model (src/core/clusters/clusterModel.ts)': 'part of the true-score variance',
      'cluster remedies (src/core/clusters/clusterRemedies.ts)': 'Match on a cluster mean of the people who will sit the posttest',
      'selection closed forms (src/core/design/analyseSelectionPlan.ts)': 'A sharp cut-off on the pretest leaves no overlap',
      'explorer core (src/core/explore/exploreSpec.ts)': 'are allowed (use fewer steps)',
      "explorer's actions (src/state/explorerSlice.ts)": 'The explorer cannot simulate in this browser',
      'pilot plan update (src/pilot/pilotPlanUpdate.ts)': 'it breaks a plan rule',
      "pilot reader's actions (src/state/pilotSlice.ts)": 'meanward.pilotMapping.v1',
    };
    const first = firstScreenFiles(dist);
    const firstScreen = first.filter((f) => f.endsWith('.js')).map((f) => readFileSync(join(dist, f), 'utf8'));
    const lazyJs = allFiles(dist).filter((f) => f.endsWith('.js') && !first.includes(f)).map((f) => readFileSync(join(dist, f), 'utf8'));
    for (const [module, marker] of Object.entries(markers)) {
      expect(firstScreen.some((code) => code.includes(marker)), module).toBe(false);
      // …and each is in a chunk the page loads later (so the check above can fail).
      expect(lazyJs.some((code) => code.includes(marker)), module).toBe(true);
    }
    // The engines' chunk is its own file, loaded with import() (src/state/pageEngines.ts).
    expect(allFiles(dist).some((f) => /^assets\/allEngines-[\w-]+\.js$/.test(f))).toBe(true);
    expect(first.some((f) => f.includes('allEngines-'))).toBe(false);
  });

  it(`stays within its budget of ${FIRST_SCREEN_BUDGET_KB} kB gzip (goal ${FIRST_SCREEN_LIMIT_KB} kB)`, () => {
    const { files, totalKb } = firstScreenSize(dist);
    // The sizes are real gzip streams of the files: each inflates back to the file (zlib, RFC 1952).
    for (const f of files) {
      const bytes = readFileSync(join(dist, f.file));
      expect(gunzipSync(gzipSync(bytes)).equals(bytes)).toBe(true);
      expect(f.gzipBytes).toBeGreaterThan(0);
      expect(f.gzipBytes).toBeLessThan(bytes.length);
    }
    console.log(firstScreenLine(totalKb), files.map((f) => `${f.file} ${(f.gzipBytes / 1000).toFixed(1)} kB`).join(', '));
    expect(totalKb).toBeLessThanOrEqual(FIRST_SCREEN_BUDGET_KB);
  });
});

describe('any static host, any sub-path', () => {
  it('index.html refers to every file by a relative path', () => {
    const html = readFileSync(join(dist, 'index.html'), 'utf8');
    const refs = [...html.matchAll(/\b(?:src|href)="([^"]+)"/g)].map((m) => m[1]!);
    expect(refs.length).toBeGreaterThanOrEqual(3);
    for (const r of refs) expect(r, r).toMatch(/^\.\//);
  });
});

describe('offline use', () => {
  it('the service worker precaches every built file, and nothing from elsewhere', () => {
    const sw = readFileSync(join(dist, 'sw.js'), 'utf8');
    const precached = new Set([...sw.matchAll(/\burl:"([^"]+)"/g)].map((m) => m[1]!));
    const built = allFiles(dist).filter((f) => f !== 'sw.js' && !/^workbox-[\w-]+\.js$/.test(f));
    expect(built.length).toBeGreaterThan(30);
    expect(built.filter((f) => !precached.has(f))).toEqual([]);
    for (const url of precached) expect(url, url).not.toMatch(/^[a-z]+:|^\//i);
    // No runtime caching and no navigation fallback: the worker answers only for the precached files.
    expect(sw).not.toMatch(/registerRoute|NavigationRoute|NetworkFirst|StaleWhileRevalidate|CacheFirst/);
    // A new version waits for the page's go-ahead (the update notice's Reload button).
    expect(sw).toMatch(/"SKIP_WAITING"===\w+\.data\.type&&self\.skipWaiting\(\)/);
    expect(sw.match(/skipWaiting\(\)/g)).toHaveLength(1);
  });
});
