/**
 * The game tree on a canvas: laid out as a tidy tree, drawn by React Flow
 * (only what is in view), with the equilibrium path highlighted. Branches
 * collapse and expand; the keyboard moves the selection along the tree.
 */
import { Background, ReactFlow, ReactFlowProvider, useReactFlow, type Edge } from '@xyflow/react';
import '@xyflow/react/dist/base.css';
import { useCallback, useEffect, useMemo, useRef, useState, type KeyboardEvent, type ReactNode } from 'react';
import { type GameNode } from '../../../lib/engine';
import { treeSvg } from '../../../lib/studio/tree-svg';
import { initialCollapse, OPENING_LIMIT, VISIBLE_LIMIT, visibleTree, type TreeView, type ViewNode } from '../../../lib/studio/tree-view';
import { layoutTree, type Layout } from './layout';
import { NODE_TYPES, type CanvasNode, type CanvasNodeData } from './nodes';
import { downloadBlob, svgToPng } from '../download';

export type CanvasTeam = { id: string; name: string; colour?: string };

export type TreeCanvasProps = {
  root: GameNode;
  teams: CanvasTeam[];
  /** Formatted payoffs per terminal id, in team order. */
  payoffs: Map<string, string[]>;
  /** Node ids on the highlighted equilibrium path. */
  path: ReadonlySet<string>;
  /** A note on the edge into a node, by the node's id (e.g. a forecast probability). */
  edgeNotes?: Map<string, string>;
  selectedId: string | null;
  onSelect: (id: string) => void;
  title: string;
  /** Extra commands for the toolbar. */
  children?: ReactNode;
};

const PATH_STROKE = 'var(--color-bronze-600)';
const EDGE_STROKE = 'var(--color-ink-300)';

function describe(view: ViewNode, teams: CanvasTeam[]): string {
  const where = view.edgeLabel ? `after “${view.edgeLabel}”` : 'at the root';
  const node = view.node;
  const what =
    node.kind === 'decision'
      ? `${teams.find((t) => t.id === node.team)?.name ?? node.team} decides, ${node.actions.length} actions`
      : node.kind === 'chance'
        ? `chance, ${node.outcomes.length} outcomes`
        : `outcome: ${node.outcome ?? 'no description'}`;
  return `${what}, ${where}${view.collapsed ? `, collapsed with ${view.hidden} nodes hidden` : ''}`;
}

function nodeData(view: ViewNode, teams: CanvasTeam[], payoffs: Map<string, string[]>, path: ReadonlySet<string>): CanvasNodeData {
  const node = view.node;
  const base = { kind: node.kind, onPath: path.has(view.id), collapsed: view.collapsed, hidden: view.hidden, teamIndex: 0 };
  if (node.kind === 'decision') {
    const teamIndex = Math.max(0, teams.findIndex((t) => t.id === node.team));
    return { ...base, teamIndex, colour: teams[teamIndex]?.colour, title: teams[teamIndex]?.name ?? node.team, lines: node.infoset ? [`moves unseen · set ${node.infoset.slice(-12)}`] : [`${node.actions.length} actions`] };
  }
  if (node.kind === 'chance') return { ...base, title: 'Chance', lines: [] };
  const values = payoffs.get(view.id) ?? [];
  return { ...base, title: node.outcome ?? 'Outcome', lines: teams.map((t, i) => `${t.name}: ${values[i] ?? '?'}`) };
}

function Canvas(props: TreeCanvasProps) {
  const { root, teams, payoffs, path, edgeNotes, selectedId, onSelect, title } = props;
  const flow = useReactFlow();
  const [collapsed, setCollapsed] = useState<Set<string>>(() => initialCollapse(root, OPENING_LIMIT));
  const [announcement, setAnnouncement] = useState('');
  const fitted = useRef(false);

  const view: TreeView = useMemo(() => {
    const shown = visibleTree(root, collapsed);
    return shown.nodes.length > VISIBLE_LIMIT ? visibleTree(root, initialCollapse(root)) : shown;
  }, [root, collapsed]);

  // Open the branches along the highlighted path (the author may fold them again).
  useEffect(() => {
    setCollapsed((was) => {
      if (![...path].some((id) => was.has(id))) return was;
      const next = new Set(was);
      for (const id of path) next.delete(id);
      return next;
    });
  }, [path]);

  const layout: Layout = useMemo(() => {
    performance.mark('rungwise:layout-start');
    const laid = layoutTree(view, teams.length);
    performance.mark('rungwise:layout-end');
    return laid;
  }, [view, teams.length]);

  const baseNodes: CanvasNode[] = useMemo(() => {
    return view.nodes.flatMap((v) => {
      const b = layout.boxes.get(v.id);
      if (!b) return [];
      return [{ id: v.id, type: v.node.kind, position: { x: b.x, y: b.y }, width: b.width, height: b.height, data: nodeData(v, teams, payoffs, path), draggable: false, connectable: false }];
    });
  }, [view, layout, teams, payoffs, path]);

  const nodes = useMemo(() => baseNodes.map((n) => (n.id === selectedId ? { ...n, selected: true } : n)), [baseNodes, selectedId]);
  // For the benchmark: when a new set of nodes has been painted.
  useEffect(() => {
    requestAnimationFrame(() => performance.mark('rungwise:canvas-painted', { detail: baseNodes.length }));
  }, [baseNodes]);

  const edges: Edge[] = useMemo(() => {
    return view.nodes.flatMap((v) => {
      if (v.parentId === null || !layout.boxes.has(v.id)) return [];
      const onPath = path.has(v.id) && path.has(v.parentId);
      const note = edgeNotes?.get(v.id);
      return [
        {
          id: `e:${v.id}`,
          source: v.parentId,
          target: v.id,
          label: note ? `${v.edgeLabel} · ${note}` : (v.edgeLabel ?? ''),
          style: { stroke: onPath ? PATH_STROKE : EDGE_STROKE, strokeWidth: onPath ? 3 : 1.25 },
          labelStyle: { fontSize: 11, fill: onPath ? 'var(--color-bronze-800)' : 'var(--color-ink-800)', fontWeight: onPath ? 600 : 400 },
          labelBgStyle: { fill: 'var(--color-paper)' },
          selectable: false,
        },
      ];
    });
  }, [view, layout, path, edgeNotes]);

  useEffect(() => {
    if (fitted.current) return;
    fitted.current = true;
    requestAnimationFrame(() => {
      void flow.fitView({ padding: 0.1 });
      performance.mark('rungwise:canvas-shown');
    });
  }, [layout, flow]);

  // When the equilibrium path first arrives, bring it into view.
  const shownPath = useRef(false);
  useEffect(() => {
    if (shownPath.current || path.size === 0 || !layout.boxes.has([...path][path.size - 1]!)) return;
    shownPath.current = true;
    requestAnimationFrame(() => void flow.fitView({ nodes: [...path].map((id) => ({ id })), padding: 0.2, duration: 300, maxZoom: 1 }));
  }, [path, layout, flow]);

  const toggle = useCallback((id: string) => {
    setCollapsed((was) => {
      const next = new Set(was);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  }, []);

  const focusOn = useCallback(
    (id: string) => {
      onSelect(id);
      const v = view.byId.get(id);
      if (v) setAnnouncement(describe(v, teams));
      const b = layout.boxes.get(id);
      if (b) void flow.setCenter(b.x + b.width / 2, b.y + b.height / 2, { zoom: flow.getZoom(), duration: 150 });
    },
    [onSelect, view, teams, layout, flow],
  );

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    const current = view.byId.get(selectedId ?? '') ?? view.byId.get(root.id)!;
    const parent = current.parentId ? view.byId.get(current.parentId) : undefined;
    const siblings = parent?.childIds ?? [current.id];
    const at = siblings.indexOf(current.id);
    const keys: Record<string, () => void> = {
      ArrowRight: () => {
        if (current.collapsed) toggle(current.id);
        else if (current.childIds[0]) focusOn(current.childIds[0]);
      },
      ArrowLeft: () => parent && focusOn(parent.id),
      ArrowDown: () => at + 1 < siblings.length && focusOn(siblings[at + 1]!),
      ArrowUp: () => at > 0 && focusOn(siblings[at - 1]!),
      Home: () => focusOn(root.id),
      Enter: () => toggle(current.id),
      ' ': () => toggle(current.id),
      f: () => void flow.fitView({ padding: 0.15, duration: 200 }),
      '+': () => void flow.zoomIn({ duration: 150 }),
      '=': () => void flow.zoomIn({ duration: 150 }),
      '-': () => void flow.zoomOut({ duration: 150 }),
    };
    const run = keys[event.key];
    if (!run || event.ctrlKey || event.metaKey || event.altKey) return;
    event.preventDefault();
    if (!selectedId && event.key.startsWith('Arrow')) focusOn(root.id);
    else run();
  };

  const exportSvg = () => treeSvg({ view, boxes: layout.boxes, teamNames: new Map(teams.map((t) => [t.id, t.name])), payoffs, path, title });
  const fileBase = title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'scenario';

  return (
    <div className="flex h-full flex-col">
      <div className="flex flex-wrap items-center gap-2 border-b border-ink-200 bg-white px-2 py-1.5" role="toolbar" aria-label="Tree commands">
        <button type="button" className="btn-quiet py-1" onClick={() => void flow.fitView({ padding: 0.15, duration: 200 })}>
          Fit
        </button>
        <button type="button" className="btn-quiet py-1" onClick={() => void flow.zoomIn({ duration: 150 })} aria-label="Zoom in">
          +
        </button>
        <button type="button" className="btn-quiet py-1" onClick={() => void flow.zoomOut({ duration: 150 })} aria-label="Zoom out">
          −
        </button>
        <button type="button" className="btn-quiet py-1" disabled={!selectedId || !view.byId.get(selectedId)?.node || view.byId.get(selectedId)!.node.kind === 'terminal'} onClick={() => selectedId && toggle(selectedId)}>
          {selectedId && collapsed.has(selectedId) ? 'Expand branch' : 'Collapse branch'}
        </button>
        <button type="button" className="btn-quiet py-1" onClick={() => setCollapsed(initialCollapse(root, VISIBLE_LIMIT))}>
          {view.total > VISIBLE_LIMIT ? `Unfold up to ${VISIBLE_LIMIT.toLocaleString('en-GB')}` : 'Unfold all'}
        </button>
        <button type="button" className="btn-quiet py-1" onClick={() => setCollapsed(initialCollapse(root, OPENING_LIMIT))}>
          Fold back
        </button>
        <span className="mx-1 h-5 w-px bg-ink-200" aria-hidden="true" />
        <button type="button" className="btn-quiet py-1" onClick={() => downloadBlob(new Blob([exportSvg()], { type: 'image/svg+xml' }), `${fileBase}-tree.svg`)}>
          Save SVG
        </button>
        <button type="button" className="btn-quiet py-1" onClick={() => void svgToPng(exportSvg()).then((png) => downloadBlob(png, `${fileBase}-tree.png`))}>
          Save PNG
        </button>
        {props.children}
        <span className="ml-auto text-xs text-ink-600" data-testid="tree-count">
          {view.nodes.length === view.total ? `${view.total} nodes` : `${view.nodes.length} of ${view.total} nodes shown`}
        </span>
      </div>
      <div
        className="relative min-h-0 flex-1 bg-paper focus:outline-none focus-visible:ring-3 focus-visible:ring-bronze-500"
        tabIndex={0}
        role="application"
        aria-label="Game tree. Arrow keys move along the tree, Enter folds or unfolds a branch, F fits the tree, plus and minus zoom."
        onKeyDown={onKeyDown}
        data-testid="tree-canvas"
      >
        <ReactFlow
          nodes={nodes}
          edges={edges}
          nodeTypes={NODE_TYPES}
          onNodeClick={(_, node) => onSelect(node.id)}
          onNodeDoubleClick={(_, node) => toggle(node.id)}
          nodesDraggable={false}
          nodesConnectable={false}
          nodesFocusable={false}
          edgesFocusable={false}
          onlyRenderVisibleElements
          minZoom={0.05}
          maxZoom={2}
          disableKeyboardA11y
        >
          <Background gap={24} color="var(--color-ink-200)" />
        </ReactFlow>
        <p className="sr-only" aria-live="polite">
          {announcement}
        </p>
      </div>
    </div>
  );
}

export function TreeCanvas(props: TreeCanvasProps) {
  return (
    <ReactFlowProvider>
      <Canvas {...props} />
    </ReactFlowProvider>
  );
}
