// Builds the command line (vite.cli.config.ts → dist-cli/), as `npm run build:cli` does.
//   node scripts/build-cli.mjs              build
//   node scripts/build-cli.mjs --if-needed  build only when dist-cli/ is missing or stale for the
//                                           sources (npm start and npm test's unit step)
//   node scripts/build-cli.mjs --prepare    npm's `prepare` (after npm ci / npm install): build, but
//                                           if Vite is not installed (an install without dev
//                                           dependencies) or the build fails, say so and carry on:
//                                           bin/meanward.mjs then runs the sources through tsx.
import { join } from 'node:path';
import { builtCliState, PROJECT_ROOT, REBUILD_COMMAND } from '../bin/builtCli.mjs';

const ifNeeded = process.argv.includes('--if-needed');
const prepare = process.argv.includes('--prepare');

if (ifNeeded) {
  const state = builtCliState();
  if (state.state === 'current') process.exit(0);
  console.log(`meanward: building the command line (${state.state}: ${state.why}) ...`);
}

try {
  const { build } = await import('vite');
  await build({ configFile: join(PROJECT_ROOT, 'vite.cli.config.ts'), logLevel: 'warn' });
  const after = builtCliState();
  if (after.state !== 'current') throw new Error(`the build finished but dist-cli is ${after.state} (${after.why})`);
  console.log('meanward: built the command line in dist-cli/ (bin/meanward.mjs runs it).');
} catch (err) {
  const why = err instanceof Error ? err.message : String(err);
  if (!prepare) {
    console.error(`meanward: building the command line failed: ${why}`);
    process.exit(1);
  }
  console.error(`meanward: the command line was not built (${why.split('\n')[0]}); it will run from the sources through tsx, which starts slower. Build it later with: ${REBUILD_COMMAND}`);
}
