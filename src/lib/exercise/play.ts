/**
 * Live play over the engine's tree (src/lib/engine/play.ts): a thin adapter
 * that puts a sequential decision and a simultaneous stage in one shape (a list
 * of movers), and adds what the engine does not say: the node each team's move
 * lands at, the outcomes reachable for an adjudicated ending, the "hold"
 * action of a deadline, and the rung the crisis stands at.
 */
import { advance as engineAdvance, drawChance, stageAt as engineStageAt, type ActionView, type Stage as EngineStage, type StageMover, childEdges, type ChanceNode, type Game, type GameNode, type TerminalNode, mulberry32, indexGame, nodeById } from '../engine';

export type { ActionView, StageMover };

export type MovingStage = { kind: 'decision' | 'simultaneous'; nodeId: string; movers: StageMover[] };
export type Stage = MovingStage | Extract<EngineStage, { kind: 'chance' }> | Extract<EngineStage, { kind: 'terminal' }>;

/** One team's move as it lands in the tree: the node it was made at. */
export type Step = { teamId: string; nodeId: string; label: string };

export function nodeAt(game: Game, nodeId: string): GameNode {
  const node = nodeById(game, nodeId);
  if (!node) throw new Error(`node ${nodeId} is not in this scenario's tree`);
  return node;
}

export function stageAt(game: Game, nodeId: string): Stage {
  const stage = engineStageAt(game, nodeId);
  if (stage.kind !== 'decision') return stage;
  const mover: StageMover = { team: stage.team, key: stage.key, actions: stage.actions.map((a) => a.label), options: stage.actions };
  return { kind: 'decision', nodeId, movers: [mover] };
}

export const isMoving = (stage: Stage): stage is MovingStage => stage.kind === 'decision' || stage.kind === 'simultaneous';
export const moverTeams = (stage: MovingStage): string[] => stage.movers.map((m) => m.team);
export const moverOf = (stage: MovingStage, teamId: string): StageMover | undefined => stage.movers.find((m) => m.team === teamId);

/** Where the stage's moves (one label per moving team) lead, and the node each move was made at. */
export function advance(game: Game, stage: MovingStage, choices: Record<string, string>): { nodeId: string; steps: Step[] } {
  const nodeId = engineAdvance(game, stage.nodeId, choices);
  const steps: Step[] = [];
  let node = nodeAt(game, stage.nodeId);
  for (const teamId of moverTeams(stage)) {
    const label = choices[teamId]!;
    steps.push({ teamId, nodeId: node.id, label });
    node = childEdges(node).find((e) => e.label === label)!.next;
  }
  return { nodeId, steps };
}

export function chanceOutcome(game: Game, nodeId: string, label: string): { label: string; nodeId: string } | null {
  const node = nodeAt(game, nodeId) as ChanceNode;
  const outcome = node.outcomes.find((o) => o.label === label);
  return outcome ? { label: outcome.label, nodeId: outcome.next.id } : null;
}

/** The engine's seeded draw at a chance node with mulberry32(seed): the outcome and the number drawn. */
export function drawAt(game: Game, nodeId: string, seed: number): { label: string; nodeId: string; value: number } {
  const node = nodeAt(game, nodeId) as ChanceNode;
  const draw = drawChance(node, mulberry32(seed));
  return { label: draw.label, nodeId: node.outcomes[draw.index]!.next.id, value: draw.u };
}

const endingsMemo = new WeakMap<Game, Map<string, TerminalNode[]>>();

/**
 * The outcomes an adjudication may end the game at from a node: the terminal nodes
 * below it, one per outcome text, the shallowest first (breadth-first), so the list
 * stays short and each outcome is represented by its earliest arrival.
 */
export function reachableEndings(game: Game, nodeId: string): TerminalNode[] {
  const memo = endingsMemo.get(game) ?? new Map<string, TerminalNode[]>();
  endingsMemo.set(game, memo);
  const known = memo.get(nodeId);
  if (known) return known;
  const out: TerminalNode[] = [];
  const seen = new Set<string>();
  const queue = [nodeAt(game, nodeId)];
  for (let head = 0; head < queue.length; head++) {
    const node = queue[head]!;
    if (node.kind !== 'terminal') queue.push(...childEdges(node).map((e) => e.next));
    else if (!seen.has(node.outcome ?? node.id)) {
      seen.add(node.outcome ?? node.id);
      out.push(node);
    }
  }
  memo.set(nodeId, out);
  return out;
}

/** The action a team's "hold" means at a deadline: the one the ladder marks as holding. */
export function holdAction(mover: StageMover): string | null {
  const marked = mover.options.find((o) => o.move === 'hold') ?? mover.options.find((o) => /\bhold\b/i.test(o.label));
  return marked?.label ?? null;
}

/** The rung index the crisis stands at: that of the most recent edge into `nodeId` that names one. */
export function rungIndexAt(game: Game, nodeId: string): number | null {
  const index = indexGame(game);
  for (let node = nodeById(game, nodeId); node; ) {
    const link = index.parentOf.get(node);
    if (!link) return null;
    const edge = childEdges(link.parent)[link.edge] as { rung?: number } | undefined;
    if (edge?.rung !== undefined) return edge.rung;
    node = link.parent;
  }
  return null;
}
