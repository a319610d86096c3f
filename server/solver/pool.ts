/**
 * The solver pool: engine analyses run in worker threads (piscina) so that live play
 * never waits on them. Jobs are plain data; progress comes back as fractions 0..1 with
 * a phase label; an AbortSignal cancels (a running job's worker is stopped).
 *
 * Workers load TypeScript through tsx. The server runs under `node --import tsx` and
 * workers inherit that; where the parent was started otherwise (vitest, plain node) the
 * pool adds `--import tsx` to the workers' execArgv.
 */
import { availableParallelism } from 'node:os';
import { MessageChannel } from 'node:worker_threads';
import Piscina from 'piscina';
import type { AnalysisJob, Fault } from '../../src/lib/engine/index.ts';
import type { WorkerReply, WorkerTask } from './worker.ts';

export interface SolveProgress {
  fraction: number;
  phase: string;
}

export interface SolveOptions {
  onProgress?: (progress: SolveProgress) => void;
  signal?: AbortSignal;
}

export type SolveErrorKind = 'invalid-game' | 'failed' | 'cancelled';

export class SolveError extends Error {
  constructor(
    readonly kind: SolveErrorKind,
    message: string,
    readonly faults: Fault[] = [],
  ) {
    super(message);
  }
}

/** One worker by default on a two-core machine, leaving a core to the server; RUNGWISE_SOLVER_THREADS overrides. */
function threadCount(): number {
  const configured = Number(process.env.RUNGWISE_SOLVER_THREADS);
  if (Number.isInteger(configured) && configured > 0) return configured;
  return Math.max(1, Math.min(2, availableParallelism() - 1));
}

function workerExecArgv(): string[] {
  const argv = process.execArgv;
  const hasTsx = argv.some((arg, i) => (arg === '--import' || arg === '--loader' || arg === '--require') && /tsx/.test(argv[i + 1] ?? '')) || argv.some((arg) => /^--(import|loader|require)=.*tsx/.test(arg));
  return hasTsx ? argv : [...argv, '--import', 'tsx'];
}

let pool: Piscina<WorkerTask, WorkerReply> | null = null;

// piscina infers its transfer-list type from the last postMessage overload of @types/node, which is the options object.
type TransferList = NonNullable<NonNullable<Parameters<Piscina['run']>[1]>['transferList']>;

function solverPool(): Piscina<WorkerTask, WorkerReply> {
  pool ??= new Piscina<WorkerTask, WorkerReply>({
    filename: new URL('./worker.ts', import.meta.url).href,
    minThreads: 0,
    maxThreads: threadCount(),
    idleTimeout: 60_000,
    execArgv: workerExecArgv(),
  });
  return pool;
}

/** Run one analysis in the pool. Rejects with SolveError. */
export async function runSolve<R = unknown>(job: AnalysisJob, options: SolveOptions = {}): Promise<R> {
  if (options.signal?.aborted) throw new SolveError('cancelled', 'the solve was cancelled before it started');
  const channel = new MessageChannel();
  channel.port1.on('message', (message: SolveProgress) => options.onProgress?.(message));
  try {
    const reply = await solverPool().run(
      { job, port: channel.port2 },
      { transferList: [channel.port2] as unknown as TransferList, ...(options.signal ? { signal: options.signal } : {}) },
    );
    if (reply.ok) return reply.result as R;
    throw new SolveError(reply.kind, reply.message, reply.kind === 'invalid-game' ? reply.faults : []);
  } catch (e) {
    if (e instanceof SolveError) throw e;
    if ((e as Error).name === 'AbortError' || options.signal?.aborted) throw new SolveError('cancelled', 'the solve was cancelled');
    throw new SolveError('failed', (e as Error).message);
  } finally {
    channel.port1.close();
  }
}

/** Stop the workers (at shutdown and after tests). */
export async function closeSolverPool(): Promise<void> {
  const current = pool;
  pool = null;
  await current?.destroy();
}
