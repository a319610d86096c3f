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

/** A proper subgame with shared information sets: its internal nodes (parents first) and those sets. */
interface TracedPart {
  nodes: Int32Array;
  sets: number[];
}

/** What every QRE solve of one flat game shares, computed once per game. */
interface Structure {
  offset: Int32Array;
  /** shared[h] = 1 for an information set of several nodes. */
  shared: Uint8Array;
  members: Map<number, number[]>;
  traced: TracedPart[];
  /**
   * The bottom-up pass, or null for perfect information (every node, last to first): an
   * entry i >= 0 solves node i from its children, -(k + 1) traces part k. Every node of a
   * traced part but its root is left to the trace, whose leaves come later in the
   * breadth-first order and so are already solved.
   */
  schedule: Int32Array | null;
  /** Largest number of actions at a node. */
  maxActions: number;
  /** Bit t of movers[i]: team t moves somewhere in the subtree of node i, so the QRE there depends on its lambda. */
  movers: Int32Array;
}

const structureCache = new WeakMap<FlatGame, Structure>();

function structureOf(flat: FlatGame): Structure {
  let structure = structureCache.get(flat);
  if (!structure) {
    structure = buildStructure(flat);
    structureCache.set(flat, structure);
  }
  return structure;
}

function buildStructure(flat: FlatGame): Structure {
  const members = sharedSets(flat);
  const shared = new Uint8Array(flat.infosetCount);
  for (const h of members.keys()) shared[h] = 1;
  let maxActions = 1;
  for (let i = 0; i < flat.size; i++) maxActions = Math.max(maxActions, flat.childStart[i + 1]! - flat.childStart[i]!);
  const base = { offset: infosetOffsets(flat), shared, members, maxActions, movers: subtreeMovers(flat) };
  if (members.size === 0) return { ...base, traced: [], schedule: null };
  const roots = properSubgameRoots(flat);
  const firstMember = new Map([...members].map(([h, list]) => [list[0]!, h]));
  const traced: TracedPart[] = [];
  const tracedAt = new Int32Array(flat.size).fill(-1);
  const insideTraced = new Uint8Array(flat.size);
  for (let i = flat.size - 1; i >= 0; i--) {
    if (flat.mover[i] === TERMINAL || !roots[i]) continue;
    const nodes = partNodes(flat, roots, i);
    const sets = [...nodes].flatMap((x) => (firstMember.has(x) ? [firstMember.get(x)!] : []));
    if (sets.length === 0) continue;
    tracedAt[i] = traced.length;
    traced.push({ nodes, sets });
    for (let n = 1; n < nodes.length; n++) insideTraced[nodes[n]!] = 1;
  }
  const schedule: number[] = [];
  for (let i = flat.size - 1; i >= 0; i--) {
    if (tracedAt[i]! >= 0) schedule.push(-(tracedAt[i]! + 1));
    else if (!insideTraced[i]) schedule.push(i);
  }
  return { ...base, traced, schedule: Int32Array.from(schedule) };
}

function subtreeMovers(flat: FlatGame): Int32Array {
  const movers = new Int32Array(flat.size);
  for (let i = flat.size - 1; i >= 0; i--) {
    let mask = flat.mover[i]! >= 0 ? 1 << flat.mover[i]! : flat.mover[i] === TERMINAL ? TERMINAL_BIT : 0;
    for (let c = flat.childStart[i]!; c < flat.childStart[i + 1]!; c++) mask |= movers[c]!;
    movers[i] = mask;
  }
  return movers;
}

/** Terminals carry a bit of no team, so only the first solve (EVERYTHING) writes their values. */
const TERMINAL_BIT = 1 << 30;
/** A mask meaning "solve every node" (the first solve of a workspace). */
const EVERYTHING = -1;

/**
 * The arrays of one QRE solve and the passes over them. A workspace can be solved again
 * at other lambdas (the lambda fit does so hundreds of times): each solve overwrites the
 * previous result, and nothing is allocated per solve. A solve re-computes only the
 * subtrees where a team whose lambda changed since the previous solve moves: elsewhere
 * the previous numbers are the ones a fresh solve would give.
 */
export class QreWorkspace {
  readonly offset: Int32Array;
  readonly probs: Float64Array;
  /** value[i * teams + t] under the profile. */
  readonly value: Float64Array;
  private readonly reach: Float64Array;
  private readonly q: Float64Array;
  private readonly structure: Structure;
  private readonly systems: SharedSystem[];
  private readonly convergedParts: Uint8Array;
  /** Lambdas of the previous solve; NaN before the first. */
  private readonly solvedAt: Float64Array;

  constructor(readonly flat: FlatGame) {
    this.structure = structureOf(flat);
    this.offset = this.structure.offset;
    this.probs = new Float64Array(this.offset[flat.infosetCount]!);
    for (let h = 0; h < flat.infosetCount; h++) {
      this.probs.fill(1 / (this.offset[h + 1]! - this.offset[h]!), this.offset[h]!, this.offset[h + 1]!);
    }
    this.value = new Float64Array(flat.size * flat.teams);
    this.reach = new Float64Array(flat.size);
    this.q = new Float64Array(this.structure.maxActions);
    this.systems = this.structure.traced.map((part) => new SharedSystem(this, part));
    this.convergedParts = new Uint8Array(this.systems.length).fill(1);
    this.solvedAt = new Float64Array(flat.teams).fill(NaN);
  }

  /** Bit t set when team t's lambda differs from the previous solve's; EVERYTHING at the first solve. */
  private changedTeams(lambdas: ArrayLike<number>): number {
    let changed = Number.isNaN(this.solvedAt[0]) ? EVERYTHING : 0;
    for (let t = 0; t < this.flat.teams; t++) {
      if (lambdas[t] !== this.solvedAt[t]) changed |= 1 << t;
      this.solvedAt[t] = lambdas[t]!;
    }
    return changed;
  }

  /** The agent QRE at per-team lambdas; `offset`, `probs` and `value` hold it until the next solve. */
  solve(lambdas: ArrayLike<number>, options: QreTraceOptions = {}): FlatQre {
    const tolerance = options.tolerance ?? 1e-10;
    const { schedule, traced, movers } = this.structure;
    const changed = this.changedTeams(lambdas);
    if (!schedule) {
      for (let i = this.flat.size - 1; i >= 0; i--) if (movers[i]! & changed) this.solveNode(i, lambdas);
      options.progress?.(1, 'logit QRE');
    } else {
      let done = 0;
      for (let n = 0; n < schedule.length; n++) {
        const entry = schedule[n]!;
        const root = entry >= 0 ? entry : traced[-entry - 1]!.nodes[0]!;
        if (!(movers[root]! & changed)) continue;
        if (entry >= 0) this.solveNode(entry, lambdas);
        else this.convergedParts[-entry - 1] = tracePart(this.systems[-entry - 1]!, lambdas, tolerance) ? 1 : 0;
        if (entry < 0) options.progress?.(++done / traced.length, 'logit QRE by subgames');
      }
    }
    return { offset: this.offset, probs: this.probs, value: this.value, converged: this.convergedParts.every(Boolean), steps: traced.length };
  }

  /**
   * Values of node i from its children's; a decision alone in its information set
   * responds exactly (logit of its children's values), a shared set keeps its current
   * probabilities.
   */
  solveNode(i: number, lambdas: ArrayLike<number>) {
    const { teams, mover, childStart, aux, payoff, prob } = this.flat;
    const { value, probs, q } = this;
    const m = mover[i]!;
    const row = i * teams;
    if (m === TERMINAL) {
      const src = aux[i]! * teams;
      for (let t = 0; t < teams; t++) value[row + t] = payoff[src + t]!;
      return;
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
      at = this.offset[h]!;
      weights = probs;
      if (!this.structure.shared[h]) {
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

  /** Reach probabilities within a part, from its root (reach 1) down through `nodes`. */
  reachWithin(nodes: Int32Array): Float64Array {
    const { mover, childStart, aux, prob } = this.flat;
    const { reach, probs, offset } = this;
    reach[nodes[0]!] = 1;
    for (let n = 0; n < nodes.length; n++) {
      const i = nodes[n]!;
      const m = mover[i]!;
      const first = childStart[i]!;
      const at = m === CHANCE ? aux[i]! : offset[aux[i]!]!;
      const weights = m === CHANCE ? prob : probs;
      for (let c = first; c < childStart[i + 1]!; c++) reach[c] = reach[i]! * weights[at + c - first]!;
    }
    return reach;
  }
}

/**
 * The equilibrium condition at the shared information sets of one part, in log-odds
 * form: with y[h,k] = log(p[h,k] / p[h,0]) for k >= 1, a logit QRE satisfies
 * y[h,k] = lambda * (Q[h,k] - Q[h,0]). Residual G(y) = y - lambda * dQ.
 */
class SharedSystem {
  readonly dim: number;
  private readonly sets: { h: number; members: number[]; mover: number; count: number; at: number }[] = [];
  private readonly q: Float64Array;
  /** Buffers of Newton's method and of the continuation, sized once. */
  readonly scratch: { g: Float64Array; trial: Float64Array; gTrial: Float64Array; jacobian: Float64Array; step: Float64Array; saved: Float64Array; lambdas: Float64Array };

  constructor(
    private readonly workspace: QreWorkspace,
    private readonly part: TracedPart,
  ) {
    const { flat, offset } = workspace;
    const members = structureOf(flat).members;
    let dim = 0;
    for (const h of part.sets) {
      const count = offset[h + 1]! - offset[h]!;
      const list = members.get(h)!;
      this.sets.push({ h, members: list, mover: flat.mover[list[0]!]!, count, at: dim });
      dim += count - 1;
    }
    this.dim = dim;
    this.q = new Float64Array(structureOf(flat).maxActions);
    const vector = () => new Float64Array(dim);
    this.scratch = { g: vector(), trial: vector(), gTrial: vector(), jacobian: new Float64Array(dim * dim), step: vector(), saved: vector(), lambdas: new Float64Array(flat.teams) };
  }

  /** Set the shared probabilities from log-odds y. */
  apply(y: Float64Array) {
    const { probs, offset } = this.workspace;
    for (const { h, count, at } of this.sets) {
      const base = offset[h]!;
      let max = 0;
      for (let k = 1; k < count; k++) max = Math.max(max, y[at + k - 1]!);
      let sum = Math.exp(-max);
      probs[base] = sum;
      for (let k = 1; k < count; k++) {
        const e = Math.exp(y[at + k - 1]! - max);
        probs[base + k] = e;
        sum += e;
      }
      for (let k = 0; k < count; k++) probs[base + k]! /= sum;
    }
  }

  /** Residual G(y) at lambdas, written into out. */
  residual(y: Float64Array, lambdas: ArrayLike<number>, out: Float64Array) {
    const { workspace, q } = this;
    const { flat, value } = workspace;
    const nodes = this.part.nodes;
    this.apply(y);
    for (let n = nodes.length - 1; n >= 0; n--) workspace.solveNode(nodes[n]!, lambdas);
    const reach = workspace.reachWithin(nodes);
    for (const { members, mover: m, count, at } of this.sets) {
      let mass = 0;
      for (const x of members) mass += reach[x]!;
      q.fill(0, 0, count);
      for (const x of members) {
        const w = mass > 0 ? reach[x]! / mass : 1 / members.length;
        for (let k = 0; k < count; k++) q[k]! += w * value[(flat.childStart[x]! + k) * flat.teams + m]!;
      }
      for (let k = 1; k < count; k++) out[at + k - 1] = y[at + k - 1]! - lambdas[m]! * (q[k]! - q[0]!);
    }
  }
}

function norm(v: Float64Array): number {
  let sum = 0;
  for (let k = 0; k < v.length; k++) sum += v[k]! * v[k]!;
  return Math.sqrt(sum);
}

/** Newton's method with a finite-difference Jacobian and step halving. Returns true on convergence. */
function newton(system: SharedSystem, y: Float64Array, lambdas: ArrayLike<number>, tolerance: number): boolean {
  const d = system.dim;
  const { g, trial, gTrial, jacobian: J, step } = system.scratch;
  system.residual(y, lambdas, g);
  for (let iteration = 0; iteration < 50; iteration++) {
    const size = norm(g);
    if (size < tolerance) return true;
    for (let j = 0; j < d; j++) {
      const h = 1e-7 * Math.max(1, Math.abs(y[j]!));
      trial.set(y);
      trial[j]! += h;
      system.residual(trial, lambdas, gTrial);
      for (let i = 0; i < d; i++) J[i * d + j] = (gTrial[i]! - g[i]!) / h;
    }
    for (let i = 0; i < d; i++) step[i] = -g[i]!;
    if (!solveDense(J, step, d)) return false;
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

/** Solve A x = b in place (A: n x n row-major, b becomes x) by Gaussian elimination with partial pivoting; false when singular. */
function solveDense(A: Float64Array, b: Float64Array, n: number): boolean {
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(A[r * n + c]!) > Math.abs(A[p * n + c]!)) p = r;
    if (Math.abs(A[p * n + c]!) < 1e-14) return false;
    if (p !== c) {
      for (let k = 0; k < n; k++) {
        const swap = A[c * n + k]!;
        A[c * n + k] = A[p * n + k]!;
        A[p * n + k] = swap;
      }
      const swap = b[c]!;
      b[c] = b[p]!;
      b[p] = swap;
    }
    for (let r = c + 1; r < n; r++) {
      const f = A[r * n + c]! / A[c * n + c]!;
      if (f === 0) continue;
      for (let k = c; k < n; k++) A[r * n + k]! -= f * A[c * n + k]!;
      b[r]! -= f * b[c]!;
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r]!;
    for (let k = r + 1; k < n; k++) s -= A[r * n + k]! * b[k]!;
    b[r] = s / A[r * n + r]!;
  }
  return true;
}

/** Trace the QRE of one part from lambda = 0 to the target lambdas. Returns false if the corrector fails. */
function tracePart(system: SharedSystem, lambdas: ArrayLike<number>, tolerance: number): boolean {
  const { saved, lambdas: at, gTrial: unused } = system.scratch;
  const y = new Float64Array(system.dim);
  const scaled = (s: number) => {
    for (let t = 0; t < lambdas.length; t++) at[t] = s * lambdas[t]!;
    return at;
  };
  let s = 0;
  let step = 0.1;
  while (s < 1) {
    saved.set(y);
    const next = Math.min(1, s + step);
    if (newton(system, y, scaled(next), tolerance)) {
      s = next;
      step = Math.min(step * 1.5, 0.5);
    } else {
      y.set(saved);
      step /= 2;
      if (step < 1e-6) {
        system.residual(y, scaled(s), unused);
        return false;
      }
    }
  }
  system.residual(y, scaled(1), unused);
  return true;
}

/**
 * The agent logit QRE of a flat game at per-team lambdas (indexed by team). The agent
 * QRE of a proper subgame depends only on that subgame, so parts with shared information
 * sets are traced one at a time, bottom-up, with the values of their nested parts fixed.
 */
export function qreFlat(flat: FlatGame, lambdas: ArrayLike<number>, options: QreTraceOptions = {}): FlatQre {
  return new QreWorkspace(flat).solve(lambdas, options);
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
