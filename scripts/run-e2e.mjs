// Runs the browser suite (Playwright + Debian's Chromium). Kept apart from
// Vitest so neither runner picks up the other's files.
import { existsSync, readdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';

const specs = existsSync('test/e2e') ? readdirSync('test/e2e').filter((f) => f.endsWith('.spec.ts')) : [];
if (specs.length === 0) {
  console.log('e2e: no browser specs yet (test/e2e/*.spec.ts)');
  process.exit(0);
}
const chromium = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
if (!existsSync(chromium)) {
  console.error(`e2e: Chromium not found at ${chromium}. Install Debian's chromium (apt-get install -y chromium) or set CHROMIUM_PATH.`);
  process.exit(1);
}
const r = spawnSync('npx', ['playwright', 'test', ...process.argv.slice(2)], { stdio: 'inherit' });
process.exit(r.status ?? 1);
