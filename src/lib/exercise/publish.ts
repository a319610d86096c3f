/**
 * How a committed change reaches connected clients: the exercise hub
 * (server/live) registers itself in the runtime registry under HUB; service
 * functions hand it each commit. Without a running hub (a script, a unit test)
 * commits are simply not broadcast.
 */
import { lookup } from '../runtime';
import type { Committed } from './commit';

export const HUB = 'exercise-hub';

export type Publisher = { publish(committed: Committed): void };

export function publish(committed: Committed | null): void {
  if (committed && !committed.duplicate) lookup<Publisher>(HUB)?.publish(committed);
}
