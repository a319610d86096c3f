/**
 * Behavioural lenses on observed moves: the maximum-likelihood logit lambda per team
 * (the agent QRE whose choice probabilities best explain the moves), beside uniform
 * random play and beside "equilibrium play with trembles": each move follows the
 * equilibrium with probability 1 - epsilon and is uniform otherwise.
 */
import { compiledGame, sourceOf, type FlatGame } from '../compile';
import type { DecisionNode, Game } from '../model';
import type { Equilibrium } from '../profile';
import { choiceKey } from '../tree';
import { behaviourRecord, qreFlat } from './qre';

export interface Observation {
  /** The node where the move was made, or */
  node?: string;
  /** the information set (when the node is not known). */
  infoset?: string;
  label: string;
}

interface ResolvedObservation {
  key: string;
  label: string;
  team: number;
  actions: number;
}

function resolve(game: Game, flat: FlatGame, observations: Observation[]): ResolvedObservation[] {
  const source = sourceOf(flat);
  const byKey = new Map(source.infosetKeys.map((key, h) => [key, h]));
  return observations.map((o, n) => {
    let h: number | undefined;
    if (o.node !== undefined) {
      const i = source.indexOf.get(o.node);
      const node = i === undefined ? undefined : source.nodes[i];
      if (!node || node.kind !== 'decision') throw new Error(`observation ${n}: "${o.node}" is not a decision node`);
      h = byKey.get(choiceKey(node));
    } else if (o.infoset !== undefined) {
      h = byKey.get(o.infoset);
      if (h === undefined) throw new Error(`observation ${n}: no information set "${o.infoset}"`);
    } else throw new Error(`observation ${n}: give the node or the information set`);
    const first = source.nodes[source.infosetFirst[h!]!] as DecisionNode;
    if (!first.actions.some((a) => a.label === o.label)) {
      throw new Error(`observation ${n}: "${o.label}" is not an action there (actions: ${first.actions.map((a) => a.label).join(', ')})`);
    }
    return { key: source.infosetKeys[h!]!, label: o.label, team: game.teams.findIndex((t) => t.id === first.team), actions: first.actions.length };
  });
}

type Behaviour = Record<string, Record<string, number>>;

function logLikelihood(obs: ResolvedObservation[], behaviour: Behaviour, team?: number): number {
  let sum = 0;
  for (const o of obs) if (team === undefined || o.team === team) sum += Math.log(behaviour[o.key]![o.label]!);
  return sum;
}

function uniformLogLikelihood(obs: ResolvedObservation[], team?: number): number {
  let sum = 0;
  for (const o of obs) if (team === undefined || o.team === team) sum -= Math.log(o.actions);
  return sum;
}

export interface TeamFit {
  lambda: number;
  logLikelihood: number;
  uniformLogLikelihood: number;
  observations: number;
}

export interface LogitFit {
  teams: Record<string, TeamFit>;
  logLikelihood: number;
  uniformLogLikelihood: number;
  /** Upper end of the lambda search; a lambda at this bound means play looks as rational as the search can tell. */
  maxLambda: number;
}

export interface LogitFitOptions {
  /** Upper end of the search; by default it starts at 200 / (payoff range) and widens tenfold, up to three times, while the best lambda sits at it. */
  maxLambda?: number;
  progress?: (fraction: number, phase: string) => void;
}

/** Lambda at which payoff differences of the whole payoff range make play nearly deterministic. */
function defaultMaxLambda(flat: FlatGame): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of flat.payoff) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return 200 / Math.max(hi - lo, 1e-9);
}

/** Maximum-likelihood lambda per team (coordinate ascent over teams, each by grid and golden-section search). */
export function fitLogit(game: Game, observations: Observation[], options: LogitFitOptions = {}): LogitFit {
  const flat = compiledGame(game);
  const obs = resolve(game, flat, observations);
  const total = (l: Float64Array) => logLikelihood(obs, behaviourRecord(flat, qreFlat(flat, l)));
  const observed = game.teams.map((_, t) => obs.some((o) => o.team === t));
  let maxLambda = options.maxLambda ?? defaultMaxLambda(flat);
  let lambdas: Float64Array = new Float64Array(game.teams.length);
  for (let widening = 0; ; widening++) {
    lambdas = coordinateAscent(game.teams.length, observed, total, maxLambda, options.progress);
    const atBound = lambdas.some((l) => l > 0.99 * maxLambda);
    if (options.maxLambda !== undefined || !atBound || widening === 3) break;
    maxLambda *= 10;
  }
  const behaviour = behaviourRecord(flat, qreFlat(flat, lambdas));
  const teams: Record<string, TeamFit> = {};
  game.teams.forEach((team, t) => {
    teams[team.id] = {
      lambda: lambdas[t]!,
      logLikelihood: logLikelihood(obs, behaviour, t),
      uniformLogLikelihood: uniformLogLikelihood(obs, t),
      observations: obs.filter((o) => o.team === t).length,
    };
  });
  return { teams, logLikelihood: logLikelihood(obs, behaviour), uniformLogLikelihood: uniformLogLikelihood(obs), maxLambda };
}

function coordinateAscent(
  teams: number,
  observed: boolean[],
  total: (lambdas: Float64Array) => number,
  maxLambda: number,
  progress?: LogitFitOptions['progress'],
): Float64Array {
  const lambdas: Float64Array = new Float64Array(teams);
  const sweeps = 2;
  for (let sweep = 0; sweep < sweeps; sweep++) {
    for (let t = 0; t < teams; t++) {
      if (!observed[t]) continue;
      lambdas[t] = maximise((x) => {
        const trial = lambdas.slice();
        trial[t] = x;
        return total(trial);
      }, maxLambda);
      progress?.((sweep * teams + t + 1) / (sweeps * teams), 'fitting logit lambda');
    }
  }
  return lambdas;
}

/** Maximum of f on [0, max]: the best of a geometric grid, refined by golden-section search. */
function maximise(f: (x: number) => number, max: number): number {
  const grid = [0, ...Array.from({ length: 16 }, (_, k) => max * 10 ** (-3 + (3 * k) / 15))];
  const values = grid.map(f);
  let best = 0;
  values.forEach((v, k) => {
    if (v > values[best]!) best = k;
  });
  let a = grid[Math.max(0, best - 1)]!;
  let b = grid[Math.min(grid.length - 1, best + 1)]!;
  const phi = (Math.sqrt(5) - 1) / 2;
  let c = b - phi * (b - a);
  let d = a + phi * (b - a);
  let fc = f(c);
  let fd = f(d);
  for (let k = 0; k < 24; k++) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - phi * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + phi * (b - a);
      fd = f(d);
    }
  }
  const refined = (a + b) / 2;
  return f(refined) >= values[best]! ? refined : grid[best]!;
}

export interface TrembleLikelihood {
  epsilon: number;
  teams: Record<string, { logLikelihood: number; observations: number }>;
  logLikelihood: number;
}

/** Log-likelihood of the moves if each follows the equilibrium with probability 1 - epsilon and is uniform otherwise. */
export function trembleLogLikelihood(game: Game, equilibrium: Equilibrium, observations: Observation[], epsilon: number): TrembleLikelihood {
  if (!(epsilon >= 0 && epsilon <= 1)) throw new Error('epsilon must lie in 0..1');
  const flat = compiledGame(game);
  const obs = resolve(game, flat, observations);
  const trembling: Behaviour = {};
  for (const o of obs) {
    const choice = equilibrium.choices[o.key];
    if (!choice) throw new Error(`the equilibrium gives no choice for "${o.key}"`);
    trembling[o.key] = Object.fromEntries(Object.entries(choice).map(([label, p]) => [label, (1 - epsilon) * p + epsilon / o.actions]));
  }
  const teams: TrembleLikelihood['teams'] = {};
  game.teams.forEach((team, t) => {
    teams[team.id] = { logLikelihood: logLikelihood(obs, trembling, t), observations: obs.filter((o) => o.team === t).length };
  });
  return { epsilon, teams, logLikelihood: logLikelihood(obs, trembling) };
}
