/**
 * The part of the tree that matters for the review, drawn with React Flow:
 * the line actually played, the subgame-perfect line, and (dotted) where
 * equilibrium play from each deviation would have led. A small tidy layout:
 * depth left to right, leaves top to bottom, parents centred on their children.
 */
import {
  BaseEdge,
  Controls,
  EdgeLabelRenderer,
  getSmoothStepPath,
  Handle,
  Position,
  ReactFlow,
  type Edge,
  type EdgeProps,
  type Node,
  type NodeProps,
} from '@xyflow/react';
import '@xyflow/react/dist/base.css';
import { useMemo } from 'react';
import type { PathTree as Tree, TeamRef } from '../../lib/review/types';
import { ACTUAL_COLOUR, EQUILIBRIUM_COLOUR } from '../../lib/report/render/chart';

const NODE_WIDTH = 176; // w-44
const COLUMN = 320;
const ROW = 124;
/** Action labels wrap inside the gap between two columns instead of running under the next node. */
const LABEL_WIDTH = COLUMN - NODE_WIDTH - 20;
const TALLEST_NODE = 100;
const COUNTERFACTUAL = '#2f4f73';

type TreeNodeData = { title: string; kind: Tree['nodes'][number]['kind']; lines: string[]; onActual: boolean };

function TreeNodeView({ data }: NodeProps<Node<TreeNodeData>>) {
  const tone = data.kind === 'terminal' ? 'border-ink-300 bg-paper' : data.kind === 'chance' ? 'border-haze-700/40 bg-haze-100' : 'border-ink-300 bg-white';
  return (
    <div className={`w-44 rounded-md border px-2.5 py-1.5 text-xs shadow-sm ${tone} ${data.onActual ? 'ring-2 ring-bronze-500/60' : ''}`}>
      <Handle type="target" position={Position.Left} className="!h-1 !w-1 !border-0 !bg-transparent" />
      <div className="font-semibold text-ink-900">{data.title}</div>
      {data.lines.map((line) => (
        <div key={line} className="text-ink-600">
          {line}
        </div>
      ))}
      <Handle type="source" position={Position.Right} className="!h-1 !w-1 !border-0 !bg-transparent" />
    </div>
  );
}

type TreeEdgeData = { label: string };

function TreeEdgeView({ id, sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, style, data }: EdgeProps<Edge<TreeEdgeData>>) {
  const [path, labelX, labelY] = getSmoothStepPath({ sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition });
  return (
    <>
      <BaseEdge id={id} path={path} style={style} />
      {data?.label ? (
        <EdgeLabelRenderer>
          <div
            className="nodrag nopan pointer-events-none absolute rounded bg-paper/90 px-1 text-center text-[11px] leading-tight text-ink-900"
            style={{ transform: `translate(-50%, -50%) translate(${labelX}px, ${labelY}px)`, maxWidth: LABEL_WIDTH }}
          >
            {data.label}
          </div>
        </EdgeLabelRenderer>
      ) : null}
    </>
  );
}

const NODE_TYPES = { reviewNode: TreeNodeView };
const EDGE_TYPES = { reviewEdge: TreeEdgeView };

function layout(tree: Tree): Map<string, { x: number; y: number }> {
  const children = new Map<string, string[]>();
  const hasParent = new Set<string>();
  for (const edge of tree.edges) {
    children.set(edge.from, [...(children.get(edge.from) ?? []), edge.to]);
    hasParent.add(edge.to);
  }
  const positions = new Map<string, { x: number; y: number }>();
  let nextLeaf = 0;
  const place = (id: string, depth: number): number => {
    const kids = children.get(id) ?? [];
    const y = kids.length === 0 ? nextLeaf++ * ROW : kids.map((k) => place(k, depth + 1)).reduce((a, b) => a + b, 0) / kids.length;
    positions.set(id, { x: depth * COLUMN, y });
    return y;
  };
  for (const node of tree.nodes) if (!hasParent.has(node.id)) place(node.id, 0);
  return positions;
}

function edgeStyle(edge: Tree['edges'][number]) {
  if (edge.actual) return { stroke: ACTUAL_COLOUR, strokeWidth: edge.equilibrium ? 4 : 3 };
  if (edge.equilibrium) return { stroke: EQUILIBRIUM_COLOUR, strokeWidth: 2, strokeDasharray: '7 5' };
  return { stroke: COUNTERFACTUAL, strokeWidth: 1.5, strokeDasharray: '2 4' };
}

export function PathTree({ tree, teams }: { tree: Tree; teams: TeamRef[] }) {
  const leaves = tree.nodes.filter((n) => !tree.edges.some((e) => e.from === n.id)).length;
  const height = Math.min(560, Math.max(260, leaves * ROW * 0.85 + 80));
  const { nodes, edges } = useMemo(() => {
    const positions = layout(tree);
    const onActual = new Set(tree.edges.filter((e) => e.actual).flatMap((e) => [e.from, e.to]));
    const nodes: Node<TreeNodeData>[] = tree.nodes.map((n) => ({
      id: n.id,
      type: 'reviewNode',
      position: positions.get(n.id) ?? { x: 0, y: 0 },
      data: { title: n.label, kind: n.kind, lines: n.payoffs.map((v, i) => `${teams[i]?.name ?? `Team ${i + 1}`}: ${Number(v.toFixed(2))}`), onActual: onActual.has(n.id) },
      draggable: false,
      connectable: false,
    }));
    const edges: Edge<TreeEdgeData>[] = tree.edges.map((e) => ({
      id: `${e.from}>${e.to}`,
      source: e.from,
      target: e.to,
      data: { label: e.label },
      style: edgeStyle(e),
      type: 'reviewEdge',
    }));
    return { nodes, edges };
  }, [tree, teams]);
  // Open showing every row, from the root on the left; the lines run on to the right.
  const viewport = useMemo(() => {
    const ys = nodes.map((n) => n.position.y);
    const top = Math.min(0, ...ys);
    const span = Math.max(0, ...ys) - top + TALLEST_NODE;
    const zoom = Math.min(0.85, Math.max(0.3, (height - 48) / span));
    return { x: 24, y: 24 - top * zoom, zoom };
  }, [nodes, height]);
  return (
    <div>
      <div className="rounded-md border border-ink-200 bg-paper-deep" style={{ height }} data-testid="path-tree">
        <ReactFlow
          nodes={nodes}
          edges={edges}
          nodeTypes={NODE_TYPES}
          edgeTypes={EDGE_TYPES}
          defaultViewport={viewport}
          nodesDraggable={false}
          nodesConnectable={false}
          proOptions={{ hideAttribution: true }}
          minZoom={0.2}
        >
          <Controls showInteractive={false} position="top-right" />
        </ReactFlow>
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-700" aria-label="Legend">
        <li className="text-ink-500">Drag to follow the lines; the buttons zoom and fit the whole tree.</li>
        <li className="flex items-center gap-2"><span className="inline-block h-1 w-6 rounded" style={{ background: ACTUAL_COLOUR }} /> Played</li>
        <li className="flex items-center gap-2"><span className="inline-block w-6 border-t-2 border-dashed" style={{ borderColor: EQUILIBRIUM_COLOUR }} /> Subgame-perfect</li>
        <li className="flex items-center gap-2"><span className="inline-block w-6 border-t-2 border-dotted" style={{ borderColor: COUNTERFACTUAL }} /> Equilibrium play from a deviation</li>
      </ul>
    </div>
  );
}
