/**
 * A solver worker thread: runs one engine analysis per task and posts progress through
 * the MessagePort it is handed. Failures come back as data, so that the pool can tell a
 * bad game (with its faults) from any other failure.
 */
import type { MessagePort } from 'node:worker_threads';
import { InvalidGame, runAnalysis, type AnalysisJob, type Fault } from '../../src/lib/engine/index.ts';

export interface WorkerTask {
  job: AnalysisJob;
  port?: MessagePort;
}

export type WorkerReply =
  | { ok: true; result: unknown }
  | { ok: false; kind: 'invalid-game'; message: string; faults: Fault[] }
  | { ok: false; kind: 'failed'; message: string };

/** Progress messages are sent at most this often, plus the final one. */
const PROGRESS_INTERVAL_MS = 100;

export default function solve({ job, port }: WorkerTask): WorkerReply {
  let last = 0;
  const progress = port
    ? (fraction: number, phase: string) => {
        const now = Date.now();
        if (fraction < 1 && now - last < PROGRESS_INTERVAL_MS) return;
        last = now;
        port.postMessage({ fraction, phase });
      }
    : undefined;
  try {
    return { ok: true, result: runAnalysis(job, progress) };
  } catch (e) {
    if (e instanceof InvalidGame) return { ok: false, kind: 'invalid-game', message: e.message, faults: e.faults };
    return { ok: false, kind: 'failed', message: (e as Error).message };
  } finally {
    port?.close();
  }
}
