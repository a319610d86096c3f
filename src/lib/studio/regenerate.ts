/**
 * Regenerating the tree when what it is built from changes (the ladder, the
 * teams, the attributes), keeping the author's hand edits.
 *
 * The hand edits are not stored: they are the differences between the tree as
 * it stands and the tree the previous inputs generate. They are replayed on the
 * tree the new inputs generate; those that no longer fit are reported.
 */
import { buildLadder, childEdges, indexGame, toFloat, type GameNode, type LadderSpec, type Num } from '../engine';
import type { Scenario, ScenarioFault } from '../scenario';
import { replayEdits, type TreeEdit } from './tree-edits';

type Inputs = Pick<Scenario, 'teams' | 'attributes' | 'ladder'>;

function generate(inputs: Inputs & { ladder: LadderSpec }) {
  return buildLadder(inputs.ladder, inputs.teams, inputs.attributes.map((a) => a.key));
}

const sameNum = (a: Num | undefined, b: Num | undefined) => (a === undefined || b === undefined ? a === b : toFloat(a) === toFloat(b) && String(a) === String(b));

function diffValues(kind: 'payoff' | 'attribute', nodeId: string, before: Record<string, Num> = {}, after: Record<string, Num> = {}): TreeEdit[] {
  const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])];
  return keys.flatMap((key): TreeEdit[] => {
    if (sameNum(before[key], after[key])) return [];
    const value = after[key] ?? null;
    return [kind === 'payoff' ? { kind, nodeId, team: key, value } : { kind, nodeId, key, value }];
  });
}

/** The edits that turn the generated tree into the current one, in an order that replays. */
export function handEdits(generated: GameNode, current: GameNode): TreeEdit[] {
  const out: TreeEdit[] = [];
  const walk = (g: GameNode, c: GameNode) => {
    if (g.kind !== c.kind) {
      out.push({ kind: 'replace', nodeId: c.id, node: c });
      return;
    }
    if (g.kind === 'decision' && c.kind === 'decision') {
      if (g.team !== c.team) out.push({ kind: 'mover', nodeId: c.id, team: c.team });
      if (g.infoset !== c.infoset) out.push({ kind: 'infoset', nodeId: c.id, infoset: c.infoset ?? null });
    }
    if (g.kind === 'terminal' && c.kind === 'terminal') {
      if ((g.outcome ?? '') !== (c.outcome ?? '')) out.push({ kind: 'outcome-text', nodeId: c.id, text: c.outcome ?? '' });
      out.push(...diffValues('payoff', c.id, g.payoffs, c.payoffs), ...diffValues('attribute', c.id, g.attributes, c.attributes));
      return;
    }
    const before = new Map(childEdges(g).map((e) => [e.next.id, e]));
    const after = childEdges(c);
    const kept = new Set(after.map((e) => e.next.id));
    for (const [childId, e] of before) if (!kept.has(childId)) out.push({ kind: 'remove-action', nodeId: c.id, childId, label: e.label });
    for (const e of after) {
      const was = before.get(e.next.id);
      const p = 'p' in e ? (e.p as Num) : undefined;
      if (!was) {
        out.push({ kind: 'add-action', nodeId: c.id, label: e.label, next: e.next, ...(p !== undefined ? { p } : {}) });
        continue;
      }
      if (was.label !== e.label) out.push({ kind: 'rename', nodeId: c.id, childId: e.next.id, label: was.label, to: e.label });
      if (p !== undefined && !sameNum((was as { p?: Num }).p, p)) out.push({ kind: 'probability', nodeId: c.id, childId: e.next.id, label: e.label, p });
      walk(was.next, e.next);
    }
  };
  walk(generated, current);
  return out;
}

export type Rebuilt = {
  document: Scenario;
  nodes: number;
  kept: TreeEdit[];
  dropped: { edit: TreeEdit; reason: string }[];
  /** True when the old tree did not come from the old inputs, so no hand edits could be told apart. */
  replacedHandBuilt: boolean;
  /** Marks, payoff ranges and injects that now point at nothing. */
  dangling: string[];
};

/** The document with its tree generated from `next` inputs; hand edits of `previous` kept where they still apply. */
export function rebuild(previous: Scenario, next: Scenario & { ladder: LadderSpec }): { ok: true; result: Rebuilt } | { ok: false; faults: ScenarioFault[] } {
  const built = generate(next);
  if (!built.ok) return { ok: false, faults: built.faults.map((f) => ({ path: f.path, message: f.message })) };
  const baseline = previous.ladder ? generate({ ...previous, ladder: previous.ladder }) : null;
  const fromLadder = baseline?.ok === true && baseline.root.id === previous.tree.id;
  const edits = fromLadder ? handEdits(baseline.root, previous.tree) : [];
  const replay = replayEdits(built.root, edits);
  const document: Scenario = { ...next, tree: replay.root };
  return {
    ok: true,
    result: {
      document,
      nodes: indexGame({ teams: document.teams, root: document.tree }).nodes.length,
      kept: replay.kept,
      dropped: replay.dropped,
      replacedHandBuilt: !fromLadder && previous.tree.kind !== 'terminal',
      dangling: danglingReferences(document),
    },
  };
}

export function danglingReferences(document: Scenario): string[] {
  const byId = indexGame({ teams: document.teams, root: document.tree }).byId;
  const out: string[] = [];
  document.marks.forEach((m, i) => {
    const node = byId.get(m.nodeId);
    if (!node || !childEdges(node).some((e) => e.label === m.action)) out.push(`marks[${i}]: the ${m.kind} “${m.action}” no longer exists`);
  });
  document.payoffRanges.forEach((r, i) => {
    if (byId.get(r.nodeId)?.kind !== 'terminal') out.push(`payoffRanges[${i}]: outcome ${r.nodeId} no longer exists`);
  });
  document.injects.forEach((inj, i) => {
    if (inj.nodeId !== null && !byId.has(inj.nodeId)) out.push(`injects[${i}]: “${inj.title}” is due at a node that no longer exists`);
  });
  return out;
}

export type RebuildReport = ({ ok: true } & Omit<Rebuilt, 'document'>) | { ok: false; faults: ScenarioFault[] };

/** What the ladder builder reads: the ladder, the teams' ids and names (outcome texts name them), the attribute keys. */
const builderInputs = (d: Scenario) => JSON.stringify([d.teams.map((t) => [t.id, t.name]), d.attributes.map((a) => a.key)]);
const inputsChanged = (a: Scenario, b: Scenario) => a.ladder !== b.ladder || builderInputs(a) !== builderInputs(b);

/**
 * After any change: when what the tree is built from changed and there is a
 * ladder, the tree is rebuilt. When it cannot be, the change stands, the tree
 * stays as it was, and the report says why.
 */
export function withTreeInStep(previous: Scenario, next: Scenario): { document: Scenario; report: RebuildReport | null } {
  if (!next.ladder || !inputsChanged(previous, next)) return { document: next, report: null };
  const rebuilt = rebuild(previous, { ...next, ladder: next.ladder });
  if (!rebuilt.ok) return { document: next, report: rebuilt };
  const { document, ...report } = rebuilt.result;
  return { document, report: { ok: true, ...report } };
}
