// Writes V8's code cache for the built CLI (dist-cli/meanward.cjs.cache), run by the CLI build
// (vite.cli.config.ts) in a fresh `node` right after the bundle is written: it loads the bundle
// without a cache, runs `run <demo plan> --no-sim` once with its output discarded, so the
// functions a start needs are compiled, and saves the compiled code. bin/meanward.mjs hands it to
// V8, which uses it only when the source, V8's version and its flags match (otherwise it compiles
// as usual: slower to start, same results).
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { CLI_CODE_CACHE, loadBuiltCli, PROJECT_ROOT } from '../bin/builtCli.mjs';

const { cli, script } = loadBuiltCli(PROJECT_ROOT, { useCache: false });
const discard = { write: () => true };
const plan = join(PROJECT_ROOT, 'public', 'examples', 'demo-falls-prevention.json');
const code = await cli.main(['run', plan, '--no-sim'], { stdout: discard, stderr: discard });
if (code !== 0) {
  console.error(`meanward: the built command line failed on the demo plan (exit ${code}); no code cache written.`);
  process.exit(1);
}
writeFileSync(join(PROJECT_ROOT, CLI_CODE_CACHE), script.createCachedData());
