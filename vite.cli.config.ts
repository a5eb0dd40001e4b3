import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { isAbsolute, join, relative, sep } from 'node:path';
import { defineConfig, type Plugin } from 'vite';
import {
  CLI_BUILD_INFO,
  CLI_BUILD_INFO_FORMAT,
  CLI_BUILD_INPUTS,
  CLI_OUT_DIR,
  PROJECT_ROOT,
  digestOf,
  fingerprintOf,
  presentCliEntries,
  type CliBuildInfo,
} from './bin/builtCli.mjs';

/**
 * The command line's own build (`npm run build:cli`; `npm ci` runs it through `prepare`, and
 * `npm start` / `npm test` when it is missing or stale): src/cli/main.ts for Node 20
 * in dist-cli/, so bin/meanward.mjs starts without compiling TypeScript. See DEVELOPERS.md,
 * "The built command line".
 *
 * - Two outputs of the same modules: ES modules (dist-cli/meanward.mjs, exporting `main` as
 *   src/cli/main.ts does) and CommonJS (dist-cli/meanward.cjs), which bin/meanward.mjs runs through
 *   vm.Script with V8's code cache, dist-cli/meanward.cjs.cache (cliCodeCachePlugin below), because
 *   that measured about a sixth faster to start than importing the ES module (Node 20 has no code
 *   cache for ES modules).
 * - Dependencies are bundled too, so nothing is resolved in node_modules at start (measured:
 *   faster than leaving them external; npm run bench reports cliStartRatio).
 * - What `run` does not need (the pilot reader, the methods text and its Word writer) is a
 *   dynamic import in src/cli, so it lands in dist-cli/chunks/ and loads only when used.
 * - When the simulation threads' entry (src/sim/pool/simulationThread.ts) exists it is built too,
 *   as dist-cli/simulationThread.mjs next to the CLI, where the pool looks for it
 *   (bin/builtCli.mjs: CLI_ENTRIES, presentCliEntries).
 * - dist-cli/build-info.json records what the bundle was built from (cliBuildInfoPlugin below).
 */
const entries = presentCliEntries(PROJECT_ROOT);

export default defineConfig({
  root: PROJECT_ROOT,
  publicDir: false,
  logLevel: 'warn',
  plugins: [cliBuildInfoPlugin(PROJECT_ROOT, Object.keys(entries)), cliCodeCachePlugin(PROJECT_ROOT)],
  resolve: {
    alias: {
      // svg2pdf.js' `main` is a UMD bundle; use its ES build (as the Vitest config does).
      'svg2pdf.js': 'svg2pdf.js/dist/svg2pdf.es.min.js',
    },
  },
  ssr: { noExternal: true, target: 'node' },
  build: {
    ssr: true,
    outDir: CLI_OUT_DIR,
    emptyOutDir: true,
    target: 'node20',
    // Readable output (file names in the rare stack trace); minifying saved little start-up time.
    minify: false,
    sourcemap: false,
    copyPublicDir: false,
    // build-info.json is an asset, which an SSR build drops unless told otherwise.
    ssrEmitAssets: true,
    reportCompressedSize: false,
    rolldownOptions: {
      input: entries,
      output: [
        { format: 'es', entryFileNames: '[name].mjs', chunkFileNames: 'chunks/[name]-[hash].mjs' },
        { format: 'cjs', entryFileNames: '[name].cjs', chunkFileNames: 'chunks/[name]-[hash].cjs' },
      ],
    },
  },
});

/**
 * Vite plugin of the CLI build (vite.cli.config.ts): writes dist-cli/build-info.json with the
 * build time (taken when the build starts, before any source is read), the entries built, a
 * SHA-256 digest of every project file the bundle was made from (taken from the very text the
 * build read, before any transform: the plugin runs first) plus the build's own inputs
 * (package-lock.json, tsconfig.json, this config, bin/builtCli.mjs), and the
 * fingerprint over them (bin/builtCli.mjs: fingerprintOf). bin/meanward.mjs compares against it
 * at start; test/cli/bundleCurrent.test.ts recomputes it.
 *
 * @param root the project folder
 * @param entries output names of the entries this build makes
 */
function cliBuildInfoPlugin(root: string, entries: string[]): Plugin {
  let builtAt = 0;
  const files: Record<string, string> = {};
  return {
    name: 'meanward-cli-build-info',
    apply: 'build',
    enforce: 'pre',
    buildStart() {
      builtAt = Date.now();
      for (const k of Object.keys(files)) delete files[k];
      for (const path of CLI_BUILD_INPUTS) files[path] = digestOf(readFileSync(join(root, path)));
    },
    transform(code, id) {
      const path = projectFile(root, id);
      if (path !== null) files[path] = digestOf(code);
      return null;
    },
    generateBundle() {
      const info: CliBuildInfo = { format: CLI_BUILD_INFO_FORMAT, builtAt, entries: [...entries].sort(), files: sorted(files), fingerprint: fingerprintOf(entries, files) };
      this.emitFile({ type: 'asset', fileName: relative(CLI_OUT_DIR, CLI_BUILD_INFO), source: `${JSON.stringify(info, null, 2)}\n` });
    },
  };
}

/** A module id as a project path with forward slashes ("src/cli/main.ts"), or null for dependencies and virtual modules. */
function projectFile(root: string, id: string): string | null {
  if (id.startsWith('\0')) return null;
  const file = id.split('?')[0] as string;
  if (!isAbsolute(file)) return null;
  const rel = relative(root, file);
  if (rel.startsWith('..') || isAbsolute(rel)) return null;
  const path = rel.split(sep).join('/');
  return path.startsWith('node_modules/') ? null : path;
}

function sorted(files: Record<string, string>): Record<string, string> {
  return Object.fromEntries(Object.keys(files).sort().map((k) => [k, files[k] as string]));
}

/**
 * Vite plugin of the CLI build: once both outputs are written, runs scripts/write-cli-code-cache.mjs
 * in a fresh `node` (so V8's flags are those of an ordinary start), which writes
 * dist-cli/meanward.cjs.cache. A failure there fails the build.
 */
function cliCodeCachePlugin(root: string): Plugin {
  return {
    name: 'meanward-cli-code-cache',
    apply: 'build',
    closeBundle() {
      const r = spawnSync(process.execPath, [join(root, 'scripts', 'write-cli-code-cache.mjs')], { cwd: root, encoding: 'utf8', env: { ...process.env, NODE_OPTIONS: '' } });
      if (r.status !== 0) throw new Error(`writing the code cache of the built command line failed: ${r.stderr || r.error?.message || `exit ${r.status}`}`);
    },
  };
}
