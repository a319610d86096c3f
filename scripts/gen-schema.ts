/**
 * Writes scenarios/schema.json, the JSON Schema of a scenario document, from the zod
 * schemas in src/lib/scenario.ts. Run after changing those schemas:
 *   node --import tsx scripts/gen-schema.ts
 * A unit test fails when the committed file is stale.
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { scenarioJsonSchemaText } from '../src/lib/scenario';

const target = fileURLToPath(new URL('../scenarios/schema.json', import.meta.url));
writeFileSync(target, scenarioJsonSchemaText());
console.log(`wrote ${target}`);
