// Writes the plan file's JSON Schema (public/meanward-plan.schema.json) and
// the built-in example plans (public/examples/<id>.json) from the TypeScript
// sources, so the committed files never drift. Run: npx tsx scripts/write-plan-schema.ts
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { planJsonSchema } from '../src/core/planSchema';
import { EXAMPLE_PLANS } from '../src/io/examplePlans';
import { serializePlan } from '../src/io/planFile';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
writeFileSync(join(root, 'public', 'meanward-plan.schema.json'), `${JSON.stringify(planJsonSchema(), null, 2)}\n`);
mkdirSync(join(root, 'public', 'examples'), { recursive: true });
for (const ex of EXAMPLE_PLANS) {
  writeFileSync(join(root, 'public', 'examples', `${ex.id}.json`), serializePlan(ex.plan));
}
console.log(`Wrote the plan schema and ${EXAMPLE_PLANS.length} example plans.`);
