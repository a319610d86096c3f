/**
 * Backward induction for games of perfect information, any number of teams, chance
 * nodes by expectation. Two modes:
 *  - float: an iterative kernel over the compiled typed arrays (no recursion, no
 *    per-node objects); ties within a relative 1e-9 count as ties;
 *  - exact: the same induction in rational arithmetic.
 * With ties there are several pure subgame-perfect equilibria: the solver counts them all
 * (by the distinct value vectors each subtree can produce), counts the distinct plays they
 * make (ties off the path multiply equilibria, not plays), and lists the first K in a
 * fixed order (earlier actions first).
 */
import { CHANCE, TERMINAL, compiledGame, isPerfectInformation, sourceOf, type FlatGame } from '../compile';
import type { Game } from '../model';
import { exactField, floatCmp, floatField, type Field } from '../numbers';
import {
  advanceOdometer,
  chanceSummary,
  decisionSummary,
  equilibriumPlays,
  expectation,
  singleSummary,
  summaryTotal,
  type EquilibriumPlays,
  type Summary,
} from '../enumeration';
import { actionCount, numbersOf, toEquilibrium, type Behaviour, type Equilibrium } from '../profile';

/** Marks a node without a choice in FlatSolution.choice. */
export const NO_CHOICE = 0xffff;

export interface FlatSolution {
  /** value[i * teams + t]: value of node i for team t. */
  value: Float64Array;
  /** Index of the chosen child among node i's children; NO_CHOICE when i is not a decision node. */
  choice: Uint16Array;
  /** Decision nodes where the mover's best value is reached by more than one action. */
  ties: number;
}

/** The float kernel: one bottom-up pass over the flat arrays. */
export function solveFlat(flat: FlatGame): FlatSolution {
  const value = new Float64Array(flat.size * flat.teams);
  const choice = new Uint16Array(flat.size).fill(NO_CHOICE);
  let ties = 0;
  for (let i = flat.size - 1; i >= 0; i--) if (solveNode(flat, i, value, choice)) ties++;
  return { value, choice, ties };
}

/**
 * Re-solve the given nodes (descending indices: children first) after payoffs below them
 * changed, updating a solution in place. Used to re-solve only the ancestors of altered terminals.
 */
export function resolveNodes(flat: FlatGame, nodes: ArrayLike<number>, solution: FlatSolution) {
  for (let n = 0; n < nodes.length; n++) solveNode(flat, nodes[n]!, solution.value, solution.choice);
}

/** Backward induction at one node whose children are solved; true when the mover's best value is tied. */
function solveNode(flat: FlatGame, i: number, value: Float64Array, choice: Uint16Array): boolean {
  const { teams, mover, childStart, aux, payoff, prob } = flat;
  const m = mover[i]!;
  const row = i * teams;
  if (m === TERMINAL) {
    const src = aux[i]! * teams;
    for (let t = 0; t < teams; t++) value[row + t] = payoff[src + t]!;
    return false;
  }
  const first = childStart[i]!;
  const end = childStart[i + 1]!;
  if (m === CHANCE) {
    const p0 = aux[i]! - first;
    for (let t = 0; t < teams; t++) {
      let sum = 0;
      for (let c = first; c < end; c++) sum += prob[p0 + c]! * value[c * teams + t]!;
      value[row + t] = sum;
    }
    return false;
  }
  let best = first;
  let bestValue = value[first * teams + m]!;
  let tied = false;
  for (let c = first + 1; c < end; c++) {
    const v = value[c * teams + m]!;
    const order = floatCmp(v, bestValue);
    if (order > 0) {
      best = c;
      bestValue = v;
      tied = false;
    } else if (order === 0) tied = true;
  }
  choice[i] = best - first;
  const src = best * teams;
  for (let t = 0; t < teams; t++) value[row + t] = value[src + t]!;
  return tied;
}

/**
 * The first subgame-perfect equilibrium (ties to the earlier action) in any field:
 * the generic twin of solveFlat, for exact arithmetic and altered payoffs.
 */
export function solveFlatWith<T>(flat: FlatGame, field: Field<T>, numbers: { payoff: T[]; prob: T[] }): { value: T[]; choice: Int32Array } {
  const { teams, size, mover, childStart, aux } = flat;
  const value: T[] = new Array(size * teams);
  const choice = new Int32Array(size).fill(-1);
  for (let i = size - 1; i >= 0; i--) {
    const m = mover[i]!;
    const row = i * teams;
    const first = childStart[i]!;
    const end = childStart[i + 1]!;
    if (m === TERMINAL) {
      for (let t = 0; t < teams; t++) value[row + t] = numbers.payoff[aux[i]! * teams + t]!;
    } else if (m === CHANCE) {
      for (let t = 0; t < teams; t++) {
        let sum = field.zero;
        for (let c = first; c < end; c++) sum = field.add(sum, field.mul(numbers.prob[aux[i]! + c - first]!, value[c * teams + t]!));
        value[row + t] = sum;
      }
    } else {
      let best = first;
      for (let c = first + 1; c < end; c++) if (field.cmp(value[c * teams + m]!, value[best * teams + m]!) > 0) best = c;
      choice[i] = best - first;
      for (let t = 0; t < teams; t++) value[row + t] = value[best * teams + t]!;
    }
  }
  return { value, choice };
}

export interface BackwardInductionOptions {
  exact?: boolean;
  /** How many equilibria to list (default 1). All are counted regardless. */
  maxListed?: number;
}

export interface DecisionAnalysis {
  team: string;
  chosen: string;
  /** Continuation value of every action for every team (team order). */
  values: Record<string, number[]>;
  valuesExact?: Record<string, string[]>;
  /** Mover's value of the chosen action minus that of the best other action; null with one action. */
  margin: number | null;
  marginExact?: string | null;
}

export interface BackwardInductionResult extends EquilibriumPlays {
  method: string;
  exact: boolean;
  /** Number of pure subgame-perfect equilibria. */
  count: number;
  /** False when the count exceeded what can be held exactly (it is then a lower bound). */
  countExact: boolean;
  equilibria: Equilibrium[];
  /** For the first listed equilibrium, keyed by decision node id. */
  decisions: Record<string, DecisionAnalysis>;
}

/** One of the first K equilibria of a subtree: its value, the choice here, and which entry of each child it uses. */
interface Entry<T> {
  value: T[];
  action: number;
  picks: number[];
}

export function backwardInduction(game: Game, options: BackwardInductionOptions = {}): BackwardInductionResult {
  const flat = compiledGame(game);
  if (!isPerfectInformation(flat)) {
    throw new Error('backward induction needs perfect information; this game has information sets with several nodes');
  }
  const maxListed = Math.max(1, options.maxListed ?? 1);
  if (options.exact) return induce(flat, exactField, maxListed, 'backward induction (exact)');
  const kernel = solveFlat(flat);
  if (kernel.ties > 0) return induce(flat, floatField, maxListed, 'backward induction (float)');
  const behaviour = behaviourFromChoices(flat, kernel.choice, floatField);
  const rowOf = (i: number) => Array.from(kernel.value.subarray(i * flat.teams, (i + 1) * flat.teams));
  return {
    method: 'backward induction (float)',
    exact: false,
    count: 1,
    countExact: true,
    ...equilibriumPlays(floatField, singleSummary(rowOf(0)), true, rowOf(0)),
    equilibria: [toEquilibrium(flat, floatField, behaviour, rowOf(0))],
    decisions: analyseDecisions(flat, floatField, rowOf, (i) => kernel.choice[i]!),
  };
}

function behaviourFromChoices<T>(flat: FlatGame, choice: ArrayLike<number>, field: Field<T>): Behaviour<T> {
  const behaviour: Behaviour<T> = new Array(flat.infosetCount);
  for (let i = 0; i < flat.size; i++) {
    if (flat.mover[i]! < 0) continue;
    behaviour[flat.aux[i]!] = Array.from({ length: actionCount(flat, i) }, (_, k) => (k === choice[i] ? field.one : field.zero));
  }
  return behaviour;
}

function induce<T>(flat: FlatGame, field: Field<T>, maxListed: number, method: string): BackwardInductionResult {
  const { payoff, prob } = numbersOf(flat, field);
  const summaries: Summary<T>[] = new Array(flat.size);
  const entries: Entry<T>[][] = new Array(flat.size);
  for (let i = flat.size - 1; i >= 0; i--) {
    const m = flat.mover[i]!;
    if (m === TERMINAL) {
      const value = payoff.slice(flat.aux[i]! * flat.teams, (flat.aux[i]! + 1) * flat.teams);
      summaries[i] = singleSummary(value);
      entries[i] = [{ value, action: -1, picks: [] }];
      continue;
    }
    const children = childRange(flat, i);
    const weights = m === CHANCE ? prob.slice(flat.aux[i]!, flat.aux[i]! + children.length) : null;
    const summary = weights
      ? chanceSummary(field, children.map((c) => summaries[c]!), weights)
      : decisionSummary(field, m, children.map((c) => summaries[c]!));
    summaries[i] = summary;
    entries[i] = listEntries(field, m, children.map((c) => entries[c]!), weights, maxListed);
    for (const c of children) {
      summaries[c] = undefined!;
    }
  }
  const count = summaryTotal(summaries[0]!);
  const countExact = !summaries[0]!.truncated && Number.isSafeInteger(count);
  const listed = entries[0]!.map((_, j) => materialize(flat, field, entries, j));
  const first = listed[0]!;
  const rowOf = (i: number) => entries[i]![0]!.value;
  return {
    method,
    exact: field.exact,
    count,
    countExact,
    ...equilibriumPlays(field, summaries[0]!, true, entries[0]![0]!.value),
    equilibria: listed.map((behaviour, j) => toEquilibrium(flat, field, behaviour, entries[0]![j]!.value)),
    decisions: analyseDecisions(flat, field, rowOf, (i) => first[flat.aux[i]!]!.findIndex((p) => field.cmp(p, field.one) === 0)),
  };
}

function childRange(flat: FlatGame, i: number): number[] {
  const out: number[] = [];
  for (let c = flat.childStart[i]!; c < flat.childStart[i + 1]!; c++) out.push(c);
  return out;
}

/** The first K equilibria of a node, taking children's entries in lexicographic order. */
function listEntries<T>(field: Field<T>, m: number, children: Entry<T>[][], weights: T[] | null, maxListed: number): Entry<T>[] {
  const out: Entry<T>[] = [];
  const picks = new Array<number>(children.length).fill(0);
  const sizes = children.map((list) => list.length);
  for (;;) {
    const values = children.map((list, c) => list[picks[c]!]!.value);
    if (weights) {
      out.push({ value: expectation(field, values, weights), action: -1, picks: [...picks] });
    } else {
      let best = values[0]![m]!;
      for (const v of values) if (field.cmp(v[m]!, best) > 0) best = v[m]!;
      values.forEach((v, a) => {
        if (out.length < maxListed && field.cmp(v[m]!, best) === 0) out.push({ value: v, action: a, picks: [...picks] });
      });
    }
    if (out.length >= maxListed || !advanceOdometer(picks, sizes)) return out;
  }
}

function materialize<T>(flat: FlatGame, field: Field<T>, entries: Entry<T>[][], j: number): Behaviour<T> {
  const behaviour: Behaviour<T> = new Array(flat.infosetCount);
  const stack: [number, number][] = [[0, j]];
  while (stack.length > 0) {
    const [i, e] = stack.pop()!;
    const entry = entries[i]![e]!;
    if (flat.mover[i]! >= 0) {
      behaviour[flat.aux[i]!] = Array.from({ length: actionCount(flat, i) }, (_, k) => (k === entry.action ? field.one : field.zero));
    }
    entry.picks.forEach((pick, k) => stack.push([flat.childStart[i]! + k, pick]));
  }
  return behaviour;
}

function analyseDecisions<T>(
  flat: FlatGame,
  field: Field<T>,
  rowOf: (i: number) => T[],
  chosenOf: (i: number) => number,
): Record<string, DecisionAnalysis> {
  const source = sourceOf(flat);
  const out: Record<string, DecisionAnalysis> = {};
  for (let i = 0; i < flat.size; i++) {
    const m = flat.mover[i]!;
    const node = source.nodes[i]!;
    if (m < 0 || node.kind !== 'decision') continue;
    const chosen = chosenOf(i);
    const rows = node.actions.map((_, k) => rowOf(flat.childStart[i]! + k));
    let runnerUp: T | null = null;
    rows.forEach((row, k) => {
      if (k !== chosen && (runnerUp === null || field.cmp(row[m]!, runnerUp) > 0)) runnerUp = row[m]!;
    });
    const margin = runnerUp === null ? null : field.sub(rows[chosen]![m]!, runnerUp);
    const labels = node.actions.map((a) => a.label);
    out[node.id] = {
      team: node.team,
      chosen: labels[chosen]!,
      values: Object.fromEntries(labels.map((l, k) => [l, rows[k]!.map((v) => field.toNumber(v))])),
      margin: margin === null ? null : field.toNumber(margin),
      ...(field.exact
        ? {
            valuesExact: Object.fromEntries(labels.map((l, k) => [l, rows[k]!.map((v) => field.format(v)!)])),
            marginExact: margin === null ? null : field.format(margin)!,
          }
        : {}),
    };
  }
  return out;
}
