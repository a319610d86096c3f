/**
 * Lookups on a model tree: node by id, parent, the path of labels from the root, the
 * members of each information set. Built once per game object and cached.
 */
import { childEdges, type DecisionNode, type Game, type GameNode } from './model';

export interface ParentLink {
  parent: GameNode;
  /** Index of the edge (action or chance outcome) of `parent` leading to the node. */
  edge: number;
  label: string;
}

export interface TreeIndex {
  /** Nodes in depth-first preorder; the root first. */
  nodes: GameNode[];
  byId: Map<string, GameNode>;
  parentOf: Map<GameNode, ParentLink>;
  /** Information set id to its member nodes, for nodes that carry an infoset id. */
  infosets: Map<string, DecisionNode[]>;
}

const cache = new WeakMap<Game, TreeIndex>();

/** Index of the game's tree. Assumes the tree is not mutated after the first call. */
export function indexGame(game: Game): TreeIndex {
  let index = cache.get(game);
  if (!index) {
    index = buildIndex(game.root);
    cache.set(game, index);
  }
  return index;
}

function buildIndex(root: GameNode): TreeIndex {
  const nodes: GameNode[] = [];
  const byId = new Map<string, GameNode>();
  const parentOf = new Map<GameNode, ParentLink>();
  const infosets = new Map<string, DecisionNode[]>();
  const stack: GameNode[] = [root];
  while (stack.length > 0) {
    const node = stack.pop()!;
    nodes.push(node);
    if (!byId.has(node.id)) byId.set(node.id, node);
    if (node.kind === 'decision' && node.infoset !== undefined) {
      const members = infosets.get(node.infoset) ?? [];
      members.push(node);
      infosets.set(node.infoset, members);
    }
    const edges = childEdges(node);
    for (let i = edges.length - 1; i >= 0; i--) {
      const edge = edges[i]!;
      parentOf.set(edge.next, { parent: node, edge: i, label: edge.label });
      stack.push(edge.next);
    }
  }
  return { nodes, byId, parentOf, infosets };
}

export function nodeById(game: Game, id: string): GameNode | undefined {
  return indexGame(game).byId.get(id);
}

export function parentOf(game: Game, id: string): GameNode | undefined {
  const node = nodeById(game, id);
  return node ? indexGame(game).parentOf.get(node)?.parent : undefined;
}

/** Labels of the edges from the root to `node` (empty for the root). */
export function edgeLabels(index: TreeIndex, node: GameNode): string[] {
  const labels: string[] = [];
  for (let link = index.parentOf.get(node); link; link = index.parentOf.get(link.parent)) {
    labels.push(link.label);
  }
  return labels.reverse();
}

/** Labels from the root to the node with this id; undefined for an unknown id. */
export function pathTo(game: Game, id: string): string[] | undefined {
  const node = nodeById(game, id);
  return node ? edgeLabels(indexGame(game), node) : undefined;
}

/** How a node is named in messages: its path of labels, or "the root". */
export function describeNode(index: TreeIndex, node: GameNode): string {
  const labels = edgeLabels(index, node);
  return labels.length === 0 ? 'the root' : labels.join(' › ');
}

/**
 * The key under which an equilibrium or a behaviour profile records the choice at a
 * decision node: its information set id, or its own id when it has none.
 */
export function choiceKey(node: DecisionNode): string {
  return node.infoset ?? node.id;
}

/** True when some information set holds more than one node. */
export function hasImperfectInformation(game: Game): boolean {
  for (const members of indexGame(game).infosets.values()) if (members.length > 1) return true;
  return false;
}
