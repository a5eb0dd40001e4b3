#!/usr/bin/env node
// Command-line entry: runs the TypeScript CLI through tsx so the CLI uses the
// very same src/core and src/sim code as the browser planner.
import { tsImport } from 'tsx/esm/api';

const cli = await tsImport('../src/cli/main.ts', import.meta.url);
const code = await cli.main(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
});
process.exitCode = code;
