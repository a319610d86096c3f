/**
 * What live play needs from a frozen scenario version (src/lib/scenario.ts):
 * its game tree, its teams and their briefs, and the pre-authored injects.
 * Frozen versions never change, so each is read once per process.
 */
import { eq } from 'drizzle-orm';
import { db, schema } from '../../db/client';
import type { Game } from '../engine';
import { shared } from '../runtime';
import { scenarioGame, type RichText, type Scenario } from '../scenario';
import { plainText } from './rich-text';

export type AuthoredInject = { id: string; nodeId: string | null; title: string; body: string; to: string[] | 'all'; attachmentIds: string[] };

export type ScenarioInfo = {
  versionId: string;
  scenarioId: string;
  title: string;
  setting: string;
  /** The brief every participant reads. */
  brief: RichText | null;
  document: Scenario;
  game: Game;
  teams: { id: string; name: string; colour: string | null; brief: RichText | null }[];
  /** The rung the crisis stands on before any move, when the tree came from a ladder. */
  startRung: number | null;
  injects: AuthoredInject[];
};

const cache = () => shared('exercise.scenario-cache', () => new Map<string, ScenarioInfo>());

export function scenarioInfo(versionId: string): ScenarioInfo {
  const known = cache().get(versionId);
  if (known) return known;
  const row = db().select().from(schema.scenarioVersion).where(eq(schema.scenarioVersion.id, versionId)).get();
  if (!row) throw new Error(`scenario version ${versionId} does not exist`);
  const info = readScenario(row.id, row.scenarioId, row.document as Scenario);
  if (row.status === 'frozen') cache().set(versionId, info);
  return info;
}

/** The parts of a stored document (it passed the scenario checks before it could be frozen). */
export function readScenario(versionId: string, scenarioId: string, document: Scenario): ScenarioInfo {
  return {
    versionId,
    scenarioId,
    title: document.title,
    setting: document.setting,
    brief: document.brief ?? null,
    document,
    game: scenarioGame(document),
    teams: document.teams.map((t) => ({ id: t.id, name: t.name, colour: t.colour ?? null, brief: t.brief ?? null })),
    startRung: document.ladder?.start ?? null,
    injects: document.injects.map((i) => ({ id: i.id, nodeId: i.nodeId, title: i.title, body: plainText(i.body), to: i.to, attachmentIds: [] })),
  };
}
