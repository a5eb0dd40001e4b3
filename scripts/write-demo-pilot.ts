// Writes the invented demo pilot file (public/examples/pilot/invented-pilot-cohort.csv)
// from src/pilot/demoPilotCohort.ts, so the committed file never drifts (a test compares them).
// INVENTED DATA: no real pupils, school or programme. Run: npx tsx scripts/write-demo-pilot.ts
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEMO_PILOT_PATH, demoPilotCohortCsv } from '../src/pilot/demoPilotCohort';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const target = join(root, 'public', DEMO_PILOT_PATH);
mkdirSync(dirname(target), { recursive: true });
writeFileSync(target, demoPilotCohortCsv());
console.log(`Wrote the invented demo pilot file ${join('public', DEMO_PILOT_PATH)}.`);
