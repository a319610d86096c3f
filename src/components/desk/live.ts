/** The React side of the exercise socket: one LiveClient per island, its state as React state; unsent intents kept in the tab over a reload. */
import { useEffect, useState } from 'react';
import { LiveClient, pendingInSession, type LiveState } from '../../lib/exercise/live-client';
import type { Intent } from '../../lib/exercise/protocol';
import type { Snapshot } from '../../lib/exercise/view';

export type Initial = { seq: number; view: Snapshot };
export type Send = (intent: Intent) => Promise<Record<string, unknown>>;

export function useLive(exerciseId: string, initial: Initial): { live: LiveState; view: Snapshot; send: Send } {
  const [client] = useState(() => new LiveClient(exerciseId, initial, undefined, pendingInSession(initial.view.me.userId, exerciseId)));
  const [live, setLive] = useState(client.state);
  useEffect(() => {
    const off = client.subscribe(setLive);
    client.start();
    return () => {
      off();
      client.stop();
    };
  }, [client]);
  return { live, view: live.snapshot ?? initial.view, send: (intent) => client.send(intent) };
}

/** Local time corrected to the server's clock, ticking every quarter second. */
export function useServerNow(offset: number): number | null {
  const [now, setNow] = useState<number | null>(null);
  useEffect(() => {
    const tick = () => setNow(Date.now() + offset);
    tick();
    const timer = setInterval(tick, 250);
    return () => clearInterval(timer);
  }, [offset]);
  return now;
}

/** Run an intent and keep its outcome for the form that sent it. */
export function useIntent(send: Send) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const run = async (intent: Intent, success?: string): Promise<Record<string, unknown> | null> => {
    setBusy(true);
    setError(null);
    setDone(null);
    try {
      const result = await send(intent);
      if (success) setDone(success);
      return result;
    } catch (failure) {
      const fields = (failure as { fields?: { field: string; reason: string }[] }).fields ?? [];
      const details = fields.map((f) => `${f.field}: ${f.reason}`).join('; ');
      setError(`${(failure as Error).message}${details ? ` (${details})` : ''}`);
      return null;
    } finally {
      setBusy(false);
    }
  };
  return { run, busy, error, done, clear: () => (setError(null), setDone(null)) };
}
