/**
 * The live exercise's view of a tree: what happens at a node (stageAt), where a set of
 * moves leads (advance), and seeded chance draws (drawChance).
 *
 * A simultaneous stage is a decision node whose children are all decision nodes of
 * another team forming one whole information set (that team cannot see the first move),
 * possibly continued the same way for further teams. All its movers choose at once;
 * advance applies their moves in order.
 */
import type { Action, ChanceNode, DecisionNode, Game, GameNode, Rung } from './model';
import { formatExact, toExact } from './numbers';
import type { Rng } from './rng';
import { payoffScorer } from './scoring';
import { choiceKey, indexGame, nodeById } from './tree';

export interface RungView {
  index: number;
  key: string;
  name: string;
  intensity: number;
  description: string;
}

export interface ActionView {
  label: string;
  move?: Action['move'];
  /** The rung the crisis stands at after this action, when the ladder builder recorded it. */
  rung?: RungView;
}

export interface StageMover {
  team: string;
  /** Information-set id, or the node id when the node is alone in its set. */
  key: string;
  actions: string[];
  options: ActionView[];
}

export interface NumberView {
  value: number;
  exact: string;
}

export type Stage =
  | { kind: 'decision'; nodeId: string; team: string; key: string; actions: ActionView[] }
  | { kind: 'simultaneous'; nodeId: string; movers: StageMover[] }
  | { kind: 'chance'; nodeId: string; outcomes: { label: string; probability: number; exact: string; rung?: RungView }[] }
  | {
      kind: 'terminal';
      nodeId: string;
      outcome?: string;
      payoffs: Record<string, NumberView>;
      attributes: Record<string, NumberView & { label?: string; unit?: string }>;
    };

export type Moves = Record<string, string>;

export type PlayErrorCode = 'unknown-node' | 'game-over' | 'wrong-team' | 'missing-move' | 'unknown-action' | 'not-chance';

export class PlayError extends Error {
  constructor(
    readonly code: PlayErrorCode,
    message: string,
  ) {
    super(message);
  }
}

function rungView(rungs: Rung[] | undefined, index: number | undefined): RungView | undefined {
  const rung = index === undefined ? undefined : rungs?.[index];
  if (!rung || index === undefined) return undefined;
  return { index, key: rung.key, name: rung.name, intensity: rung.intensity, description: rung.description };
}

function actionView(game: Game, action: Action): ActionView {
  const rung = rungView(game.rungs, action.rung);
  return { label: action.label, ...(action.move ? { move: action.move } : {}), ...(rung ? { rung } : {}) };
}

function requireNode(game: Game, nodeId: string): GameNode {
  const node = nodeById(game, nodeId);
  if (!node) throw new PlayError('unknown-node', `no node with id "${nodeId}" in this game`);
  return node;
}

/** The teams of a simultaneous stage at `nodeId`, or null when the node is not one. */
export function simultaneousStage(game: Game, nodeId: string): { movers: StageMover[] } | null {
  const node = requireNode(game, nodeId);
  if (node.kind !== 'decision') return null;
  const index = indexGame(game);
  const movers: StageMover[] = [mover(game, node)];
  let layer: DecisionNode[] = [node];
  for (;;) {
    const next = layer.flatMap((n) => n.actions.map((a) => a.next));
    const first = next[0];
    if (!first || first.kind !== 'decision' || first.infoset === undefined) break;
    const members = index.infosets.get(first.infoset) ?? [];
    const sameSet = next.every((n) => n.kind === 'decision' && n.infoset === first.infoset) && members.length === next.length;
    if (!sameSet || movers.some((m) => m.team === first.team)) break;
    movers.push(mover(game, first));
    layer = next as DecisionNode[];
  }
  return movers.length > 1 ? { movers } : null;
}

function mover(game: Game, node: DecisionNode): StageMover {
  return { team: node.team, key: choiceKey(node), actions: node.actions.map((a) => a.label), options: node.actions.map((a) => actionView(game, a)) };
}

/** What happens at a node. */
export function stageAt(game: Game, nodeId: string): Stage {
  const node = requireNode(game, nodeId);
  if (node.kind === 'decision') {
    const simultaneous = simultaneousStage(game, nodeId);
    if (simultaneous) return { kind: 'simultaneous', nodeId, movers: simultaneous.movers };
    return { kind: 'decision', nodeId, team: node.team, key: choiceKey(node), actions: node.actions.map((a) => actionView(game, a)) };
  }
  if (node.kind === 'chance') {
    return {
      kind: 'chance',
      nodeId,
      outcomes: node.outcomes.map((o) => {
        const p = toExact(o.p);
        const rung = rungView(game.rungs, o.rung);
        return { label: o.label, probability: p.valueOf(), exact: formatExact(p), ...(rung ? { rung } : {}) };
      }),
    };
  }
  const payoffs = payoffScorer(game)(node);
  const attributeInfo = new Map((game.attributes ?? []).map((a) => [a.key, a]));
  return {
    kind: 'terminal',
    nodeId,
    ...(node.outcome ? { outcome: node.outcome } : {}),
    payoffs: Object.fromEntries(game.teams.map((t, i) => [t.id, { value: payoffs[i]!.valueOf(), exact: formatExact(payoffs[i]!) }])),
    attributes: Object.fromEntries(
      Object.entries(node.attributes ?? {}).map(([key, v]) => {
        const f = toExact(v);
        const info = attributeInfo.get(key);
        return [key, { value: f.valueOf(), exact: formatExact(f), ...(info ? { label: info.label, ...(info.unit ? { unit: info.unit } : {}) } : {}) }];
      }),
    ),
  };
}

function take(node: DecisionNode, label: string | undefined, teamName: string): GameNode {
  if (label === undefined) throw new PlayError('missing-move', `no move given for ${teamName}`);
  const action = node.actions.find((a) => a.label === label);
  if (!action) {
    throw new PlayError('unknown-action', `"${label}" is not a move of ${teamName} here; the moves are: ${node.actions.map((a) => a.label).join(', ')}`);
  }
  return action.next;
}

/**
 * The node reached from `nodeId` by the given moves: {teamId: label} for every team that
 * moves there (one team at a decision, all movers of a simultaneous stage), or
 * {chance: label} at a chance node.
 */
export function advance(game: Game, nodeId: string, moves: Moves): string {
  const node = requireNode(game, nodeId);
  if (node.kind === 'terminal') throw new PlayError('game-over', `the game has ended at "${nodeId}"`);
  if (node.kind === 'chance') {
    const label = moves.chance;
    const extra = Object.keys(moves).filter((k) => k !== 'chance');
    if (label === undefined || extra.length > 0) throw new PlayError('not-chance', `"${nodeId}" is a chance node: give {chance: label} only`);
    const outcome = node.outcomes.find((o) => o.label === label);
    if (!outcome) throw new PlayError('unknown-action', `"${label}" is not an outcome here; the outcomes are: ${node.outcomes.map((o) => o.label).join(', ')}`);
    return outcome.next.id;
  }
  const stage = simultaneousStage(game, nodeId);
  const teams = stage ? stage.movers.map((m) => m.team) : [node.team];
  const extra = Object.keys(moves).filter((k) => !teams.includes(k));
  if (extra.length > 0) {
    throw new PlayError('wrong-team', `${extra.map((t) => `"${t}"`).join(', ')} cannot move here; the movers are: ${teams.join(', ')}`);
  }
  let current: GameNode = node;
  for (const team of teams) current = take(current as DecisionNode, moves[team], team);
  return current.id;
}

/** Draw a chance outcome: u = rng() against the cumulative probabilities. Log `u` and `label` to replay the draw. */
export function drawChance(node: ChanceNode, rng: Rng): { label: string; index: number; u: number } {
  const u = rng();
  let cumulative = 0;
  for (let k = 0; k < node.outcomes.length; k++) {
    cumulative += toExact(node.outcomes[k]!.p).valueOf();
    if (u < cumulative) return { label: node.outcomes[k]!.label, index: k, u };
  }
  // Rounding left u above the last cumulative sum: take the last outcome that can happen.
  let last = node.outcomes.length - 1;
  while (last > 0 && toExact(node.outcomes[last]!.p).valueOf() <= 0) last--;
  return { label: node.outcomes[last]!.label, index: last, u };
}
