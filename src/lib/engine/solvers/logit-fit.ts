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
import { solveUnique } from '../linear';
import { floatField } from '../numbers';
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
 * The log-likelihood of the observations (of one team's, with `team`) under the agent
 * QRE, as a function of the lambdas: one workspace solved again at each trial, the moves
 * read straight from its probabilities (where each observed move's probability lies is
 * found once). Lambdas at which the QRE cannot be traced (the continuation fails) score
 * -Infinity: the fit never stands on a point whose probabilities are not those of the model.
 */
function qreLikelihood(flat: FlatGame, obs: ResolvedObservation[]): (lambdas: ArrayLike<number>, team?: number) => number {
  const workspace = new QreWorkspace(flat);
  const slots = Int32Array.from(obs, (o) => workspace.offset[o.infoset]! + o.action);
  return (lambdas, team) => {
    const solved = workspace.solve(lambdas);
    if (!solved.converged) return -Infinity;
    let total = 0;
    obs.forEach((o, n) => {
      if (team === undefined || o.team === team) total += Math.log(solved.probs[slots[n]!]!);
    });
    return total;
  };
}

function uniformLogLikelihood(obs: ResolvedObservation[], team?: number): number {
  let sum = 0;
  for (const o of obs) if (team === undefined || o.team === team) sum -= Math.log(o.actions);
  return sum;
}

export interface TeamFit {
  /** The maximum-likelihood lambda; when `atBound` is 'upper' this is the bound, read it as "at least". */
  lambda: number;
  /**
   * 'upper': the likelihood is highest at the upper end of the range (lambda >= maxLambda):
   * the moves are explained as well as the fit can tell by play as rational as the model
   * allows. 'lower': highest at lambda = 0, the moves are explained no better than by
   * random play. null inside the range, and for a team without moves (lambda 0, not fitted).
   */
  atBound: 'lower' | 'upper' | null;
  /** Of this team's moves, at the fitted lambdas of every team. */
  logLikelihood: number;
  uniformLogLikelihood: number;
  observations: number;
}

export interface LogitFit {
  teams: Record<string, TeamFit>;
  /** Of all the moves; never below `uniformLogLikelihood` (lambda = 0 for every team). */
  logLikelihood: number;
  uniformLogLikelihood: number;
  /** Upper end of the lambda range searched. */
  maxLambda: number;
  /** A closing whole-range sweep met both tolerances (FIT_TOLERANCE); false when the sweep cap stopped the ascent first. */
  converged: boolean;
  sweeps: number;
}

export interface LogitFitOptions {
  /** Upper end of the range; by default LAMBDA_RANGE / (payoff range), see defaultMaxLambda. */
  maxLambda?: number;
  /** Sweep cap (FIT_TOLERANCE.maxSweeps by default). */
  maxSweeps?: number;
  progress?: (fraction: number, phase: string) => void;
}

/**
 * When a sweep has settled: it (one search per observed team, then the pattern and Newton
 * steps) gained less than `logLikelihood` x max(1, |log-likelihood|) and moved no lambda
 * by more than `logLambda` in log lambda (a relative 0.01%). The ascent stops when a
 * whole-range sweep after a settled one settles too (see coordinateAscent), or after
 * `maxSweeps` sweeps.
 */
export const FIT_TOLERANCE = { logLikelihood: 1e-9, logLambda: 1e-4, maxSweeps: 50 } as const;

/**
 * Upper end of the lambda range: LAMBDA_RANGE / (payoff range). There a payoff difference
 * of a thousandth of the game's payoff range already gives odds of e^10 (about 22,000 to 1)
 * for the better action, so a larger lambda is told apart only by still smaller differences.
 */
export const LAMBDA_RANGE = 1e4;

function defaultMaxLambda(flat: FlatGame): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of flat.payoff) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return LAMBDA_RANGE / Math.max(hi - lo, 1e-9);
}

/**
 * Maximum-likelihood lambda per team, by coordinate ascent over the observed teams, each
 * lambda in [0, maxLambda]. Deterministic, and the log-likelihood never falls: a team's
 * new lambda is taken only when it raises the likelihood (a lambda that changes nothing
 * stays where it is), and of points of equal likelihood a search keeps the larger lambda,
 * so a likelihood that rises and then levels off runs to the bound, reported as such.
 */
export function fitLogit(game: Game, observations: Observation[], options: LogitFitOptions = {}): LogitFit {
  const flat = compiledGame(game);
  const obs = resolve(game, flat, observations);
  const likelihood = qreLikelihood(flat, obs);
  const maxLambda = options.maxLambda ?? defaultMaxLambda(flat);
  if (!(Number.isFinite(maxLambda) && maxLambda > 0)) throw new Error('maxLambda must be a finite number > 0');
  const observed = game.teams.map((_, t) => obs.some((o) => o.team === t));
  const ascent = coordinateAscent(likelihood, observed, new LambdaSearch(maxLambda), options);
  const { lambdas } = ascent;
  const teams: Record<string, TeamFit> = {};
  game.teams.forEach((team, t) => {
    teams[team.id] = {
      lambda: lambdas[t]!,
      atBound: !observed[t] ? null : lambdas[t] === maxLambda ? 'upper' : lambdas[t] === 0 ? 'lower' : null,
      logLikelihood: likelihood(lambdas, t),
      uniformLogLikelihood: uniformLogLikelihood(obs, t),
      observations: obs.filter((o) => o.team === t).length,
    };
  });
  return { teams, logLikelihood: ascent.logLikelihood, uniformLogLikelihood: uniformLogLikelihood(obs), maxLambda, converged: ascent.converged, sweeps: ascent.sweeps };
}

/**
 * Sweeps over the observed teams from lambda = 0 (uniform play) for all. A team at 0
 * (every team in the first sweep) is searched over the whole range, any other near its
 * lambda; after each sweep but the first, a pattern step (Hooke and Jeeves, J. ACM 8,
 * 1961) tries to go on along the sweep's move in log lambda, doubling while it gains, so
 * that the ascent follows a ridge across teams in a few sweeps rather than many.
 *
 * The likelihood need not be concave in one team's lambda once another team's moves
 * depend on it (a later mover's choice turns on how the earlier one is expected to
 * play), so a near search can stop on a local peak. When the near sweeps settle, one
 * sweep searches every team over the whole range again; the ascent ends only when that
 * sweep gains nothing, at a point no single team's lambda, near or far, improves on.
 * Several lambdas changed at once may still do better: the fit is a coordinate-wise
 * maximum, not certainly the global one.
 */
function coordinateAscent(total: (lambdas: Float64Array) => number, observed: boolean[], search: LambdaSearch, options: LogitFitOptions) {
  const maxSweeps = options.maxSweeps ?? FIT_TOLERANCE.maxSweeps;
  const lambdas = new Float64Array(observed.length);
  let best = total(lambdas);
  let sweeps = 0;
  let converged = false;
  let wide = false;
  while (!converged && sweeps < maxSweeps) {
    const start = lambdas.slice();
    const before = best;
    observed.forEach((isObserved, t) => {
      if (!isObserved) return;
      const trial = lambdas.slice();
      const along = (x: number) => {
        trial[t] = x;
        return total(trial);
      };
      const found = wide || lambdas[t] === 0 ? search.whole(along) : search.near(along, lambdas[t]!, best);
      if (gains(found.value, best)) [lambdas[t], best] = [found.lambda, found.value];
    });
    if (sweeps > 0 && !wide) best = newtonStep(total, lambdas, patternStep(total, lambdas, start, best, search.max), search.max);
    sweeps++;
    const settled = best - before <= FIT_TOLERANCE.logLikelihood * Math.max(1, Math.abs(best)) && largestLogStep(start, lambdas) <= FIT_TOLERANCE.logLambda;
    converged = settled && wide;
    wide = settled && !wide;
    options.progress?.(converged ? 1 : sweeps / (sweeps + 1), 'fitting logit lambda');
  }
  return { lambdas, logLikelihood: best, converged, sweeps };
}

/** A gain above rounding noise (a relative 1e-13), so a flat likelihood does not creep along on noise. */
const gains = (value: number, best: number) => value - best > 1e-13 * Math.max(1, Math.abs(best));

/** The largest change of log lambda between two points (Infinity where a lambda left or reached 0). */
function largestLogStep(from: Float64Array, to: Float64Array): number {
  let largest = 0;
  from.forEach((a, t) => {
    const b = to[t]!;
    if (a !== b) largest = Math.max(largest, a === 0 || b === 0 ? Infinity : Math.abs(Math.log(b / a)));
  });
  return largest;
}

/**
 * One Newton step on the log lambdas of the teams strictly inside the range, from a
 * central-difference gradient and Hessian (step 1e-3 in log lambda), halved up to six
 * times until it gains; taken only if it gains. Where two teams' lambdas trade off along
 * a curved ridge, one-team searches crawl along it sweep after sweep; the joint step
 * crosses it in a few.
 */
function newtonStep(total: (lambdas: Float64Array) => number, lambdas: Float64Array, best: number, max: number): number {
  const free = [...lambdas.keys()].filter((t) => lambdas[t]! > 0 && lambdas[t]! < max);
  if (free.length === 0) return best;
  const h = 1e-3;
  const at = (shifts: [number, number][]) => {
    const trial = lambdas.slice();
    for (const [t, d] of shifts) trial[t] = Math.min(max, trial[t]! * Math.exp(d));
    return total(trial);
  };
  const n = free.length;
  const gradient = new Array<number>(n);
  const hessian = free.map(() => new Array<number>(n).fill(0));
  free.forEach((t, i) => {
    const [up, down] = [at([[t, h]]), at([[t, -h]])];
    gradient[i] = (up - down) / (2 * h);
    hessian[i]![i] = (up - 2 * best + down) / (h * h);
    for (let j = 0; j < i; j++) {
      const s = free[j]!;
      const mixed = (at([[t, h], [s, h]]) - at([[t, h], [s, -h]]) - at([[t, -h], [s, h]]) + at([[t, -h], [s, -h]])) / (4 * h * h);
      hessian[i]![j] = hessian[j]![i] = mixed;
    }
  });
  if (!gradient.every(Number.isFinite) || !hessian.every((row) => row.every(Number.isFinite))) return best;
  const step = solveUnique(floatField, hessian, gradient.map((g) => -g), n);
  // Only a step uphill: at a saddle or a trough of the quadratic model, Newton points the wrong way.
  if (!step || step.reduce((sum, d, i) => sum + d * gradient[i]!, 0) <= 0) return best;
  for (let scale = 1, tries = 0; tries < 7; tries++, scale /= 2) {
    const shifts = free.map((t, i): [number, number] => [t, Math.max(-5, Math.min(5, step[i]! * scale))]);
    const value = at(shifts);
    if (gains(value, best)) {
      for (const [t, d] of shifts) lambdas[t] = Math.min(max, lambdas[t]! * Math.exp(d));
      return value;
    }
  }
  return best;
}

/** Go on from `lambdas` along the sweep's move from `start` (in log lambda), 1, 2, 4 and 8 times, while the likelihood rises. */
function patternStep(total: (lambdas: Float64Array) => number, lambdas: Float64Array, start: Float64Array, best: number, max: number): number {
  const ratio = Float64Array.from(lambdas, (l, t) => (l > 0 && start[t]! > 0 ? l / start[t]! : 1));
  if (ratio.every((r) => Math.abs(Math.log(r)) <= FIT_TOLERANCE.logLambda)) return best;
  const origin = lambdas.slice();
  for (let k = 1; k <= 8; k *= 2) {
    const trial = Float64Array.from(origin, (l, t) => Math.min(max, l * ratio[t]! ** k));
    const value = total(trial);
    if (!gains(value, best)) break;
    lambdas.set(trial);
    best = value;
  }
  return best;
}

interface Found {
  lambda: number;
  value: number;
}

/** One-team searches on [0, max]. */
class LambdaSearch {
  /** The whole-range grid: 0, then max x 10^-4 up to max in eighths of a decade. */
  private readonly grid: number[];
  /** Lowest positive lambda a search near a point goes to before it tries 0. */
  private readonly least: number;

  constructor(readonly max: number) {
    this.grid = [0, ...Array.from({ length: 33 }, (_, k) => (k === 32 ? max : max * 10 ** (-4 + k / 8)))];
    this.least = max * 1e-6;
  }

  /** The best of the grid (of equal values the larger lambda), refined by Brent's method between its neighbours. */
  whole(f: (x: number) => number): Found {
    const { grid } = this;
    const values = grid.map(f);
    let best = 0;
    values.forEach((v, k) => {
      if (v >= values[best]!) best = k;
    });
    return brentMaximum(f, grid[Math.max(0, best - 1)]!, grid[Math.min(grid.length - 1, best + 1)]!, grid[best]!, values[best]!);
  }

  /**
   * The best point near x (f(x) = fx): steps of 0.05 in log lambda each way, then, in the
   * better direction, steps tripling while the likelihood rises (or stays level going up)
   * up to the bound or down to `least` (and then 0), then Brent's method in the bracket.
   */
  near(f: (x: number) => number, x: number, fx: number): Found {
    if (x <= this.least) return this.whole(f);
    const at = (u: number) => (u >= Math.log(this.max) ? this.max : Math.max(this.least, Math.exp(u)));
    const u0 = Math.log(x);
    let h = 0.05;
    const [up, down] = [at(u0 + h), at(u0 - h)];
    const [fUp, fDown] = [up > x ? f(up) : -Infinity, down < x ? f(down) : -Infinity];
    const dir = fUp >= fx && fUp >= fDown ? 1 : fDown > fx ? -1 : 0;
    if (dir === 0) return brentMaximum(f, down, up, x, fx);
    let [inner, best, fBest] = [x, dir > 0 ? up : down, dir > 0 ? fUp : fDown];
    for (;;) {
      h *= 3;
      const next = at(Math.log(best) + dir * h);
      if (next === best) return dir > 0 ? { lambda: best, value: fBest } : this.orZero(f, best, fBest);
      const fNext = f(next);
      if (dir > 0 ? fNext < fBest : fNext <= fBest) return brentMaximum(f, Math.min(inner, next), Math.max(inner, next), best, fBest);
      [inner, best, fBest] = [best, next, fNext];
    }
  }

  /** At the lowest positive lambda of a search, lambda = 0 when it is strictly better. */
  private orZero(f: (x: number) => number, x: number, fx: number): Found {
    const f0 = f(0);
    return f0 > fx ? { lambda: 0, value: f0 } : { lambda: x, value: fx };
  }
}

/**
 * Brent's method (Brent, "Algorithms for Minimization without Derivatives", 1973, ch. 5):
 * parabolic steps through the three best points, golden-section steps when a parabola
 * does not help. Starts from x in [a, b] (f(x) = fx), returns the best point found, to
 * within a millionth of the bracket's width. Of equal values the larger lambda is kept.
 */
function brentMaximum(f: (x: number) => number, a: number, b: number, x: number, fx: number): Found {
  const golden = (3 - Math.sqrt(5)) / 2;
  const tol = 1e-6 * (b - a);
  let [w, v, fw, fv] = [x, x, fx, fx];
  let [d, e] = [0, 0];
  for (;;) {
    const middle = (a + b) / 2;
    if (Math.abs(x - middle) <= 2 * tol - (b - a) / 2) return { lambda: x, value: fx };
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
