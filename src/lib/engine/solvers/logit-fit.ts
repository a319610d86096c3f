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
import { QreWorkspace } from './qre';

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
  infoset: number;
  /** Position of the label among the actions of the information set. */
  action: number;
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
    const action = first.actions.findIndex((a) => a.label === o.label);
    if (action < 0) {
      throw new Error(`observation ${n}: "${o.label}" is not an action there (actions: ${first.actions.map((a) => a.label).join(', ')})`);
    }
    return { key: source.infosetKeys[h!]!, label: o.label, team: game.teams.findIndex((t) => t.id === first.team), actions: first.actions.length, infoset: h!, action };
  });
}

type Behaviour = Record<string, Record<string, number>>;

function logLikelihood(obs: ResolvedObservation[], behaviour: Behaviour, team?: number): number {
  let sum = 0;
  for (const o of obs) if (team === undefined || o.team === team) sum += Math.log(behaviour[o.key]![o.label]!);
  return sum;
}

/**
 * The log-likelihood of the observations under the agent QRE, as a function of the
 * lambdas: one workspace solved again at each trial, the moves read straight from its
 * probabilities (where each observed move's probability lies is found once).
 */
function qreLikelihood(flat: FlatGame, obs: ResolvedObservation[]) {
  const workspace = new QreWorkspace(flat);
  const slots = Int32Array.from(obs, (o) => workspace.offset[o.infoset]! + o.action);
  const sum = (probs: Float64Array, team?: number) => {
    let total = 0;
    obs.forEach((o, n) => {
      if (team === undefined || o.team === team) total += Math.log(probs[slots[n]!]!);
    });
    return total;
  };
  return {
    total: (lambdas: ArrayLike<number>) => sum(workspace.solve(lambdas).probs),
    perTeam: (lambdas: ArrayLike<number>, team: number) => sum(workspace.solve(lambdas).probs, team),
  };
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

/** Maximum-likelihood lambda per team (coordinate ascent over teams, two sweeps, each team by a grid and Brent's method). */
export function fitLogit(game: Game, observations: Observation[], options: LogitFitOptions = {}): LogitFit {
  const flat = compiledGame(game);
  const obs = resolve(game, flat, observations);
  const likelihood = qreLikelihood(flat, obs);
  const observed = game.teams.map((_, t) => obs.some((o) => o.team === t));
  let maxLambda = options.maxLambda ?? defaultMaxLambda(flat);
  let lambdas: Float64Array = new Float64Array(game.teams.length);
  for (let widening = 0; ; widening++) {
    lambdas = coordinateAscent(game.teams.length, observed, likelihood.total, maxLambda, options.progress);
    const atBound = lambdas.some((l) => l > 0.99 * maxLambda);
    if (options.maxLambda !== undefined || !atBound || widening === 3) break;
    maxLambda *= 10;
  }
  const teams: Record<string, TeamFit> = {};
  game.teams.forEach((team, t) => {
    teams[team.id] = {
      lambda: lambdas[t]!,
      logLikelihood: likelihood.perTeam(lambdas, t),
      uniformLogLikelihood: uniformLogLikelihood(obs, t),
      observations: obs.filter((o) => o.team === t).length,
    };
  });
  return { teams, logLikelihood: likelihood.total(lambdas), uniformLogLikelihood: uniformLogLikelihood(obs), maxLambda };
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

/** The geometric grid a one-team search starts from: 0, then max * 10^-3 up to max in 15 even steps of log lambda. */
function lambdaGrid(max: number): number[] {
  return [0, ...Array.from({ length: 16 }, (_, k) => max * 10 ** (-3 + (3 * k) / 15))];
}

/** Maximum of f on [0, max]: the best of a geometric grid, refined by Brent's method between its neighbours. */
function maximise(f: (x: number) => number, max: number): number {
  const grid = lambdaGrid(max);
  const values = grid.map(f);
  let best = 0;
  values.forEach((v, k) => {
    if (v > values[best]!) best = k;
  });
  return brentMaximum(f, grid[Math.max(0, best - 1)]!, grid[Math.min(grid.length - 1, best + 1)]!, grid[best]!, values[best]!);
}

/**
 * Brent's method (Brent, "Algorithms for Minimization without Derivatives", 1973, ch. 5):
 * parabolic steps through the three best points, golden-section steps when a parabola
 * does not help. Starts from x in [a, b] (f(x) = fx), returns the best point found, to
 * within a millionth of the bracket's width. Of equal values the larger lambda is kept,
 * so a likelihood that levels off (play as rational as can be told) runs to the bound.
 */
function brentMaximum(f: (x: number) => number, a: number, b: number, x: number, fx: number): number {
  const golden = (3 - Math.sqrt(5)) / 2;
  const tol = 1e-6 * (b - a);
  let [w, v, fw, fv] = [x, x, fx, fx];
  let [d, e] = [0, 0];
  for (;;) {
    const middle = (a + b) / 2;
    if (Math.abs(x - middle) <= 2 * tol - (b - a) / 2) return x;
    let parabolic = false;
    if (Math.abs(e) > tol) {
      // The vertex of the parabola through (x, fx), (w, fw), (v, fv), as x + p / q.
      const r = (x - w) * (fv - fx);
      let q = (x - v) * (fw - fx);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      if (Math.abs(p) < Math.abs(0.5 * q * e) && p > q * (a - x) && p < q * (b - x)) {
        e = d;
        d = p / q;
        parabolic = true;
        if (x + d - a < 2 * tol || b - (x + d) < 2 * tol) d = x < middle ? tol : -tol;
      }
    }
    if (!parabolic) {
      e = (x < middle ? b : a) - x;
      d = golden * e;
    }
    const u = x + (Math.abs(d) >= tol ? d : d > 0 ? tol : -tol);
    const fu = f(u);
    if (fu > fx || (fu === fx && u > x)) {
      if (u < x) b = x;
      else a = x;
      [v, fv, w, fw, x, fx] = [w, fw, x, fx, u, fu];
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu >= fw || w === x) [v, fv, w, fw] = [w, fw, u, fu];
      else if (fu >= fv || v === x || v === w) [v, fv] = [u, fu];
    }
  }
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
