/**
 * Hand edits of a game tree, as small operations keyed by node id (and, for an
 * action, by the id of the node it leads to, which survives renamed rungs).
 *
 * The Studio keeps the author's edits of a generated tree as a list of these
 * operations. When the ladder changes, the tree is generated again and the
 * edits are replayed on it: node ids come from the path of labels (engine
 * ids.ts), so an edit lands on the same node wherever that node still exists.
 * An edit whose node or action is gone is reported, never silently dropped.
 * Every function here is pure: trees are copied along the changed path only.
 */
import { childId, siblingKeys, slug, childEdges, type GameNode, type Num, type TerminalNode } from '../engine';

export type TreeEdit =
  | { kind: 'payoff'; nodeId: string; team: string; value: Num | null }
  | { kind: 'attribute'; nodeId: string; key: string; value: Num | null }
  | { kind: 'outcome-text'; nodeId: string; text: string }
  | { kind: 'probability'; nodeId: string; childId: string; label: string; p: Num }
  | { kind: 'mover'; nodeId: string; team: string }
  | { kind: 'infoset'; nodeId: string; infoset: string | null }
  | { kind: 'rename'; nodeId: string; childId: string; label: string; to: string }
  | { kind: 'add-action'; nodeId: string; label: string; next: GameNode; p?: Num }
  | { kind: 'remove-action'; nodeId: string; childId: string; label: string }
  | { kind: 'replace'; nodeId: string; node: GameNode };

export type EditResult = { ok: true; root: GameNode } | { ok: false; reason: string };

/** Apply one edit; the reason says why it cannot apply to this tree. */
export function applyEdit(root: GameNode, edit: TreeEdit): EditResult {
  let reason = `node ${edit.nodeId} is no longer in the tree`;
  const next = updateNode(root, edit.nodeId, (node) => {
    const patched = patchNode(node, edit);
    if (typeof patched === 'string') {
      reason = patched;
      return null;
    }
    return patched;
  });
  return next ? { ok: true, root: next } : { ok: false, reason };
}

export type Replay = { root: GameNode; kept: TreeEdit[]; dropped: { edit: TreeEdit; reason: string }[] };

/** Replay edits in order on a (re)generated tree; those that no longer apply come back with the reason. */
export function replayEdits(root: GameNode, edits: TreeEdit[]): Replay {
  const out: Replay = { root, kept: [], dropped: [] };
  for (const edit of edits) {
    const result = applyEdit(out.root, edit);
    if (result.ok) {
      out.root = result.root;
      out.kept.push(edit);
    } else out.dropped.push({ edit, reason: result.reason });
  }
  return out;
}

/**
 * Add an edit to the list, replacing an earlier edit of the same thing (the
 * same payoff, the same probability...) so that the list stays short.
 */
export function recordEdit(edits: TreeEdit[], edit: TreeEdit): TreeEdit[] {
  const key = editKey(edit);
  if (key === null) return [...edits, edit];
  return [...edits.filter((e) => editKey(e) !== key), edit];
}

function editKey(edit: TreeEdit): string | null {
  switch (edit.kind) {
    case 'payoff':
      return `payoff ${edit.nodeId} ${edit.team}`;
    case 'attribute':
      return `attribute ${edit.nodeId} ${edit.key}`;
    case 'probability':
      return `p ${edit.nodeId} ${edit.childId}`;
    case 'outcome-text':
    case 'mover':
    case 'infoset':
    case 'replace':
      return `${edit.kind} ${edit.nodeId}`;
    default:
      return null;
  }
}

/** Say in words what an edit does, for the list of edits that could not be kept. */
export function describeEdit(edit: TreeEdit): string {
  switch (edit.kind) {
    case 'payoff':
      return edit.value === null ? `payoff of ${edit.team} cleared` : `payoff of ${edit.team} set to ${edit.value}`;
    case 'attribute':
      return `attribute ${edit.key} set to ${edit.value ?? '(cleared)'}`;
    case 'outcome-text':
      return 'outcome description changed';
    case 'probability':
      return `probability of “${edit.label}” set to ${edit.p}`;
    case 'mover':
      return `moving team set to ${edit.team}`;
    case 'infoset':
      return edit.infoset ? `grouped into information set ${edit.infoset}` : 'taken out of its information set';
    case 'rename':
      return `action “${edit.label}” renamed to “${edit.to}”`;
    case 'add-action':
      return `action “${edit.label}” added`;
    case 'remove-action':
      return `action “${edit.label}” removed`;
    case 'replace':
      return `node replaced by a ${edit.node.kind} node`;
  }
}

function patchNode(node: GameNode, edit: TreeEdit): GameNode | string {
  switch (edit.kind) {
    case 'payoff':
    case 'attribute':
    case 'outcome-text':
      return node.kind === 'terminal' ? patchTerminal(node, edit) : `node ${node.id} is no longer an outcome`;
    case 'probability': {
      if (node.kind !== 'chance') return `node ${node.id} is no longer a chance node`;
      const at = node.outcomes.findIndex((o) => o.next.id === edit.childId);
      if (at < 0) return `chance outcome “${edit.label}” is no longer at node ${node.id}`;
      return { ...node, outcomes: node.outcomes.map((o, i) => (i === at ? { ...o, p: edit.p } : o)) };
    }
    case 'mover':
      return node.kind === 'decision' ? { ...node, team: edit.team } : `node ${node.id} is no longer a decision`;
    case 'infoset': {
      if (node.kind !== 'decision') return `node ${node.id} is no longer a decision`;
      const { infoset: _old, ...rest } = node;
      return edit.infoset ? { ...rest, infoset: edit.infoset } : rest;
    }
    case 'rename':
    case 'remove-action':
    case 'add-action':
      return patchEdges(node, edit);
    case 'replace':
      return { ...edit.node, id: node.id };
  }
}

function patchTerminal(node: TerminalNode, edit: Extract<TreeEdit, { kind: 'payoff' | 'attribute' | 'outcome-text' }>): TerminalNode {
  if (edit.kind === 'outcome-text') return { ...node, outcome: edit.text };
  const field = edit.kind === 'payoff' ? 'payoffs' : 'attributes';
  const name = edit.kind === 'payoff' ? edit.team : edit.key;
  const values = { ...(node[field] ?? {}) };
  if (edit.value === null) delete values[name];
  else values[name] = edit.value;
  const { [field]: _old, ...rest } = node;
  return Object.keys(values).length > 0 ? { ...rest, [field]: values } : rest;
}

function patchEdges(node: GameNode, edit: Extract<TreeEdit, { kind: 'rename' | 'remove-action' | 'add-action' }>): GameNode | string {
  if (node.kind === 'terminal') return `node ${node.id} is no longer a decision or chance node`;
  const edges = childEdges(node);
  if (edit.kind === 'add-action') {
    if (edges.some((e) => e.label === edit.label)) return `an action “${edit.label}” is already at node ${node.id}`;
    const next = withFreshIds(edit.next, freeChildId(node, edit.label));
    const edge = node.kind === 'chance' ? { label: edit.label, p: edit.p ?? 0, next } : { label: edit.label, next };
    return withEdges(node, [...edges, edge]);
  }
  const at = edges.findIndex((e) => e.next.id === edit.childId);
  if (at < 0) return `action “${edit.label}” is no longer at node ${node.id}`;
  if (edit.kind === 'rename') {
    if (edges.some((e, i) => i !== at && e.label === edit.to)) return `an action “${edit.to}” is already at node ${node.id}`;
    return withEdges(node, edges.map((e, i) => (i === at ? { ...e, label: edit.to } : e)));
  }
  if (edges.length === 1) return `“${edit.label}” is the only action at node ${node.id}; replace the node instead`;
  return withEdges(node, edges.filter((_, i) => i !== at));
}

function withEdges(node: GameNode, edges: unknown[]): GameNode {
  if (node.kind === 'decision') return { ...node, actions: edges as typeof node.actions };
  if (node.kind === 'chance') return { ...node, outcomes: edges as typeof node.outcomes };
  return node;
}

/** An id for a new child of `node` that no sibling has. */
function freeChildId(node: GameNode, label: string): string {
  const taken = new Set(childEdges(node).map((e) => e.next.id));
  const base = childId(node.id, slug(label));
  if (!taken.has(base)) return base;
  for (let n = 2; ; n++) if (!taken.has(`${base}-${n}`)) return `${base}-${n}`;
}

/** Give a subtree ids derived from a new root id, the way the ladder builder derives them. */
export function withFreshIds(node: GameNode, id: string): GameNode {
  const edges = childEdges(node);
  const keys = siblingKeys(edges.map((e) => slug(e.label)));
  const children = edges.map((e, i) => ({ ...e, next: withFreshIds(e.next, childId(id, keys[i]!)) }));
  return withEdges({ ...node, id }, children);
}

/** Copy the path from the root to `id`, replacing that node by `change(node)`; null when it is not found or change refuses. */
export function updateNode(root: GameNode, id: string, change: (node: GameNode) => GameNode | null): GameNode | null {
  if (root.id === id) return change(root);
  const edges = childEdges(root);
  for (let i = 0; i < edges.length; i++) {
    const replaced = updateNode(edges[i]!.next, id, change);
    if (replaced) return withEdges(root, edges.map((e, k) => (k === i ? { ...e, next: replaced } : e)));
  }
  return null;
}

/** Every node of the tree by id. */
export function nodesById(root: GameNode): Map<string, GameNode> {
  const out = new Map<string, GameNode>();
  const stack = [root];
  while (stack.length > 0) {
    const node = stack.pop()!;
    out.set(node.id, node);
    for (const e of childEdges(node)) stack.push(e.next);
  }
  return out;
}
