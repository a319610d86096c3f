import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { db, schema } from '../../src/db/client';
import { parseScenario, type Scenario } from '../../src/lib/scenario';
import { summaryOf } from '../../src/lib/studio/document';
import type { DemoIds } from './people';

export const DEMO_SCENARIO_FILE = resolve('scenarios/serrin-strait.json');

export type SeededScenario = { scenarioId: string; versionId: string; document: Scenario };

/** The demo scenario, checked like any import: a demo with faults stops the seed with every fault listed. */
export function demoScenario(): Scenario {
  const parsed = parseScenario(JSON.parse(readFileSync(DEMO_SCENARIO_FILE, 'utf8')));
  if (!parsed.ok) {
    const faults = parsed.faults.map((f) => `  ${f.path}: ${f.message}`).join('\n');
    throw new Error(`The demo scenario ${DEMO_SCENARIO_FILE} is not valid:\n${faults}`);
  }
  return parsed.scenario;
}

export function seedScenario(people: DemoIds): SeededScenario {
  const document = demoScenario();
  const scenarioId = crypto.randomUUID();
  const versionId = crypto.randomUUID();
  db().transaction((tx) => {
    tx.insert(schema.scenario)
      .values({ id: scenarioId, ownerId: people.facilitator, title: document.title, summary: summaryOf(document) })
      .run();
    tx.insert(schema.scenarioVersion).values({ id: versionId, scenarioId, number: 1, document, createdBy: people.facilitator }).run();
    tx.insert(schema.scenarioChange)
      .values({ id: crypto.randomUUID(), versionId, userId: people.facilitator, summary: 'Created from the demo file', paths: [] })
      .run();
  });
  return { scenarioId, versionId, document };
}
