import { db, schema } from '../../src/db/client';
import type { Scenario } from '../../src/lib/scenario';
import { summaryOf } from '../../src/lib/studio/document';
import { demoScenario } from './demo-scenario';
import type { DemoIds } from './people';

export type SeededScenario = { scenarioId: string; versionId: string; document: Scenario };

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
