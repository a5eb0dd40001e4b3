// The built command line (dist-cli/, made by `npm run build:cli`): where it is, what it was built
// from, and whether it is current. Plain JavaScript, so bin/meanward.mjs can ask before anything
// is compiled. Used by bin/meanward.mjs (the quick check at every start), scripts/build-cli.mjs
// (build when missing or stale), the build itself (the plugin in vite.cli.config.ts writes
// dist-cli/build-info.json) and test/cli/bundleCurrent.test.ts (the full check).
import { existsSync, readFileSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import vm from 'node:vm';

/** The project folder (this file lives in its bin/). */
export const PROJECT_ROOT = fileURLToPath(new URL('..', import.meta.url));

/** Output folder of the CLI build, relative to the project folder. */
export const CLI_OUT_DIR = 'dist-cli';
/** The built CLI as an ES module, which exports `main` as src/cli/main.ts does. */
export const CLI_BUNDLE = 'dist-cli/meanward.mjs';
/** The same build as CommonJS: what bin/meanward.mjs runs, with the code cache below. */
export const CLI_BUNDLE_CJS = 'dist-cli/meanward.cjs';
/**
 * V8's code cache for CLI_BUNDLE_CJS, written at build time after one `run --no-sim` of the demo
 * plan (scripts/write-cli-code-cache.mjs), so a start skips most parsing and compiling. V8 checks
 * it against the source and its own version and flags, and ignores it when they differ.
 */
export const CLI_CODE_CACHE = 'dist-cli/meanward.cjs.cache';
/** What the build recorded: build time, entries, a digest per source file, the fingerprint. */
export const CLI_BUILD_INFO = 'dist-cli/build-info.json';

/**
 * Entries of the CLI build: output name → source. `meanward` always; the simulation threads'
 * entry only when its source exists (it is built next to the CLI as dist-cli/simulationThread.mjs).
 */
export const CLI_ENTRIES = {
  meanward: 'src/cli/main.ts',
  simulationThread: 'src/sim/pool/simulationThread.ts',
};

/** Files that shape the build besides the bundled sources (dependencies' versions, the build's own code). */
export const CLI_BUILD_INPUTS = ['package-lock.json', 'tsconfig.json', 'vite.cli.config.ts', 'bin/builtCli.mjs'];

/** Version of build-info.json's layout; a file of another version counts as stale. */
export const CLI_BUILD_INFO_FORMAT = 1;

/** The command that rebuilds the CLI, as the notes print it. */
export const REBUILD_COMMAND = 'npm run build:cli';

/**
 * The entries to build now: `meanward`, and every other entry whose source exists.
 * @param {string} [root] project folder
 * @returns {Record<string, string>} output name → source path (relative to root)
 */
export function presentCliEntries(root = PROJECT_ROOT) {
  /** @type {Record<string, string>} */
  const present = {};
  for (const [name, source] of Object.entries(CLI_ENTRIES)) {
    if (name === 'meanward' || existsSync(join(root, source))) present[name] = source;
  }
  return present;
}

// node:crypto loads only when a file needs hashing (usually never at start: see builtCliState).
const require = createRequire(import.meta.url);

/**
 * SHA-256 of a file's bytes (or of a string's UTF-8 bytes), hex.
 * @param {string | Uint8Array} content
 * @returns {string}
 */
export function digestOf(content) {
  /** @type {typeof import('node:crypto')} */
  const crypto = require('node:crypto');
  return crypto.createHash('sha256').update(content).digest('hex');
}

/**
 * The build's fingerprint: SHA-256 over the sorted entry names and the sorted (path, digest)
 * pairs of every file the build read. Two builds from the same files have the same fingerprint.
 * @param {string[]} entries output names of the entries built
 * @param {Record<string, string>} files path relative to the project folder → digest of its bytes
 */
export function fingerprintOf(entries, files) {
  const lines = [`entries ${[...entries].sort().join(',')}`];
  for (const path of Object.keys(files).sort()) lines.push(`${files[path]}  ${path}`);
  return digestOf(lines.join('\n'));
}

/**
 * @typedef {{ format: number, builtAt: number, entries: string[], files: Record<string, string>, fingerprint: string }} CliBuildInfo
 */

/**
 * dist-cli/build-info.json, or null when it is missing or unreadable.
 * @param {string} [root]
 * @returns {CliBuildInfo | null}
 */
export function readCliBuildInfo(root = PROJECT_ROOT) {
  try {
    const info = JSON.parse(readFileSync(join(root, CLI_BUILD_INFO), 'utf8'));
    if (info === null || typeof info !== 'object' || info.format !== CLI_BUILD_INFO_FORMAT) return null;
    if (typeof info.builtAt !== 'number' || !Array.isArray(info.entries) || typeof info.files !== 'object' || info.files === null) return null;
    return info;
  } catch {
    return null;
  }
}

/**
 * The quick check bin/meanward.mjs makes at every start (a few milliseconds): is the built CLI
 * there, built from the entries present now, and does every file it was built from still hold
 * the same bytes? Only files changed on disk since the build (modification time later than the
 * recorded build time) are read and hashed; the rest cost one stat each. A file touched but not
 * changed therefore still counts as current; a changed, removed or (for the threads' entry)
 * added file makes it stale. A new source file matters only once an existing one imports it,
 * and that importing file has then changed.
 * @param {string} [root]
 * @returns {{ state: 'current' } | { state: 'missing' | 'stale', why: string }}
 */
export function builtCliState(root = PROJECT_ROOT) {
  const info = readCliBuildInfo(root);
  if (info === null || !existsSync(join(root, CLI_BUNDLE_CJS))) {
    return { state: 'missing', why: `${CLI_BUNDLE_CJS} or its ${CLI_BUILD_INFO} is not there` };
  }
  const entriesNow = Object.keys(presentCliEntries(root)).sort().join(',');
  if (entriesNow !== [...info.entries].sort().join(',')) {
    return { state: 'stale', why: `it was built for the entries ${info.entries.join(', ')}, and the sources now have ${entriesNow.replace(/,/g, ', ')}` };
  }
  for (const [path, digest] of Object.entries(info.files)) {
    const stat = statSync(join(root, path), { throwIfNoEntry: false });
    if (stat === undefined) return { state: 'stale', why: `${path} is gone since it was built` };
    if (stat.mtimeMs > info.builtAt && digestOf(readFileSync(join(root, path))) !== digest) {
      return { state: 'stale', why: `${path} changed since it was built` };
    }
  }
  return { state: 'current' };
}

/**
 * The full check (for the test and scripts): the fingerprint recorded at build time, the one
 * computed now from the same files read afresh and the entries present now, and the files whose
 * bytes differ. Reads and hashes every file the build read, so it is not for every start.
 * @param {string} [root]
 * @returns {{ recorded: string, now: string, changed: string[], entriesNow: string[] } | null} null when nothing was built
 */
export function cliFingerprintNow(root = PROJECT_ROOT) {
  const info = readCliBuildInfo(root);
  if (info === null) return null;
  /** @type {Record<string, string>} */
  const files = {};
  /** @type {string[]} */
  const changed = [];
  for (const [path, digest] of Object.entries(info.files)) {
    const full = join(root, path);
    files[path] = existsSync(full) ? digestOf(readFileSync(full)) : 'missing';
    if (files[path] !== digest) changed.push(path);
  }
  const entriesNow = Object.keys(presentCliEntries(root));
  return { recorded: info.fingerprint, now: fingerprintOf(entriesNow, files), changed, entriesNow };
}

/**
 * Loads the built CLI (CLI_BUNDLE_CJS) the way Node loads a CommonJS file, but through vm.Script
 * so that V8's code cache (CLI_CODE_CACHE) can be handed to the compiler. Dynamic imports in the
 * sources became require() calls of dist-cli/chunks/*.cjs, resolved next to the bundle.
 * @param {string} [root] project folder
 * @param {{ useCache?: boolean }} [options] useCache false to compile without the cache (to write one)
 * @returns {{ cli: { main: (argv: string[], io: object) => Promise<number> }, script: import('node:vm').Script, codeCache: 'accepted' | 'rejected' | 'absent' }}
 */
export function loadBuiltCli(root = PROJECT_ROOT, options = {}) {
  const file = join(root, CLI_BUNDLE_CJS);
  const source = readFileSync(file, 'utf8');
  let cachedData;
  if (options.useCache !== false) {
    try {
      cachedData = readFileSync(join(root, CLI_CODE_CACHE));
    } catch {
      cachedData = undefined;
    }
  }
  // The wrapper Node itself puts around a CommonJS file (one line, so line numbers stay right).
  const wrapped = `(function (exports, require, module, __filename, __dirname) { ${source}\n})`;
  const script = new vm.Script(wrapped, { filename: file, cachedData });
  const module = { exports: {} };
  script.runInThisContext()(module.exports, createRequire(file), module, file, dirname(file));
  const codeCache = cachedData === undefined ? 'absent' : script.cachedDataRejected ? 'rejected' : 'accepted';
  return { cli: /** @type {any} */ (module.exports), script, codeCache };
}
