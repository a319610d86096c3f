/**
 * What the tree canvas shows: the nodes not hidden under a collapsed branch,
 * in preorder, each with its depth, parent and the edge leading to it. Large
 * trees open collapsed at the depth that keeps the visible count under a limit.
 */
import { childEdges, type GameNode } from '../engine';

/** Most nodes the canvas shows at once (it stays responsive up to here). */
export const VISIBLE_LIMIT = 2_500;
/** How many a large tree shows when it opens: a few levels, to unfold from. */
export const OPENING_LIMIT = 200;

export type ViewNode = {
  id: string;
  node: GameNode;
  depth: number;
  parentId: string | null;
  /** Label of the edge from the parent (action or chance outcome). */
  edgeLabel: string | null;
  childIds: string[];
  collapsed: boolean;
  /** Nodes hidden under this one when it is collapsed. */
  hidden: number;
};

export type TreeView = { nodes: ViewNode[]; byId: Map<string, ViewNode>; total: number };

function subtreeSizes(root: GameNode): Map<string, number> {
  const sizes = new Map<string, number>();
  const order: GameNode[] = [];
  const stack = [root];
  while (stack.length > 0) {
    const node = stack.pop()!;
    order.push(node);
    for (const e of childEdges(node)) stack.push(e.next);
  }
  for (let i = order.length - 1; i >= 0; i--) {
    const node = order[i]!;
    sizes.set(node.id, 1 + childEdges(node).reduce((sum, e) => sum + sizes.get(e.next.id)!, 0));
  }
  return sizes;
}

export function visibleTree(root: GameNode, collapsed: ReadonlySet<string>): TreeView {
  const sizes = subtreeSizes(root);
  const nodes: ViewNode[] = [];
  const byId = new Map<string, ViewNode>();
  const stack: { node: GameNode; depth: number; parentId: string | null; edgeLabel: string | null }[] = [
    { node: root, depth: 0, parentId: null, edgeLabel: null },
  ];
  while (stack.length > 0) {
    const { node, depth, parentId, edgeLabel } = stack.pop()!;
    const edges = childEdges(node);
    const isCollapsed = collapsed.has(node.id) && edges.length > 0;
    const view: ViewNode = {
      id: node.id,
      node,
      depth,
      parentId,
      edgeLabel,
      childIds: isCollapsed ? [] : edges.map((e) => e.next.id),
      collapsed: isCollapsed,
      hidden: isCollapsed ? sizes.get(node.id)! - 1 : 0,
    };
    nodes.push(view);
    byId.set(node.id, view);
    if (isCollapsed) continue;
    for (let i = edges.length - 1; i >= 0; i--) {
      stack.push({ node: edges[i]!.next, depth: depth + 1, parentId: node.id, edgeLabel: edges[i]!.label });
    }
  }
  return { nodes, byId, total: sizes.get(root.id)! };
}

/**
 * Branches to collapse so that at most `limit` nodes show: every branch from the
 * deepest depth that fits downwards (so that opening one shows one more level).
 */
export function initialCollapse(root: GameNode, limit = VISIBLE_LIMIT): Set<string> {
  const perDepth: GameNode[][] = [];
  const stack: [GameNode, number][] = [[root, 0]];
  while (stack.length > 0) {
    const [node, depth] = stack.pop()!;
    (perDepth[depth] ??= []).push(node);
    for (const e of childEdges(node)) stack.push([e.next, depth + 1]);
  }
  let shown = 0;
  for (let depth = 0; depth < perDepth.length; depth++) {
    const next = perDepth[depth + 1]?.length ?? 0;
    shown += perDepth[depth]!.length;
    if (shown + next > limit) {
      return new Set(perDepth.slice(depth).flatMap((nodes) => nodes.filter((n) => childEdges(n).length > 0).map((n) => n.id)));
    }
  }
  return new Set();
}
