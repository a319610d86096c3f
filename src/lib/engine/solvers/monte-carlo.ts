/**
 * Monte Carlo over uncertain payoffs: each sample draws the payoffs that carry a range
 * (uniform, or triangular with a mode) from a seeded generator, solves the game, and
 * records where equilibrium play ends. The result is, for every terminal, the share of
 * samples in which it is the equilibrium outcome (averaging reach probabilities when
 * equilibrium play is mixed or passes chance nodes).
 */
import { CHANCE, TERMINAL, compiledGame, isPerfectInformation, parentsOf, sourceOf, type FlatGame } from '../compile';
import type { Game } from '../model';
import { floatField, toFloat, type Num } from '../numbers';
import { mulberry32, type Rng } from '../rng';
import { pathTo } from '../tree';
import { resolveNodes, solveFlat } from './backward-induction';
import type { Progress } from './qre';
import { RollUpSession } from './subgame-perfect';

export type PayoffDistribution =
  | { kind: 'uniform'; low: Num; high: Num }
  | { kind: 'triangular'; low: Num; mode: Num; high: Num };

export interface PayoffRange {
  terminalId: string;
  team: string;
  distribution: PayoffDistribution;
}

export interface MonteCarloOptions {
  samples: number;
  seed: number;
  progress?: Progress;
}

export interface OutcomeShare {
  terminalId: string;
  outcome?: string;
  path: string[];
  probability: number;
}

export interface MonteCarloResult {
  samples: number;
  seed: number;
  generator: 'mulberry32';
  /** Terminals with a positive share, most likely first. */
  outcomes: OutcomeShare[];
}

export function sampleDistribution(d: PayoffDistribution, rng: Rng): number {
  const low = toFloat(d.low);
  const high = toFloat(d.high);
  const u = rng();
  if (d.kind === 'uniform') return low + u * (high - low);
  const mode = toFloat(d.mode);
  const span = high - low;
  if (span <= 0) return low;
  const cut = (mode - low) / span;
  return u < cut ? low + Math.sqrt(u * span * (mode - low)) : high - Math.sqrt((1 - u) * span * (high - mode));
}

export function monteCarlo(game: Game, ranges: PayoffRange[], options: MonteCarloOptions): MonteCarloResult {
  const flat = compiledGame(game);
  const source = sourceOf(flat);
  const targets = ranges.map((r) => {
    const i = source.indexOf.get(r.terminalId);
    const t = game.teams.findIndex((team) => team.id === r.team);
    if (i === undefined || flat.mover[i] !== TERMINAL) throw new Error(`payoff range: "${r.terminalId}" is not a terminal node`);
    if (t < 0) throw new Error(`payoff range: unknown team "${r.team}"`);
    checkDistribution(r);
    return { terminal: i, team: t };
  });
  const rng = mulberry32(options.seed);
  const share = new Float64Array(flat.size);
  const every = Math.max(1, Math.min(50, Math.floor(options.samples / 100)));
  const solveSample = isPerfectInformation(flat) ? perfectSampler(flat, targets) : rollUpSampler(flat, targets);
  for (let s = 0; s < options.samples; s++) {
    solveSample(ranges.map((r) => sampleDistribution(r.distribution, rng)), share);
    if (s % every === every - 1) options.progress?.((s + 1) / options.samples, 'Monte Carlo samples');
  }
  const outcomes: OutcomeShare[] = [];
  for (let i = 0; i < flat.size; i++) {
    if (flat.mover[i] !== TERMINAL || share[i]! <= 0) continue;
    const node = source.nodes[i]!;
    outcomes.push({
      terminalId: node.id,
      ...(node.kind === 'terminal' && node.outcome ? { outcome: node.outcome } : {}),
      path: pathTo(game, node.id)!,
      probability: share[i]! / options.samples,
    });
  }
  outcomes.sort((a, b) => b.probability - a.probability);
  return { samples: options.samples, seed: options.seed, generator: 'mulberry32', outcomes };
}

type Target = { terminal: number; team: number };
/** Solves one sample and adds the reach probability of every terminal equilibrium play ends in to `share`. */
type Sampler = (values: number[], share: Float64Array) => void;

/**
 * Perfect information: the float kernel once, then per sample only the ancestors of the
 * sampled terminals are re-solved (nothing else can change).
 */
function perfectSampler(flat: FlatGame, targets: Target[]): Sampler {
  const payoff = flat.payoff.slice();
  const sampled: FlatGame = { ...flat, payoff };
  const solution = solveFlat(sampled);
  const parent = parentsOf(flat);
  const affected = new Set<number>();
  for (const { terminal } of targets) for (let x = terminal; x >= 0; x = parent[x]!) affected.add(x);
  const order = Int32Array.from([...affected].sort((a, b) => b - a));
  return (values, share) => {
    targets.forEach((t, k) => (payoff[flat.aux[t.terminal]! * flat.teams + t.team] = values[k]!));
    resolveNodes(sampled, order, solution);
    addPlay(flat, (i, k) => (k === solution.choice[i] ? 1 : 0), share);
  };
}

/** Imperfect information: one live roll-up; each sample re-solves only the subgames above the sampled terminals. */
function rollUpSampler(flat: FlatGame, targets: Target[]): Sampler {
  const session = new RollUpSession(flat, floatField, { payoff: Array.from(flat.payoff), prob: Array.from(flat.prob) });
  return (values, share) => {
    session.setPayoffs(targets.map((t, k) => ({ ...t, value: values[k]! })));
    const behaviour = session.behaviour();
    addPlay(flat, (i, k) => behaviour[flat.aux[i]!]![k]!, share);
  };
}

/** Walk the nodes equilibrium play reaches (choice(i, k): probability of action k at decision i), adding terminal reach to `share`. */
function addPlay(flat: FlatGame, choice: (node: number, action: number) => number, share: Float64Array) {
  const stack: [number, number][] = [[0, 1]];
  while (stack.length > 0) {
    const [i, reach] = stack.pop()!;
    if (flat.mover[i] === TERMINAL) {
      share[i]! += reach;
      continue;
    }
    const first = flat.childStart[i]!;
    for (let c = first; c < flat.childStart[i + 1]!; c++) {
      const w = flat.mover[i] === CHANCE ? flat.prob[flat.aux[i]! + c - first]! : choice(i, c - first);
      if (w > 0) stack.push([c, reach * w]);
    }
  }
}

function checkDistribution(range: PayoffRange) {
  const d = range.distribution;
  const low = toFloat(d.low);
  const high = toFloat(d.high);
  const where = `payoff range for ${range.team} at "${range.terminalId}"`;
  if (!(low <= high)) throw new Error(`${where}: low must not exceed high`);
  if (d.kind === 'triangular') {
    const mode = toFloat(d.mode);
    if (!(low <= mode && mode <= high)) throw new Error(`${where}: the mode must lie between low and high`);
  }
}
