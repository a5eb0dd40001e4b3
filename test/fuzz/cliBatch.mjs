// Test helper: runs the real CLI (src/cli/main.ts, loaded through tsx as
// bin/meanward.mjs does when dist-cli/ is missing or stale; test/cli/bundleCurrent.test.ts
// checks the build prints the same) once per job in ONE process, so a fuzz suite can
// push hundreds of files through the command line without paying Node's and
// tsx's start-up for each. Jobs: a JSON file holding a list of argv lists.
// Prints one JSON line per job: { argv, code, stdout, stderr }.
import { readFileSync } from 'node:fs';
import { tsImport } from 'tsx/esm/api';

const cli = await tsImport('../../src/cli/main.ts', import.meta.url);
const jobs = JSON.parse(readFileSync(process.argv[2], 'utf8'));
for (const argv of jobs) {
  let stdout = '';
  let stderr = '';
  const code = await cli.main(argv, { stdout: { write: (s) => (stdout += s) }, stderr: { write: (s) => (stderr += s) } });
  process.stdout.write(`${JSON.stringify({ argv, code, stdout, stderr })}\n`);
}
