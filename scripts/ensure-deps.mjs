// `npm start` runs this first: install dependencies when they are missing,
// so a fresh clone starts with one command, and build the command line when needed.
import { existsSync } from 'node:fs';
import { execSync, spawnSync } from 'node:child_process';

const needed = ['vite', 'react', 'd3', 'jstat', 'zustand', 'zod'];
const missing = needed.filter((name) => !existsSync(`node_modules/${name}/package.json`));
if (missing.length > 0) {
  console.log(`Meanward: installing dependencies (missing: ${missing.join(', ')}) ...`);
  execSync('npm ci --no-audit --no-fund', { stdio: 'inherit' });
}

// The built command line (dist-cli/): build it when missing or stale for the sources.
const cli = spawnSync(process.execPath, ['scripts/build-cli.mjs', '--if-needed'], { stdio: 'inherit' });
if (cli.status !== 0) process.exit(cli.status ?? 1);
