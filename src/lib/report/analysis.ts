/**
 * The review of one exercise as stored: its play record, the scenario's game,
 * and the review computed from them. Reviews are kept per process and computed
 * again when the record changes (a new move, note or inject, a state change).
 */
import { loadPlayRecord, type PlayRecord } from '../exercise/record';
import { reviewPlay, type Review } from '../review';
import { shared } from '../runtime';
import { scenarioGame, type Scenario } from '../scenario';

export type ExerciseReview = { review: Review; record: PlayRecord; scenarioTitle: string };

const CACHE_SIZE = 64;
const cache = () => shared('review.cache', () => new Map<string, { key: string; value: ExerciseReview }>());

function fingerprint(record: PlayRecord): string {
  return JSON.stringify([record.state, record.currentNodeId, record.moves.map((m) => m.id), record.notes.length, record.injects.length, record.scenarioVersionId]);
}

export function reviewRecord(record: PlayRecord): ExerciseReview {
  const scenario = record.document as Scenario;
  return { review: reviewPlay(scenarioGame(scenario), record), record, scenarioTitle: scenario.title };
}

export function exerciseReview(exerciseId: string): ExerciseReview {
  const record = loadPlayRecord(exerciseId);
  const key = fingerprint(record);
  const known = cache().get(exerciseId);
  if (known?.key === key) return { ...known.value, record };
  const value = reviewRecord(record);
  const entries = cache();
  entries.delete(exerciseId);
  entries.set(exerciseId, { key, value });
  if (entries.size > CACHE_SIZE) entries.delete(entries.keys().next().value!);
  return value;
}
