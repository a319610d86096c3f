/**
 * Layered layout of the visible tree by ELK, run in a Web Worker so that the
 * page stays responsive while a large tree is laid out. Positions are top-left
 * corners, left to right by depth.
 */
import ELK, { type ElkNode } from 'elkjs/lib/elk-api.js';
import elkWorkerUrl from 'elkjs/lib/elk-worker.min.js?url';
import type { TreeView, ViewNode } from '../../../lib/studio/tree-view';

export type Box = { x: number; y: number; width: number; height: number };
export type Layout = { boxes: Map<string, Box>; width: number; height: number };

export const NODE_WIDTH = 184;
const LAYER_GAP = 150;

export function nodeSize(view: ViewNode, teams: number): { width: number; height: number } {
  if (view.node.kind === 'terminal') return { width: NODE_WIDTH, height: 30 + 17 * teams };
  if (view.node.kind === 'chance') return { width: 132, height: 46 };
  return { width: NODE_WIDTH, height: 56 };
}

let elk: InstanceType<typeof ELK> | null = null;
const engine = () => (elk ??= new ELK({ workerUrl: elkWorkerUrl }));

export async function layoutTree(view: TreeView, teams: number): Promise<Layout> {
  const graph: ElkNode = {
    id: 'tree',
    layoutOptions: {
      'elk.algorithm': 'layered',
      'elk.direction': 'RIGHT',
      'elk.spacing.nodeNode': '14',
      'elk.layered.spacing.nodeNodeBetweenLayers': String(LAYER_GAP),
      'elk.layered.crossingMinimization.strategy': 'INTERACTIVE',
      'elk.layered.considerModelOrder.strategy': 'NODES_AND_EDGES',
      'elk.layered.nodePlacement.strategy': 'BRANDES_KOEPF',
    },
    children: view.nodes.map((v) => ({ id: v.id, ...nodeSize(v, teams) })),
    edges: view.nodes
      .filter((v) => v.parentId !== null)
      .map((v) => ({ id: `e:${v.id}`, sources: [v.parentId!], targets: [v.id] })),
  };
  const done = await engine().layout(graph);
  const boxes = new Map<string, Box>();
  for (const child of done.children ?? []) {
    boxes.set(child.id, { x: child.x ?? 0, y: child.y ?? 0, width: child.width ?? NODE_WIDTH, height: child.height ?? 56 });
  }
  return { boxes, width: done.width ?? 0, height: done.height ?? 0 };
}
