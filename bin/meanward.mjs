#!/usr/bin/env node
// Command-line entry. Runs the built CLI (dist-cli/meanward.cjs, made from src/cli/main.ts by
// `npm run build:cli`, which `npm ci` runs) when it is there and current for the sources, so no
// TypeScript is compiled at start. Otherwise, or with MEANWARD_CLI_FROM_SOURCE=1, it runs the
// TypeScript sources through tsx as before (slower to start, same code and results) after a
// one-line note on stderr. Both paths run the very same src/core and src/sim code as the planner.
import { builtCliState, loadBuiltCli, REBUILD_COMMAND } from './builtCli.mjs';

/** @type {{ main: (argv: string[], io: object) => Promise<number> }} */
let cli;
const state = process.env.MEANWARD_CLI_FROM_SOURCE === '1' ? null : builtCliState();
if (state?.state === 'current') {
  // The CommonJS form of the build with V8's code cache (see bin/builtCli.mjs, loadBuiltCli).
  cli = loadBuiltCli().cli;
} else {
  if (state !== null) {
    process.stderr.write(`meanward: the built command line is ${state.state} (${state.why}); running from the sources, which starts slower. Rebuild it with: ${REBUILD_COMMAND}\n`);
  }
  const { tsImport } = await import('tsx/esm/api');
  cli = await tsImport('../src/cli/main.ts', import.meta.url);
}
const code = await cli.main(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
});
process.exitCode = code;
