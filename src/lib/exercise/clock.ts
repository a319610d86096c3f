/**
 * The turn clock, as plain values: held (with the time left), running (with a
 * deadline), expired, or none (no time limit, or no team to move). The hub arms
 * a timer for the deadline; the clock itself never reads the time.
 */
import type { ExerciseClock } from '../../db/schema';

export const NO_CLOCK: ExerciseClock = { status: 'none', deadlineAt: null, leftMs: null, resumeOnLive: false };

/** The clock of a new turn: running at once when play is live, else held with the full time. */
export function freshClock(turnSeconds: number | null, live: boolean, now: number): ExerciseClock {
  if (turnSeconds === null) return NO_CLOCK;
  const ms = turnSeconds * 1000;
  return live
    ? { status: 'running', deadlineAt: now + ms, leftMs: null, resumeOnLive: false }
    : { status: 'held', deadlineAt: null, leftMs: ms, resumeOnLive: true };
}

export function startClock(clock: ExerciseClock, now: number): ExerciseClock {
  if (clock.status !== 'held') return clock;
  return { status: 'running', deadlineAt: now + (clock.leftMs ?? 0), leftMs: null, resumeOnLive: false };
}

export function holdClock(clock: ExerciseClock, now: number, resumeOnLive = false): ExerciseClock {
  if (clock.status !== 'running') return clock;
  return { status: 'held', deadlineAt: null, leftMs: Math.max(0, (clock.deadlineAt ?? now) - now), resumeOnLive };
}

export function extendClock(clock: ExerciseClock, seconds: number, now: number): ExerciseClock {
  const ms = seconds * 1000;
  if (clock.status === 'running') return { ...clock, deadlineAt: (clock.deadlineAt ?? now) + ms };
  if (clock.status === 'held') return { ...clock, leftMs: (clock.leftMs ?? 0) + ms };
  if (clock.status === 'expired') return { status: 'running', deadlineAt: now + ms, leftMs: null, resumeOnLive: false };
  return clock;
}

export function isOverdue(clock: ExerciseClock, now: number): boolean {
  return clock.status === 'running' && clock.deadlineAt !== null && clock.deadlineAt <= now;
}
