/** The live exercise's analyses run in the solver worker pool; the hub hears when one is in. */
import type { QreResult, SubgamePerfectResult } from '../../src/lib/engine';
import { ANALYSIS_LISTENER, ANALYSIS_RUNNER, type AnalysisRunner } from '../../src/lib/exercise/analysis';
import { provide } from '../../src/lib/runtime';
import { runSolve } from '../solver/pool';

const runner: AnalysisRunner = async (game, lambda) => {
  const [equilibria, qre] = await Promise.all([
    runSolve<SubgamePerfectResult>({ analysis: 'equilibria', game }),
    runSolve<QreResult>({ analysis: 'qre', game, lambda }).catch(() => null),
  ]);
  return { equilibria, qre };
};

export function provideAnalysis(onReady: (versionId: string) => void): void {
  provide(ANALYSIS_RUNNER, runner);
  provide(ANALYSIS_LISTENER, onReady);
}
