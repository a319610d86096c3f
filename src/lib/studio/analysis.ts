/**
 * Studio analyses as jobs: each runs in the solver pool (server/solver) with
 * progress and cancellation, and is followed by the page over Server-Sent
 * Events. Jobs live in memory (one registry per process, through shared()),
 * belong to the user who started them, and are forgotten a while after they end.
 */
import { pathToFileURL } from 'node:url';
import { resolve } from 'node:path';
import type { AnalysisJob, Fault } from '../engine';
import { HttpError, type FieldError } from '../http';
import { scenarioGame, type Scenario } from '../scenario';
import { shared } from '../runtime';
import type { Actor } from '../access';
import type { JobEvent, StudioJob } from './analysis-types';
import { faultFields } from './document';

type PoolModule = typeof import('../../../server/solver/pool');

/**
 * The pool must be loaded from its source: its worker file sits beside it, and
 * a copy inside the Astro bundle would not find it. The server runs under tsx,
 * so the TypeScript source loads as it is; Node's module cache makes it one
 * pool per process whichever side imports it.
 */
function solverModule(): Promise<PoolModule> {
  const url = pathToFileURL(resolve('server/solver/pool.ts')).href;
  return shared('studio.solver', () => import(/* @vite-ignore */ url) as Promise<PoolModule>);
}

const KEEP_MS = 10 * 60_000;
const MAX_RUNNING_PER_USER = 4;

type Listener = (event: JobEvent) => void;

type Job = {
  id: string;
  userId: string;
  scenarioId: string;
  analysis: StudioJob['analysis'];
  startedAt: number;
  last: JobEvent;
  controller: AbortController;
  listeners: Set<Listener>;
};

const jobs = () => shared('studio.jobs', () => new Map<string, Job>());

/** The engine job for a Studio request, built from the document the author has open. */
export function engineJob(document: Scenario, job: StudioJob): AnalysisJob {
  const game = scenarioGame(document);
  switch (job.analysis) {
    case 'equilibria':
      return { analysis: 'equilibria', game, exact: job.exact, maxListed: job.maxListed ?? 8 };
    case 'credibility':
      if (document.marks.length === 0) throw new HttpError(400, 'Mark a threat or a promise on the tree first', [{ field: 'marks', reason: 'none marked' }]);
      return { analysis: 'credibility', game, marks: document.marks, exact: job.exact };
    case 'sensitivity':
      return { analysis: 'sensitivity', game, exact: job.exact };
    case 'monte-carlo':
      if (document.payoffRanges.length === 0) throw new HttpError(400, 'Give at least one payoff a range first', [{ field: 'payoffRanges', reason: 'none given' }]);
      return {
        analysis: 'monte-carlo',
        game,
        ranges: document.payoffRanges.map((r) => ({ terminalId: r.nodeId, team: r.team, distribution: r.distribution })),
        samples: job.samples,
        seed: job.seed,
      };
    case 'qre':
      return { analysis: 'qre', game, lambda: job.lambda };
    case 'belief':
      return { analysis: 'belief', game, nodeId: job.nodeId, team: job.team, restrained: job.restrained, lambda: job.lambda };
    case 'agreement':
      return { analysis: 'agreement', stage: job.stage, gamma: job.gamma, steps: job.steps };
  }
}

function emit(job: Job, event: JobEvent): void {
  job.last = event;
  for (const listener of job.listeners) listener(event);
  if (event.type !== 'progress') {
    job.listeners.clear();
    setTimeout(() => jobs().delete(job.id), KEEP_MS).unref();
  }
}

function failure(error: unknown): JobEvent {
  const e = error as { kind?: string; message?: string; faults?: Fault[] };
  if (e.kind === 'cancelled') return { type: 'cancelled' };
  if (e.kind === 'invalid-game') {
    const fields: FieldError[] = faultFields((e.faults ?? []).map((f) => ({ path: f.path.replace(/^root/, 'tree'), message: f.message })));
    return { type: 'failed', message: 'The game has faults; fix them before analysing it.', fields };
  }
  return { type: 'failed', message: `The analysis could not finish: ${e.message ?? String(error)}` };
}

export async function startJob(actor: Actor, scenarioId: string, document: Scenario, request: StudioJob): Promise<string> {
  const running = [...jobs().values()].filter((j) => j.userId === actor.id && j.last.type === 'progress');
  if (running.length >= MAX_RUNNING_PER_USER) {
    throw new HttpError(429, `You have ${running.length} analyses running; wait for one to finish or cancel it`);
  }
  const engine = engineJob(document, request);
  const { runSolve } = await solverModule();
  const job: Job = {
    id: crypto.randomUUID(),
    userId: actor.id,
    scenarioId,
    analysis: request.analysis,
    startedAt: Date.now(),
    last: { type: 'progress', fraction: 0, phase: 'queued' },
    controller: new AbortController(),
    listeners: new Set(),
  };
  jobs().set(job.id, job);
  runSolve(engine, { signal: job.controller.signal, onProgress: ({ fraction, phase }) => emit(job, { type: 'progress', fraction, phase }) }).then(
    (result) => emit(job, { type: 'done', result, seconds: (Date.now() - job.startedAt) / 1000 }),
    (error) => emit(job, failure(error)),
  );
  return job.id;
}

function ownJob(actor: Actor, jobId: string): Job {
  const job = jobs().get(jobId);
  // Someone else's job is reported as missing, so that job ids reveal nothing.
  if (!job || job.userId !== actor.id) throw new HttpError(404, 'No such analysis (it may have finished more than ten minutes ago)');
  return job;
}

export function jobStatus(actor: Actor, jobId: string): JobEvent {
  return ownJob(actor, jobId).last;
}

export function cancelJob(actor: Actor, jobId: string): JobEvent {
  const job = ownJob(actor, jobId);
  if (job.last.type === 'progress') job.controller.abort();
  return job.last;
}

/** Events of a job from now on; the current state first. Returns the unsubscribe function. */
export function followJob(actor: Actor, jobId: string, listener: Listener): () => void {
  const job = ownJob(actor, jobId);
  listener(job.last);
  if (job.last.type !== 'progress') return () => undefined;
  job.listeners.add(listener);
  return () => job.listeners.delete(listener);
}
