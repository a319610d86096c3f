/**
 * The behavioural lens on a record: per team the maximum-likelihood logit lambda
 * and the log-likelihood of its moves under that QRE, under uniform random play
 * and under equilibrium play with trembles. The engine does the fitting.
 */
import { fitLogit, logitQre, trembleLogLikelihood, type EngineObservation, type Equilibrium, type Game, type LogitFit } from './engine';
import type { Choices } from './paths';
import type { TeamFit } from './types';

export type Observation = { teamId: string; nodeId: string; label: string };

/** The moves the engine fits lambda to, in its own terms. */
export function engineObservations(observations: Observation[]): EngineObservation[] {
  return observations.map((o) => ({ node: o.nodeId, label: o.label }));
}

export type TeamFits = {
  fits: TeamFit[];
  /** Fitted lambda of every team; 0 (uniform play) for a team without moves to fit. */
  lambdas: Record<string, number>;
  /** The agent QRE at those lambdas. */
  qre: Choices;
  fit: LogitFit;
};

/** `fitted` is the engine's fit of these observations when it was made elsewhere (the solver pool). */
export function fitTeams(game: Game, observations: Observation[], equilibrium: Equilibrium, tremble: number, fitted?: LogitFit): TeamFits {
  const observed = engineObservations(observations);
  const fit = fitted ?? fitLogit(game, observed);
  const trembles = trembleLogLikelihood(game, equilibrium, observed, tremble);
  const lambdas = Object.fromEntries(game.teams.map((t) => [t.id, fit.teams[t.id]!.lambda]));
  const fits = game.teams.map((team): TeamFit => {
    const own = fit.teams[team.id]!;
    const fitted = own.observations > 0;
    return {
      teamId: team.id,
      team: team.name,
      moves: own.observations,
      deviations: 0,
      totalRegret: 0,
      lambda: fitted ? own.lambda : null,
      lambdaBound: fitted ? own.atBound : null,
      logLikelihood: {
        qre: fitted ? own.logLikelihood : null,
        uniform: own.uniformLogLikelihood,
        trembles: trembles.teams[team.id]!.logLikelihood,
      },
    };
  });
  return { fits, lambdas, qre: logitQre(game, { lambda: lambdas }).behaviour, fit };
}
