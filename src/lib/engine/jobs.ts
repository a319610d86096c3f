/**
 * Analyses as plain data in, plain data out: what the worker pool and the command line
 * run. A job names the analysis, carries the game model and the parameters; the result
 * is JSON-serialisable. The game is validated first.
 */
import type { Game } from './model';
import { validateGame, type Fault } from './validate';
import { assessMarks, type Mark } from './solvers/credibility';
import { ewlCurves, ewlEquilibria, type TwoByTwo } from './solvers/ewl';
import { fitLogit, type Observation } from './solvers/logit-fit';
import { monteCarlo, type PayoffRange } from './solvers/monte-carlo';
import { logitQre, type Progress } from './solvers/qre';
import { beliefForecast } from './solvers/quarter-law';
import { sensitivity } from './solvers/sensitivity';
import { solveSubgamePerfect } from './solvers/subgame-perfect';

export type AnalysisJob =
  | { analysis: 'equilibria'; game: Game; exact?: boolean; maxListed?: number }
  | { analysis: 'qre'; game: Game; lambda: number | Record<string, number> }
  | { analysis: 'sensitivity'; game: Game; exact?: boolean; terminals?: string[] }
  | { analysis: 'monte-carlo'; game: Game; ranges: PayoffRange[]; samples: number; seed: number }
  | { analysis: 'credibility'; game: Game; marks: Mark[]; exact?: boolean }
  | { analysis: 'logit-fit'; game: Game; observations: Observation[]; maxLambda?: number }
  | { analysis: 'belief'; game: Game; nodeId: string; team: string; restrained: string; lambda: number }
  | { analysis: 'agreement'; stage: TwoByTwo; gamma?: number; steps?: number };

export type AnalysisName = AnalysisJob['analysis'];

export class InvalidGame extends Error {
  constructor(readonly faults: Fault[]) {
    super(`the game is not valid: ${faults.map((f) => `${f.path}: ${f.message}`).join('; ')}`);
  }
}

function checked(game: Game): Game {
  const result = validateGame(game);
  if (!result.ok) throw new InvalidGame(result.faults);
  return result.game;
}

/** Run one analysis. Throws InvalidGame for a bad game and Error with a clear message otherwise. */
export function runAnalysis(job: AnalysisJob, progress?: Progress): unknown {
  switch (job.analysis) {
    case 'equilibria':
      return solveSubgamePerfect(checked(job.game), { exact: job.exact, maxListed: job.maxListed });
    case 'qre':
      return logitQre(checked(job.game), { lambda: job.lambda, progress });
    case 'sensitivity':
      return sensitivity(checked(job.game), { exact: job.exact, terminals: job.terminals, progress });
    case 'monte-carlo':
      return monteCarlo(checked(job.game), job.ranges, { samples: job.samples, seed: job.seed, progress });
    case 'credibility':
      return assessMarks(checked(job.game), job.marks, { exact: job.exact });
    case 'logit-fit':
      return fitLogit(checked(job.game), job.observations, { maxLambda: job.maxLambda, progress });
    case 'belief':
      return beliefForecast(checked(job.game), job.nodeId, job.team, job.restrained, job.lambda);
    case 'agreement': {
      const equilibria = job.gamma === undefined ? undefined : ewlEquilibria(job.stage, job.gamma);
      return { ...ewlCurves(job.stage, { steps: job.steps }), ...(equilibria ? { equilibria } : {}) };
    }
    default:
      throw new Error(`unknown analysis "${(job as { analysis: string }).analysis}"`);
  }
}
