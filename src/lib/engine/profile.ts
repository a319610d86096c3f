/**
 * Behaviour profiles and the equilibrium record every solver returns. A profile gives,
 * for each information set (by index in the compiled game), the probability of each of
 * its actions. The JSON record keys choices by information-set id, or by node id for a
 * decision node that is alone in its information set.
 */
import { CHANCE, TERMINAL, compiledGame, edgeLabel, sourceOf, type FlatGame } from './compile';
import type { DecisionNode, Game } from './model';
import { exactField, floatField, toExact, toFloat, type Field } from './numbers';
import { choiceKey, indexGame } from './tree';

export interface Equilibrium {
  /** Labels from the root along the most probable play (see playPath). */
  path: string[];
  /** Node ids along that play, the root first. */
  pathNodes: string[];
  /** Expected payoff of every team at the root, in team order. */
  payoffs: number[];
  payoffsExact?: string[];
  /** choices[infoset or node id][action label] = probability */
  choices: Record<string, Record<string, number>>;
  choicesExact?: Record<string, Record<string, string>>;
}

export type Behaviour<T> = T[][];

export function actionCount(flat: FlatGame, node: number): number {
  return flat.childStart[node + 1]! - flat.childStart[node]!;
}

/** Values of every node for every team under a behaviour profile: row i*teams + t. */
export function profileValues<T>(flat: FlatGame, field: Field<T>, behaviour: Behaviour<T>, payoff?: T[], prob?: T[]): T[] {
  const { teams, size, mover, childStart, aux } = flat;
  const pay = payoff ?? numbersOf(flat, field).payoff;
  const pr = prob ?? numbersOf(flat, field).prob;
  const value: T[] = new Array(size * teams);
  for (let i = size - 1; i >= 0; i--) {
    const m = mover[i]!;
    if (m === TERMINAL) {
      for (let t = 0; t < teams; t++) value[i * teams + t] = pay[aux[i]! * teams + t]!;
      continue;
    }
    const first = childStart[i]!;
    const weights = m === CHANCE ? pr.slice(aux[i]!, aux[i]! + childStart[i + 1]! - first) : behaviour[aux[i]!]!;
    for (let t = 0; t < teams; t++) {
      let sum = field.zero;
      for (let k = 0; k < weights.length; k++) {
        const w = weights[k]!;
        if (field.cmp(w, field.zero) !== 0) sum = field.add(sum, field.mul(w, value[(first + k) * teams + t]!));
      }
      value[i * teams + t] = sum;
    }
  }
  return value;
}

/** Payoffs and chance probabilities of a compiled game in the field's number type. */
export function numbersOf<T>(flat: FlatGame, field: Field<T>): { payoff: T[]; prob: T[] } {
  if (field.exact) {
    const source = sourceOf(flat);
    return { payoff: source.payoffExact as T[], prob: source.probExact as T[] };
  }
  return { payoff: Array.from(flat.payoff) as T[], prob: Array.from(flat.prob) as T[] };
}

/** Index of the largest weight (the first among equals). */
function argmax<T>(field: Field<T>, weights: readonly T[]): number {
  let best = 0;
  for (let k = 1; k < weights.length; k++) if (field.cmp(weights[k]!, weights[best]!) > 0) best = k;
  return best;
}

/**
 * The play followed for display: at a decision node the most probable action, at a
 * chance node the outcome given in `draws` (node id to label) or else the most probable.
 */
function playPath<T>(flat: FlatGame, field: Field<T>, behaviour: Behaviour<T>, draws: Record<string, string> = {}) {
  const source = sourceOf(flat);
  const { prob } = numbersOf(flat, field);
  const nodes: number[] = [0];
  const labels: string[] = [];
  let i = 0;
  while (flat.mover[i] !== TERMINAL) {
    const first = flat.childStart[i]!;
    const count = actionCount(flat, i);
    let k: number;
    if (flat.mover[i] === CHANCE) {
      const drawn = draws[source.nodes[i]!.id];
      const byDraw = drawn === undefined ? -1 : childLabels(flat, i).indexOf(drawn);
      k = byDraw >= 0 ? byDraw : argmax(field, prob.slice(flat.aux[i]!, flat.aux[i]! + count));
    } else {
      k = argmax(field, behaviour[flat.aux[i]!]!);
    }
    labels.push(edgeLabel(source, i, k));
    i = first + k;
    nodes.push(i);
  }
  return { nodes, labels };
}

function childLabels(flat: FlatGame, node: number): string[] {
  const source = sourceOf(flat);
  const count = actionCount(flat, node);
  return Array.from({ length: count }, (_, k) => edgeLabel(source, node, k));
}

/** Action labels of an information set, in its order. */
export function infosetLabels(flat: FlatGame, infoset: number): string[] {
  return childLabels(flat, sourceOf(flat).infosetFirst[infoset]!);
}

/** The JSON record of a behaviour profile. */
export function toEquilibrium<T>(flat: FlatGame, field: Field<T>, behaviour: Behaviour<T>, rootValue?: T[]): Equilibrium {
  const source = sourceOf(flat);
  const values = rootValue ?? profileValues(flat, field, behaviour).slice(0, flat.teams);
  const path = playPath(flat, field, behaviour);
  const choices: Equilibrium['choices'] = {};
  const choicesExact: NonNullable<Equilibrium['choicesExact']> = {};
  behaviour.forEach((probs, set) => {
    const labels = infosetLabels(flat, set);
    const key = source.infosetKeys[set]!;
    choices[key] = Object.fromEntries(labels.map((l, k) => [l, field.toNumber(probs[k]!)]));
    if (field.exact) choicesExact[key] = Object.fromEntries(labels.map((l, k) => [l, field.format(probs[k]!)!]));
  });
  return {
    path: path.labels,
    pathNodes: path.nodes.map((i) => source.nodes[i]!.id),
    payoffs: values.map((v) => field.toNumber(v)),
    ...(field.exact ? { payoffsExact: values.map((v) => field.format(v)!), choicesExact } : {}),
    choices,
  };
}

/** A behaviour profile read back from an equilibrium record (exact when it carries exact values). */
export function behaviourFromEquilibrium<T>(flat: FlatGame, field: Field<T>, eq: Equilibrium): Behaviour<T> {
  const source = sourceOf(flat);
  return source.infosetKeys.map((key, set) => {
    const labels = infosetLabels(flat, set);
    const exact = eq.choicesExact?.[key];
    const floats = eq.choices[key];
    if (!floats && !exact) throw new Error(`the equilibrium gives no choice for "${key}"`);
    return labels.map((label) => {
      const e = exact?.[label];
      if (field.exact && e !== undefined) return field.from(e);
      const p = floats?.[label] ?? (e !== undefined ? toExact(e).valueOf() : 0);
      return field.fromNumber(p);
    });
  });
}

export interface PathStep {
  nodeId: string;
  kind: 'decision' | 'chance';
  team?: string;
  label: string;
  /** Probability the equilibrium (or chance) gives this step. */
  probability: number;
}

/**
 * The equilibrium path: node ids and labels from the root to a terminal. At chance
 * nodes it follows `draws` (node id to outcome label, e.g. the draws of a live exercise)
 * and otherwise the most probable outcome.
 */
export function equilibriumPath(game: Game, eq: Equilibrium, draws: Record<string, string> = {}): { steps: PathStep[]; terminal: string } {
  const flat = compiledGame(game);
  const source = sourceOf(flat);
  const behaviour = behaviourFromEquilibrium(flat, floatField, eq);
  const { nodes, labels } = playPath(flat, floatField, behaviour, draws);
  const steps = labels.map((label, s): PathStep => {
    const i = nodes[s]!;
    const node = source.nodes[i]!;
    const k = nodes[s + 1]! - flat.childStart[i]!;
    if (node.kind === 'decision') {
      return { nodeId: node.id, kind: 'decision', team: node.team, label, probability: behaviour[flat.aux[i]!]![k]! };
    }
    return { nodeId: node.id, kind: 'chance', label, probability: flat.prob[flat.aux[i]! + k]! };
  });
  return { steps, terminal: source.nodes[nodes[nodes.length - 1]!]!.id };
}

export interface ActionValue {
  label: string;
  /** Equilibrium probability of the action at this node's information set. */
  probability: number;
  /** Continuation value of every team, in team order, if this action is taken here and the equilibrium is followed afterwards. */
  values: number[];
  valuesExact?: string[];
}

export interface NodeActionValues {
  nodeId: string;
  team: string;
  /** Action with the highest equilibrium probability (the first among equals). */
  equilibriumAction: string;
  actions: ActionValue[];
}

/**
 * For a decision node: the equilibrium action and the continuation value of each action.
 * The regret of an actual move is the mover's value of the equilibrium action minus the
 * mover's value of the move made. Exact when the equilibrium carries exact choices.
 */
export function actionValues(game: Game, eq: Equilibrium, nodeId: string): NodeActionValues {
  const flat = compiledGame(game);
  const exact = eq.choicesExact !== undefined;
  return exact ? nodeActionValues(flat, exactField, eq, nodeId) : nodeActionValues(flat, floatField, eq, nodeId);
}

function nodeActionValues<T>(flat: FlatGame, field: Field<T>, eq: Equilibrium, nodeId: string): NodeActionValues {
  const source = sourceOf(flat);
  const i = source.indexOf.get(nodeId);
  const node = i === undefined ? undefined : source.nodes[i];
  if (i === undefined || !node) throw new Error(`no node with id "${nodeId}"`);
  if (node.kind !== 'decision') throw new Error(`node "${nodeId}" is a ${node.kind} node, not a decision`);
  const behaviour = behaviourFromEquilibrium(flat, field, eq);
  const values = profileValues(flat, field, behaviour);
  const probs = behaviour[flat.aux[i]!]!;
  const first = flat.childStart[i]!;
  const actions = (node as DecisionNode).actions.map((a, k): ActionValue => {
    const row = values.slice((first + k) * flat.teams, (first + k + 1) * flat.teams);
    return {
      label: a.label,
      probability: field.toNumber(probs[k]!),
      values: row.map((v) => field.toNumber(v)),
      ...(field.exact ? { valuesExact: row.map((v) => field.format(v)!) } : {}),
    };
  });
  return { nodeId, team: node.team, equilibriumAction: actions[argmax(field, probs)]!.label, actions };
}

/** Whether play under the equilibrium reaches the node with positive probability (every chance branch counts). */
export function reachesNode(game: Game, eq: Equilibrium, nodeId: string): boolean {
  const index = indexGame(game);
  const node = index.byId.get(nodeId);
  if (!node) throw new Error(`no node with id "${nodeId}"`);
  for (let link = index.parentOf.get(node); link; link = index.parentOf.get(link.parent)) {
    const { parent, label } = link;
    const p = parent.kind === 'decision' ? (eq.choices[choiceKey(parent)]?.[label] ?? 0) : parent.kind === 'chance' ? toFloat(parent.outcomes[link.edge]!.p) : 0;
    if (!(p > 0)) return false;
  }
  return true;
}
