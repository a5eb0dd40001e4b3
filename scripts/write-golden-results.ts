/**
 * Writes test/fixtures/golden/existing-plans.json: for every built-in example
 * plan and a few variants (propensity, Mahalanobis, replacement), the closed
 * forms, the planned-procedure figures and a short seeded simulation. The
 * test test/core/existingPlansUnchanged.test.ts checks that later versions give
 * the same numbers bit for bit (every value recorded here is compared exactly).
 * Run only when a change of the numbers is intended: npx tsx scripts/write-golden-results.ts
 */
import { writeFileSync } from 'node:fs';
import { goldenCases, goldenOutputs } from '../test/fixtures/goldenCases';

const out: Record<string, unknown> = {};
for (const c of goldenCases()) out[c.id] = goldenOutputs(c.plan);
writeFileSync('test/fixtures/golden/existing-plans.json', JSON.stringify(out) + '\n');
console.log(`wrote ${Object.keys(out).length} cases`);
