/**
 * The review of one exercise: its play record, the scenario's game, and the
 * review computed from them. The engine's heavy parts (the subgame-perfect
 * solve and the lambda fit, seconds on a large tree) run in the solver pool so
 * that live play never waits; the result is kept in memory and in SQLite,
 * keyed by a fingerprint of the record, and computed again only when play changes.
 */
import { eq } from 'drizzle-orm';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { db, schema } from '../../db/client';
import type { LogitFit, SubgamePerfectResult } from '../engine';
import { loadPlayRecord, type PlayRecord } from '../exercise/record';
import { engineObservations, observationsOf, reviewPlay, type Review } from '../review';
import { shared } from '../runtime';
import { scenarioGame, type Scenario } from '../scenario';

export type ExerciseReview = { review: Review; record: PlayRecord; scenarioTitle: string };

/** Change when the review's computation or shape changes, so stored reviews are made again. */
const REVIEW_FORMAT = 'review/5';
const MEMORY_SIZE = 64;

type PoolModule = typeof import('../../../server/solver/pool');

/** The solver pool lives in the Node entry; the Astro bundle reaches it the way the Studio does. */
function solverPool(): Promise<PoolModule> {
  const url = pathToFileURL(resolve('server/solver/pool.ts')).href;
  return shared('review.solver', () => import(/* @vite-ignore */ url) as Promise<PoolModule>);
}

const memory = () => shared('review.memory', () => new Map<string, { key: string; review: Review }>());
const inFlight = () => shared('review.in-flight', () => new Map<string, Promise<Review>>());

export function fingerprint(record: PlayRecord): string {
  return JSON.stringify([REVIEW_FORMAT, record.scenarioVersionId, record.state, record.currentNodeId, record.moves.map((m) => [m.id, m.label]), record.ending?.moveId ?? null, record.notes.map((n) => n.id), record.injects.map((i) => i.id)]);
}

function remember(exerciseId: string, key: string, review: Review): void {
  const entries = memory();
  entries.delete(exerciseId);
  entries.set(exerciseId, { key, review });
  if (entries.size > MEMORY_SIZE) entries.delete(entries.keys().next().value!);
}

function stored(exerciseId: string, key: string): Review | null {
  const row = db().select().from(schema.reviewCache).where(eq(schema.reviewCache.exerciseId, exerciseId)).get();
  return row && row.fingerprint === key ? (row.review as Review) : null;
}

function store(exerciseId: string, key: string, review: Review): void {
  db()
    .insert(schema.reviewCache)
    .values({ exerciseId, fingerprint: key, review, computedAt: new Date() })
    .onConflictDoUpdate({ target: schema.reviewCache.exerciseId, set: { fingerprint: key, review, computedAt: new Date() } })
    .run();
}

async function compute(record: PlayRecord): Promise<Review> {
  const game = scenarioGame(record.document as Scenario);
  const { runSolve } = await solverPool();
  const observations = engineObservations(observationsOf(record.moves));
  const [solved, fit] = await Promise.all([
    runSolve<SubgamePerfectResult>({ analysis: 'equilibria', game }),
    runSolve<LogitFit>({ analysis: 'logit-fit', game, observations }),
  ]);
  return reviewPlay(game, record, { solved, fit });
}

export async function exerciseReview(exerciseId: string): Promise<ExerciseReview> {
  const record = loadPlayRecord(exerciseId);
  const scenarioTitle = (record.document as Scenario).title;
  const key = fingerprint(record);
  const known = memory().get(exerciseId);
  if (known?.key === key) return { review: known.review, record, scenarioTitle };
  const saved = stored(exerciseId, key);
  if (saved) {
    remember(exerciseId, key, saved);
    return { review: saved, record, scenarioTitle };
  }
  const flightKey = `${exerciseId}\u0000${key}`;
  let running = inFlight().get(flightKey);
  if (!running) {
    running = compute(record).finally(() => inFlight().delete(flightKey));
    inFlight().set(flightKey, running);
  }
  const review = await running;
  store(exerciseId, key, review);
  remember(exerciseId, key, review);
  return { review, record, scenarioTitle };
}
