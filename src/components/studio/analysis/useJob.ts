/**
 * One analysis run on the server's worker pool, seen from the page: start it,
 * follow its progress over Server-Sent Events, cancel it. Starting a new run
 * (or leaving) cancels the one before, so stale results never arrive late.
 */
import { useCallback, useEffect, useRef, useState } from 'react';
import { api, describeError, ApiError, type FieldError } from '../../../lib/client/api';
import type { JobEvent, StudioJob } from '../../../lib/studio/analysis-types';

export type JobState<R> =
  | { status: 'idle' }
  | { status: 'running'; fraction: number; phase: string }
  | { status: 'done'; result: R; seconds: number }
  | { status: 'failed'; message: string; fields: FieldError[] }
  | { status: 'cancelled' };

/** A JSON body, so that the request is not taken for a cross-site form post. */
const cancelOnServer = (jobId: string) => api(`/api/scenarios/jobs/${jobId}`, { method: 'DELETE', json: {} }).catch(() => undefined);

export function useJob<R>(scenarioId: string) {
  const [state, setState] = useState<JobState<R>>({ status: 'idle' });
  const current = useRef<{ id: string | null; source: EventSource | null; token: number }>({ id: null, source: null, token: 0 });

  const stop = useCallback((tell: boolean) => {
    const running = current.current;
    running.source?.close();
    if (running.id && tell) void cancelOnServer(running.id);
    running.id = null;
    running.source = null;
    running.token++;
  }, []);

  const start = useCallback(
    async (document: unknown, job: StudioJob) => {
      stop(true);
      const token = current.current.token;
      setState({ status: 'running', fraction: 0, phase: 'starting' });
      try {
        const { jobId } = await api<{ jobId: string }>(`/api/scenarios/${scenarioId}/analysis`, { method: 'POST', json: { document, job } });
        if (current.current.token !== token) {
          void cancelOnServer(jobId);
          return;
        }
        const source = new EventSource(`/api/scenarios/jobs/${jobId}/events`);
        current.current.id = jobId;
        current.current.source = source;
        source.onmessage = (message) => {
          if (current.current.token !== token) return;
          const event = JSON.parse(message.data as string) as JobEvent<R>;
          if (event.type === 'progress') setState({ status: 'running', fraction: event.fraction, phase: event.phase });
          else {
            source.close();
            current.current.id = null;
            if (event.type === 'done') setState({ status: 'done', result: event.result, seconds: event.seconds });
            else if (event.type === 'failed') setState({ status: 'failed', message: event.message, fields: event.fields ?? [] });
            else setState({ status: 'cancelled' });
          }
        };
        source.onerror = () => {
          if (current.current.token !== token || source.readyState !== EventSource.CLOSED) return;
          setState({ status: 'failed', message: 'Lost the connection to the analysis; run it again.', fields: [] });
        };
      } catch (error) {
        if (current.current.token !== token) return;
        setState({ status: 'failed', message: describeError(error), fields: error instanceof ApiError ? error.fields : [] });
      }
    },
    [scenarioId, stop],
  );

  const cancel = useCallback(() => {
    stop(true);
    setState({ status: 'cancelled' });
  }, [stop]);

  useEffect(() => () => stop(true), [stop]);
  return { state, start, cancel };
}
