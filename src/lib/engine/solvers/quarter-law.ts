/**
 * Belief forecast by the quarter law of quantum decision theory (Yukalov and Sornette,
 * e.g. Theory and Decision 70, 2011; Philosophical Transactions A 374, 2016): the
 * probability of a choice is its utility factor f plus an attraction factor q, and
 * without specific information |q| is about 1/4. When a team does not know the other
 * side's move, the restrained move gains q = +1/4 (uncertainty makes the cautious
 * choice more attractive), capped so the probability stays within 0..1.
 * Disjunction-effect data (Shafir and Tversky, Cognitive Psychology 24, 1992): in a
 * Prisoner's Dilemma about 10% cooperated when the other's move was known, 37% when it
 * was not; the quarter law gives 10% + 25% = 35%.
 */
import { logitQre } from './qre';
import type { Game } from '../model';
import { compiledGame, sourceOf } from '../compile';
import { profileValues } from '../profile';
import { floatField } from '../numbers';
import { behaviourFromEquilibrium } from '../profile';
import { solveSubgamePerfect } from './subgame-perfect';
import { simultaneousStage } from '../play';

export const QUARTER = 0.25;

export interface QuarterLawForecast {
  utilityFactor: number;
  attractionFactor: number;
  probability: number;
}

/** The quarter-law probability of the restrained move from its rate when the other's move is known. */
export function quarterLaw(knownRate: number, attraction: number = QUARTER): QuarterLawForecast {
  if (!(knownRate >= 0 && knownRate <= 1)) throw new Error('the known-move rate must lie in 0..1');
  const q = attraction >= 0 ? Math.min(attraction, 1 - knownRate) : Math.max(attraction, -knownRate);
  return { utilityFactor: knownRate, attractionFactor: q, probability: knownRate + q };
}

export interface BeliefForecast {
  team: string;
  restrained: string;
  lambda: number;
  /** Logit probability of the restrained move when the other's move is known, averaged over its moves. */
  knownMove: number;
  /** Quarter-law forecast when the other's move is not known. */
  quarterLaw: QuarterLawForecast;
  /** Logit QRE probability of the restrained move at the same lambda. */
  qre: number;
}

/**
 * For a simultaneous stage of two teams at `nodeId`: the forecast probability that
 * `team` plays its `restrained` move, by the quarter law and by logit QRE. Stage payoffs
 * are the continuation values under the first subgame-perfect equilibrium.
 */
export function beliefForecast(game: Game, nodeId: string, team: string, restrained: string, lambda: number): BeliefForecast {
  const stage = simultaneousStage(game, nodeId);
  if (!stage || stage.movers.length !== 2) throw new Error(`"${nodeId}" is not a simultaneous stage of two teams`);
  const side = stage.movers.findIndex((m) => m.team === team);
  if (side < 0) throw new Error(`team "${team}" does not move at "${nodeId}"`);
  const own = stage.movers[side]!.actions;
  const other = stage.movers[1 - side]!.actions;
  const r = own.indexOf(restrained);
  if (r < 0) throw new Error(`"${restrained}" is not a move of ${team} there (moves: ${own.join(', ')})`);
  const flat = compiledGame(game);
  const source = sourceOf(flat);
  const spe = solveSubgamePerfect(game).equilibria[0]!;
  const values = profileValues(flat, floatField, behaviourFromEquilibrium(flat, floatField, spe));
  const t = game.teams.findIndex((x) => x.id === team);
  const root = source.indexOf.get(nodeId)!;
  // Outcome node after row move i and column move j.
  const cell = (i: number, j: number) => flat.childStart[flat.childStart[root]! + i]! + j;
  const valueFor = (mine: number, theirs: number) => {
    const node = side === 0 ? cell(mine, theirs) : cell(theirs, mine);
    return values[node * flat.teams + t]!;
  };
  let knownMove = 0;
  other.forEach((_, j) => {
    const utilities = own.map((_, k) => lambda * valueFor(k, j));
    const max = Math.max(...utilities);
    const weights = utilities.map((u) => Math.exp(u - max));
    knownMove += weights[r]! / weights.reduce((a, b) => a + b, 0) / other.length;
  });
  const qre = logitQre(game, { lambda }).behaviour[stage.movers[side]!.key]![restrained]!;
  return { team, restrained, lambda, knownMove, quarterLaw: quarterLaw(knownMove), qre };
}
