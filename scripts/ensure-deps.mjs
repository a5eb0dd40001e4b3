// `npm start` runs this first: install dependencies when they are missing,
// so a fresh clone starts with one command.
import { existsSync } from 'node:fs';
import { execSync } from 'node:child_process';

const needed = ['vite', 'react', 'd3', 'jstat', 'zustand', 'zod'];
const missing = needed.filter((name) => !existsSync(`node_modules/${name}/package.json`));
if (missing.length > 0) {
  console.log(`Meanward: installing dependencies (missing: ${missing.join(', ')}) ...`);
  execSync('npm ci --no-audit --no-fund', { stdio: 'inherit' });
}
