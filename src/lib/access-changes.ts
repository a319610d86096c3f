/**
 * Access changes that open sockets must act on at once: a deactivated account,
 * a session signed out,
 * a seat taken away or changed, an exercise's settings. The change is made in
 * one copy of our modules (an endpoint in the Astro bundle, a hub intent in
 * server/) and the sockets are kept by the other (server/sockets.ts), so the
 * listeners live in the process-wide registry (see runtime.ts).
 */
import { shared } from './runtime';

export type AccessChange =
  /** The person can no longer sign in: every socket of theirs closes. */
  | { kind: 'account-closed'; userId: string; reason: string }
  /** One sign-in ended (signed out, expired): the sockets opened with it close. */
  | { kind: 'session-ended'; sessionId: string; reason: string }
  /** A seat or the settings of an exercise changed: its sockets (of this person; of everyone when null) ask the access rules again. */
  | { kind: 'exercise-access'; exerciseId: string; userId: string | null };

type Listener = (change: AccessChange) => void;

const listeners = () => shared('access-change-listeners', () => new Set<Listener>());

/** Tell every listener; called after the change is committed, and never fails the caller. */
export function announceAccessChange(change: AccessChange): void {
  for (const listener of listeners()) {
    try {
      listener(change);
    } catch (error) {
      console.error('[access] a listener failed on', change, error);
    }
  }
}

export function onAccessChange(listener: Listener): () => void {
  listeners().add(listener);
  return () => listeners().delete(listener);
}
