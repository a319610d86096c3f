/**
 * Credibility of the threats and promises a facilitator marks. A mark names an action at
 * a decision node, usually off the equilibrium path. It is credible when the team would
 * actually choose it if that node were reached, i.e. it is chosen in the subgame the
 * node belongs to under the subgame-perfect equilibrium; the margin is the mover's value
 * of the marked action minus the best value of the other actions there (negative: what
 * carrying out the threat or promise would cost the mover).
 */
import { CHANCE, TERMINAL, compiledGame, sourceOf, type FlatGame } from '../compile';
import type { DecisionNode, Game } from '../model';
import { exactField, floatField, type Field } from '../numbers';
import { behaviourFromEquilibrium, numbersOf, profileValues, type Behaviour, type Equilibrium } from '../profile';
import { edgeLabels, indexGame } from '../tree';
import { solveSubgamePerfect } from './subgame-perfect';

export type MarkKind = 'threat' | 'promise';

export interface Mark {
  nodeId: string;
  action: string;
  kind: MarkKind;
  note?: string;
}

export interface CredibilityVerdict {
  nodeId: string;
  action: string;
  kind: MarkKind;
  note?: string;
  team: string;
  credible: boolean;
  /** Mover's value of the marked action minus the best other action's value. */
  margin: number;
  marginExact?: string;
  /** The action the equilibrium chooses there (the most probable one). */
  equilibriumAction: string;
  /** Equilibrium probability of the marked action. */
  probability: number;
  /** Whether equilibrium play reaches the node. */
  onPath: boolean;
  explanation: string;
}

export interface CredibilityOptions {
  exact?: boolean;
  /** The equilibrium to judge against; default: the first subgame-perfect equilibrium. */
  equilibrium?: Equilibrium;
}

export function assessMarks(game: Game, marks: Mark[], options: CredibilityOptions = {}): CredibilityVerdict[] {
  const equilibrium = options.equilibrium ?? solveSubgamePerfect(game, { exact: options.exact }).equilibria[0]!;
  const flat = compiledGame(game);
  return options.exact ? judge(game, flat, exactField, equilibrium, marks) : judge(game, flat, floatField, equilibrium, marks);
}

function judge<T>(game: Game, flat: FlatGame, field: Field<T>, equilibrium: Equilibrium, marks: Mark[]): CredibilityVerdict[] {
  const source = sourceOf(flat);
  const behaviour = behaviourFromEquilibrium(flat, field, equilibrium);
  const values = profileValues(flat, field, behaviour);
  const reach = reachOf(flat, field, behaviour);
  const index = indexGame(game);
  const teamName = (id: string) => game.teams.find((t) => t.id === id)?.name ?? id;
  return marks.map((mark) => {
    const i = source.indexOf.get(mark.nodeId);
    const node = i === undefined ? undefined : source.nodes[i];
    if (i === undefined || !node || node.kind !== 'decision') throw new Error(`mark on "${mark.nodeId}": not a decision node of this game`);
    const k = node.actions.findIndex((a) => a.label === mark.action);
    if (k < 0) throw new Error(`mark on "${mark.nodeId}": no action "${mark.action}" there`);
    const q = actionValuesForMover(flat, field, node, i, values, reach);
    const probs = behaviour[flat.aux[i]!]!;
    let best: T | null = null;
    q.forEach((v, a) => {
      if (a !== k && (best === null || field.cmp(v, best) > 0)) best = v;
    });
    const margin = best === null ? field.zero : field.sub(q[k]!, best);
    let top = 0;
    probs.forEach((p, a) => {
      if (field.cmp(p, probs[top]!) > 0) top = a;
    });
    const credible = field.cmp(probs[k]!, field.zero) > 0 && field.cmp(margin, field.zero) >= 0;
    const labels = edgeLabels(index, node);
    const where = labels.length === 0 ? 'At the start' : `After ${labels.join(' › ')}`;
    const amount = Number(Math.abs(field.toNumber(margin)).toPrecision(4));
    const explanation = credible
      ? `Credible. ${where}, ${teamName(node.team)} does best by carrying out "${mark.action}": it gains ${amount} over its best alternative.`
      : `Not credible. ${where}, ${teamName(node.team)} would lose ${amount} by carrying out "${mark.action}"; it would choose "${node.actions[top]!.label}" instead.`;
    return {
      nodeId: mark.nodeId,
      action: mark.action,
      kind: mark.kind,
      ...(mark.note !== undefined ? { note: mark.note } : {}),
      team: node.team,
      credible,
      margin: field.toNumber(margin),
      ...(field.exact ? { marginExact: field.format(margin)! } : {}),
      equilibriumAction: node.actions[top]!.label,
      probability: field.toNumber(probs[k]!),
      onPath: field.cmp(reach[i]!, field.zero) > 0,
      explanation,
    };
  });
}

/**
 * The mover's continuation value of each action. At a node alone in its information set
 * this is the child's value; in a shared set the members are weighted by how likely
 * the equilibrium reaches them (equally if it reaches none).
 */
function actionValuesForMover<T>(flat: FlatGame, field: Field<T>, node: DecisionNode, i: number, values: T[], reach: T[]): T[] {
  const m = flat.mover[i]!;
  const members: number[] = [];
  for (let x = 0; x < flat.size; x++) if (flat.mover[x]! >= 0 && flat.aux[x] === flat.aux[i]) members.push(x);
  let mass = field.zero;
  for (const x of members) mass = field.add(mass, reach[x]!);
  const weight = (x: number) =>
    members.length === 1 ? field.one : field.cmp(mass, field.zero) > 0 ? field.div(reach[x]!, mass) : field.div(field.one, field.fromNumber(members.length));
  return node.actions.map((_, k) =>
    members.reduce((sum, x) => field.add(sum, field.mul(weight(x), values[(flat.childStart[x]! + k) * flat.teams + m]!)), field.zero),
  );
}

function reachOf<T>(flat: FlatGame, field: Field<T>, behaviour: Behaviour<T>): T[] {
  const { prob } = numbersOf(flat, field);
  const reach: T[] = new Array(flat.size).fill(field.zero);
  reach[0] = field.one;
  for (let i = 0; i < flat.size; i++) {
    if (flat.mover[i] === TERMINAL) continue;
    const first = flat.childStart[i]!;
    for (let c = first; c < flat.childStart[i + 1]!; c++) {
      const w = flat.mover[i] === CHANCE ? prob[flat.aux[i]! + c - first]! : behaviour[flat.aux[i]!]![c - first]!;
      reach[c] = field.mul(reach[i]!, w);
    }
  }
  return reach;
}
