import { afterAll, describe, expect, it } from 'vitest';
import type { MonteCarloResult, SubgamePerfectResult } from '../../src/lib/engine';
import { scenarioGame } from '../../src/lib/scenario';
import { SolveError, closeSolverPool, runSolve, type SolveProgress } from '../../server/solver/pool';
import { demoScenario } from '../../server/seed/demo-scenario';

const demo = demoScenario();
const game = scenarioGame(demo);
const ranges = demo.payoffRanges.map((r) => ({ terminalId: r.nodeId, team: r.team, distribution: r.distribution }));

afterAll(() => closeSolverPool());

describe('solver worker pool', () => {
  it('runs an analysis in a worker thread and returns plain data', async () => {
    const result = await runSolve<SubgamePerfectResult>({ analysis: 'equilibria', game, exact: true });
    expect(result.equilibria[0]!.path.at(-1)).toBe('Broker a settlement');
    expect(result.equilibria[0]!.payoffsExact).toEqual(['2479/400', '-2613/320', '107/80']);
  }, 60_000);

  it('reports progress as fractions with a phase label, ending at 1', async () => {
    const seen: SolveProgress[] = [];
    const result = await runSolve<MonteCarloResult>({ analysis: 'monte-carlo', game, ranges, samples: 1500, seed: 9 }, { onProgress: (p) => seen.push(p) });
    expect(result.samples).toBe(1500);
    expect(seen.length).toBeGreaterThan(1);
    expect(seen.every((p, k) => p.phase === 'Monte Carlo samples' && (k === 0 || p.fraction >= seen[k - 1]!.fraction))).toBe(true);
    expect(seen.at(-1)!.fraction).toBe(1);
  }, 60_000);

  it('cancels a running job through its AbortSignal and keeps serving', async () => {
    const controller = new AbortController();
    const running = runSolve({ analysis: 'monte-carlo', game, ranges, samples: 1_000_000, seed: 1 }, {
      signal: controller.signal,
      onProgress: () => controller.abort(),
    });
    await expect(running).rejects.toMatchObject({ kind: 'cancelled' });
    const after = await runSolve<SubgamePerfectResult>({ analysis: 'equilibria', game });
    expect(after.count).toBeGreaterThan(0);
  }, 60_000);

  it('refuses a job whose signal is already aborted', async () => {
    const controller = new AbortController();
    controller.abort();
    await expect(runSolve({ analysis: 'equilibria', game }, { signal: controller.signal })).rejects.toMatchObject({ kind: 'cancelled' });
  });

  it('returns the faults of an invalid game', async () => {
    const bad = { teams: game.teams, root: { id: 'n', kind: 'decision', team: 'nobody', actions: [{ label: 'Go', next: { id: 'x', kind: 'terminal', payoffs: {} } }] } };
    const error = await runSolve({ analysis: 'equilibria', game: bad as never }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(SolveError);
    expect((error as SolveError).kind).toBe('invalid-game');
    expect((error as SolveError).faults.map((f) => f.code)).toContain('unknown-team');
  }, 60_000);
});
