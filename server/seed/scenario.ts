import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { db, schema } from '../../src/db/client';
import type { DemoIds } from './people';

export const DEMO_SCENARIO_FILE = resolve('scenarios/serrin-strait.json');

export type SeededScenario = { scenarioId: string; versionId: string; document: unknown };

export function seedScenario(people: DemoIds): SeededScenario {
  const document = JSON.parse(readFileSync(DEMO_SCENARIO_FILE, 'utf8')) as { title: string };
  const scenarioId = crypto.randomUUID();
  const versionId = crypto.randomUUID();
  db().transaction((tx) => {
    tx.insert(schema.scenario).values({ id: scenarioId, ownerId: people.facilitator, title: document.title }).run();
    tx.insert(schema.scenarioVersion)
      .values({ id: versionId, scenarioId, number: 1, document, createdBy: people.facilitator })
      .run();
  });
  return { scenarioId, versionId, document };
}
