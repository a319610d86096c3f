/**
 * Logit agent quantal response equilibrium (McKelvey and Palfrey, Games and Economic
 * Behavior 10, 1995 for the normal form; the agent form of Experimental Economics 1,
 * 1998): at every information set the mover plays action a with probability
 * proportional to exp(lambda_team * Q(a)), where Q(a) is the expected continuation
 * payoff of a, weighting the nodes of the set by how likely they are reached.
 * lambda = 0 is uniform play; as lambda grows the profile approaches a Nash equilibrium.
 *
 * In perfect-information games the agent QRE is unique and one bottom-up pass computes it.
 * Otherwise it is a fixed point; the solver traces it by continuation from lambda = 0
 * (where it is uniform) in growing steps, each corrected by Newton's method started
 * from the previous point, so it follows the principal branch. Proper subgames are
 * traced separately, bottom-up. If the branch turns back in lambda (a fold) the
 * corrector fails and the result says converged: false.
 */
import { CHANCE, TERMINAL, compiledGame, sourceOf, type FlatGame } from '../compile';
import { properSubgameRoots } from '../subgames';
import type { Game } from '../model';
import { infosetLabels } from '../profile';

export type Progress = (fraction: number, phase: string) => void;

export interface FlatQre {
  /** Probabilities of the actions of information set h start at offset[h]. */
  offset: Int32Array;
  probs: Float64Array;
  /** value[i * teams + t] under the profile. */
  value: Float64Array;
  converged: boolean;
  steps: number;
}

export interface QreTraceOptions {
  tolerance?: number;
  progress?: Progress;
}

function infosetOffsets(flat: FlatGame): Int32Array {
  const offset = new Int32Array(flat.infosetCount + 1);
  const counted = new Uint8Array(flat.infosetCount);
  for (let i = 0; i < flat.size; i++) {
    if (flat.mover[i]! < 0) continue;
    const h = flat.aux[i]!;
    if (counted[h]) continue;
    counted[h] = 1;
    offset[h + 1] = flat.childStart[i + 1]! - flat.childStart[i]!;
  }
  for (let h = 0; h < flat.infosetCount; h++) offset[h + 1]! += offset[h]!;
  return offset;
}

/** Members of each information set with more than one node: [flat index...] per set. */
function sharedSets(flat: FlatGame): Map<number, number[]> {
  const members = new Map<number, number[]>();
  for (let i = 0; i < flat.size; i++) {
    if (flat.mover[i]! < 0) continue;
    const list = members.get(flat.aux[i]!) ?? [];
    list.push(i);
    members.set(flat.aux[i]!, list);
  }
  for (const [h, list] of members) if (list.length < 2) members.delete(h);
  return members;
}

/** Write softmax(lambda * q) into probs[at .. at+q.length). */
function logit(q: ArrayLike<number>, count: number, lambda: number, probs: Float64Array, at: number) {
  let max = -Infinity;
  for (let k = 0; k < count; k++) max = Math.max(max, lambda * q[k]!);
  let sum = 0;
  for (let k = 0; k < count; k++) {
    const e = Math.exp(lambda * q[k]! - max);
    probs[at + k] = e;
    sum += e;
  }
  for (let k = 0; k < count; k++) probs[at + k]! /= sum;
}

/**
 * One bottom-up pass over `nodes` (flat indices, parents before children; nodes outside
 * the list must already have values; with `everyNode`, over all nodes 0..length-1): values under the profile; singleton information
 * sets respond exactly (logit of their children's values), shared sets keep their
 * current probabilities.
 */
function backwardPass(
  flat: FlatGame,
  nodes: ArrayLike<number>,
  lambdas: ArrayLike<number>,
  offset: Int32Array,
  probs: Float64Array,
  shared: Map<number, number[]>,
  value: Float64Array,
  everyNode = false,
) {
  const { teams, mover, childStart, aux, payoff, prob } = flat;
  let q = new Float64Array(16);
  for (let n = nodes.length - 1; n >= 0; n--) {
    const i = everyNode ? n : nodes[n]!;
    const m = mover[i]!;
    const row = i * teams;
    if (m === TERMINAL) {
      const src = aux[i]! * teams;
      for (let t = 0; t < teams; t++) value[row + t] = payoff[src + t]!;
      continue;
    }
    const first = childStart[i]!;
    const count = childStart[i + 1]! - first;
    let weights: Float64Array;
    let at: number;
    if (m === CHANCE) {
      weights = prob;
      at = aux[i]!;
    } else {
      const h = aux[i]!;
      at = offset[h]!;
      weights = probs;
      if (!shared.has(h)) {
        if (count > q.length) q = new Float64Array(count);
        for (let k = 0; k < count; k++) q[k] = value[(first + k) * teams + m]!;
        logit(q, count, lambdas[m]!, probs, at);
      }
    }
    for (let t = 0; t < teams; t++) {
      let sum = 0;
      for (let k = 0; k < count; k++) sum += weights[at + k]! * value[(first + k) * teams + t]!;
      value[row + t] = sum;
    }
  }
}

/** Reach probabilities within a part, from its root (reach 1) down through `nodes`. */
function reachProbabilities(flat: FlatGame, nodes: ArrayLike<number>, offset: Int32Array, probs: Float64Array, reach: Float64Array) {
  const { mover, childStart, aux, prob } = flat;
  reach[nodes[0]!] = 1;
  for (let n = 0; n < nodes.length; n++) {
    const i = nodes[n]!;
    const m = mover[i]!;
    const first = childStart[i]!;
    const at = m === CHANCE ? aux[i]! : offset[aux[i]!]!;
    const weights = m === CHANCE ? prob : probs;
    for (let c = first; c < childStart[i + 1]!; c++) reach[c] = reach[i]! * weights[at + c - first]!;
  }
}

/**
 * The equilibrium condition at the shared information sets of one part, in log-odds
 * form: with y[h,k] = log(p[h,k] / p[h,0]) for k >= 1, a logit QRE satisfies
 * y[h,k] = lambda * (Q[h,k] - Q[h,0]). Residual G(y) = y - lambda * dQ.
 */
class SharedSystem {
  readonly dim: number;
  private readonly sets: { h: number; members: number[]; count: number; at: number }[] = [];

  constructor(
    private readonly flat: FlatGame,
    private readonly nodes: Int32Array,
    private readonly offset: Int32Array,
    private readonly probs: Float64Array,
    private readonly shared: Map<number, number[]>,
    sets: number[],
    private readonly value: Float64Array,
    private readonly reach: Float64Array,
  ) {
    let dim = 0;
    for (const h of sets) {
      const count = offset[h + 1]! - offset[h]!;
      this.sets.push({ h, members: shared.get(h)!, count, at: dim });
      dim += count - 1;
    }
    this.dim = dim;
  }

  /** Set the shared probabilities from log-odds y. */
  apply(y: Float64Array) {
    for (const { h, count, at } of this.sets) {
      const base = this.offset[h]!;
      let max = 0;
      for (let k = 1; k < count; k++) max = Math.max(max, y[at + k - 1]!);
      let sum = Math.exp(-max);
      this.probs[base] = sum;
      for (let k = 1; k < count; k++) {
        const e = Math.exp(y[at + k - 1]! - max);
        this.probs[base + k] = e;
        sum += e;
      }
      for (let k = 0; k < count; k++) this.probs[base + k]! /= sum;
    }
  }

  /** Residual G(y) at lambdas, written into out. */
  residual(y: Float64Array, lambdas: ArrayLike<number>, out: Float64Array) {
    const { flat, value, reach } = this;
    this.apply(y);
    backwardPass(flat, this.nodes, lambdas, this.offset, this.probs, this.shared, value);
    reachProbabilities(flat, this.nodes, this.offset, this.probs, reach);
    for (const { members, count, at } of this.sets) {
      const m = flat.mover[members[0]!]!;
      let mass = 0;
      for (const x of members) mass += reach[x]!;
      const q = new Float64Array(count);
      for (const x of members) {
        const w = mass > 0 ? reach[x]! / mass : 1 / members.length;
        for (let k = 0; k < count; k++) q[k]! += w * value[(flat.childStart[x]! + k) * flat.teams + m]!;
      }
      for (let k = 1; k < count; k++) out[at + k - 1] = y[at + k - 1]! - lambdas[m]! * (q[k]! - q[0]!);
    }
  }
}

const norm = (v: Float64Array) => Math.sqrt(v.reduce((s, x) => s + x * x, 0));

/** Newton's method with a finite-difference Jacobian and step halving. Returns true on convergence. */
function newton(system: SharedSystem, y: Float64Array, lambdas: ArrayLike<number>, tolerance: number): boolean {
  const d = system.dim;
  const g = new Float64Array(d);
  const trial = new Float64Array(d);
  const gTrial = new Float64Array(d);
  system.residual(y, lambdas, g);
  for (let iteration = 0; iteration < 50; iteration++) {
    const size = norm(g);
    if (size < tolerance) return true;
    const J: number[][] = Array.from({ length: d }, () => new Array<number>(d).fill(0));
    for (let j = 0; j < d; j++) {
      const h = 1e-7 * Math.max(1, Math.abs(y[j]!));
      trial.set(y);
      trial[j]! += h;
      system.residual(trial, lambdas, gTrial);
      for (let i = 0; i < d; i++) J[i]![j] = (gTrial[i]! - g[i]!) / h;
    }
    const step = solveDense(J, Array.from(g, (v) => -v));
    if (!step) return false;
    let t = 1;
    for (;;) {
      for (let j = 0; j < d; j++) trial[j] = y[j]! + t * step[j]!;
      system.residual(trial, lambdas, gTrial);
      if (norm(gTrial) < size || t < 1e-4) break;
      t /= 2;
    }
    if (t < 1e-4) return false;
    y.set(trial);
    g.set(gTrial);
  }
  return norm(g) < tolerance;
}

/** Gaussian elimination with partial pivoting; null when singular. */
function solveDense(A: number[][], b: number[]): number[] | null {
  const n = b.length;
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(A[r]![c]!) > Math.abs(A[p]![c]!)) p = r;
    if (Math.abs(A[p]![c]!) < 1e-14) return null;
    [A[c], A[p]] = [A[p]!, A[c]!];
    [b[c], b[p]] = [b[p]!, b[c]!];
    for (let r = c + 1; r < n; r++) {
      const f = A[r]![c]! / A[c]![c]!;
      if (f === 0) continue;
      for (let k = c; k < n; k++) A[r]![k]! -= f * A[c]![k]!;
      b[r]! -= f * b[c]!;
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r]!;
    for (let k = r + 1; k < n; k++) s -= A[r]![k]! * x[k]!;
    x[r] = s / A[r]![r]!;
  }
  return x;
}

/** Internal nodes of the proper subgame rooted at `root`, stopping at nested subgame roots and terminals. */
function partNodes(flat: FlatGame, roots: Uint8Array, root: number): Int32Array {
  const out = [root];
  for (let head = 0; head < out.length; head++) {
    const i = out[head]!;
    for (let c = flat.childStart[i]!; c < flat.childStart[i + 1]!; c++) {
      if (flat.mover[c] !== TERMINAL && !roots[c]) out.push(c);
    }
  }
  return Int32Array.from(out);
}

interface Part {
  nodes: Int32Array;
  /** Shared information sets inside the part. */
  sets: number[];
}

interface Structure {
  shared: Map<number, number[]>;
  parts: Part[];
}

const structureCache = new WeakMap<FlatGame, Structure>();

/** The shared information sets and the proper subgames (bottom-up, with their internal nodes and shared sets) of a flat game. */
function structureOf(flat: FlatGame): Structure {
  const cached = structureCache.get(flat);
  if (cached) return cached;
  const shared = sharedSets(flat);
  const parts: Part[] = [];
  if (shared.size > 0) collectParts(flat, shared, parts);
  const structure = { shared, parts };
  structureCache.set(flat, structure);
  return structure;
}

function collectParts(flat: FlatGame, shared: Map<number, number[]>, parts: Part[]) {
  const roots = properSubgameRoots(flat);
  const firstMember = new Map([...shared].map(([h, members]) => [members[0]!, h]));
  for (let i = flat.size - 1; i >= 0; i--) {
    if (flat.mover[i] === TERMINAL || !roots[i]) continue;
    const nodes = partNodes(flat, roots, i);
    parts.push({ nodes, sets: [...nodes].flatMap((x) => (firstMember.has(x) ? [firstMember.get(x)!] : [])) });
  }
}

/** Trace the QRE of one part from lambda = 0 to the target lambdas. Returns false if the corrector fails. */
function tracePart(system: SharedSystem, lambdas: ArrayLike<number>, tolerance: number): boolean {
  const y = new Float64Array(system.dim);
  const at = new Float64Array(lambdas.length);
  const scaled = (s: number) => {
    for (let t = 0; t < lambdas.length; t++) at[t] = s * lambdas[t]!;
    return at;
  };
  let s = 0;
  let step = 0.1;
  while (s < 1) {
    const saved = y.slice();
    const next = Math.min(1, s + step);
    if (newton(system, y, scaled(next), tolerance)) {
      s = next;
      step = Math.min(step * 1.5, 0.5);
    } else {
      y.set(saved);
      step /= 2;
      if (step < 1e-6) {
        system.residual(y, scaled(s), new Float64Array(system.dim));
        return false;
      }
    }
  }
  system.residual(y, scaled(1), new Float64Array(system.dim));
  return true;
}

/**
 * The agent logit QRE of a flat game at per-team lambdas (indexed by team). The agent
 * QRE of a proper subgame depends only on that subgame, so parts with shared information
 * sets are traced one at a time, bottom-up, with the values of their nested parts fixed.
 */
export function qreFlat(flat: FlatGame, lambdas: ArrayLike<number>, options: QreTraceOptions = {}): FlatQre {
  const tolerance = options.tolerance ?? 1e-10;
  const offset = infosetOffsets(flat);
  const probs = new Float64Array(offset[flat.infosetCount]!);
  for (let h = 0; h < flat.infosetCount; h++) {
    const count = offset[h + 1]! - offset[h]!;
    probs.fill(1 / count, offset[h]!, offset[h + 1]!);
  }
  const value = new Float64Array(flat.size * flat.teams);
  const { shared, parts } = structureOf(flat);
  if (shared.size === 0) {
    backwardPass(flat, { length: flat.size } as Int32Array, lambdas, offset, probs, shared, value, true);
    options.progress?.(1, 'logit QRE');
    return { offset, probs, value, converged: true, steps: 0 };
  }
  for (let i = 0; i < flat.size; i++) {
    if (flat.mover[i] !== TERMINAL) continue;
    for (let t = 0; t < flat.teams; t++) value[i * flat.teams + t] = flat.payoff[flat.aux[i]! * flat.teams + t]!;
  }
  const reach = new Float64Array(flat.size);
  let converged = true;
  let traced = 0;
  parts.forEach(({ nodes, sets }, k) => {
    if (sets.length === 0) {
      backwardPass(flat, nodes, lambdas, offset, probs, shared, value);
      return;
    }
    converged &&= tracePart(new SharedSystem(flat, nodes, offset, probs, shared, sets, value, reach), lambdas, tolerance);
    traced++;
    options.progress?.((k + 1) / parts.length, 'logit QRE by subgames');
  });
  return { offset, probs, value, converged, steps: traced };
}

export interface QreOptions {
  /** One lambda for all teams, or one per team id. */
  lambda: number | Record<string, number>;
  tolerance?: number;
  progress?: Progress;
}

export interface QreResult {
  lambda: Record<string, number>;
  /** behaviour[infoset or node id][action label] = probability */
  behaviour: Record<string, Record<string, number>>;
  /** Expected payoff of every team at the root, in team order. */
  payoffs: number[];
  converged: boolean;
  /** Proper subgames traced by continuation (0 or 1 for perfect information). */
  steps: number;
}

function teamLambdas(game: Game, lambda: number | Record<string, number>): Float64Array {
  return Float64Array.from(game.teams, (team) => {
    const value = typeof lambda === 'number' ? lambda : lambda[team.id];
    if (value === undefined) throw new Error(`no lambda given for team "${team.id}"`);
    if (!Number.isFinite(value) || value < 0) throw new Error(`lambda for team "${team.id}" must be a finite number >= 0`);
    return value;
  });
}

export function logitQre(game: Game, options: QreOptions): QreResult {
  const flat = compiledGame(game);
  const lambdas = teamLambdas(game, options.lambda);
  const result = qreFlat(flat, lambdas, options);
  return {
    lambda: Object.fromEntries(game.teams.map((t, i) => [t.id, lambdas[i]!])),
    behaviour: behaviourRecord(flat, result),
    payoffs: Array.from(result.value.subarray(0, flat.teams)),
    converged: result.converged,
    steps: result.steps,
  };
}

export function behaviourRecord(flat: FlatGame, result: Pick<FlatQre, 'offset' | 'probs'>): Record<string, Record<string, number>> {
  const source = sourceOf(flat);
  const out: Record<string, Record<string, number>> = {};
  source.infosetKeys.forEach((key, h) => {
    const labels = infosetLabels(flat, h);
    out[key] = Object.fromEntries(labels.map((l, k) => [l, result.probs[result.offset[h]! + k]!]));
  });
  return out;
}
