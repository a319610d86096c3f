import { describe, expect, it } from 'vitest';
import { childEdges, nodeById, type GameNode, type LadderSpec } from '../../../src/lib/engine';
import { blankScenario } from '../../../src/lib/studio/document';
import { handEdits, rebuild } from '../../../src/lib/studio/regenerate';
import { applyEdit } from '../../../src/lib/studio/tree-edits';
import type { Scenario } from '../../../src/lib/scenario';

const at = (doc: Scenario, id: string) => nodeById({ teams: doc.teams, root: doc.tree }, id);

function edited(doc: Scenario, ...edits: Parameters<typeof applyEdit>[1][]): Scenario {
  let tree: GameNode = doc.tree;
  for (const edit of edits) {
    const result = applyEdit(tree, edit);
    if (!result.ok) throw new Error(result.reason);
    tree = result.root;
  }
  return { ...doc, tree };
}

describe('studio: regenerating the tree keeps hand edits', () => {
  const start = blankScenario('Test');
  const ladder = start.ladder!;

  it('finds no hand edits in a freshly generated tree', () => {
    expect(handEdits(start.tree, start.tree)).toEqual([]);
  });

  it('tells hand edits apart from the generated tree', () => {
    const doc = edited(
      start,
      { kind: 'payoff', nodeId: 'n.hold.hold.hold.hold', team: 'blue', value: 9 },
      { kind: 'rename', nodeId: 'n', childId: 'n.hold', label: 'Hold at Talks', to: 'Wait and see' },
    );
    expect(handEdits(start.tree, doc.tree)).toEqual([
      { kind: 'rename', nodeId: 'n', childId: 'n.hold', label: 'Hold at Talks', to: 'Wait and see' },
      { kind: 'payoff', nodeId: 'n.hold.hold.hold.hold', team: 'blue', value: 9 },
    ]);
  });

  it('keeps edits through a renamed rung and reports those whose node is gone', () => {
    const doc = edited(
      start,
      { kind: 'payoff', nodeId: 'n.hold.hold.hold.hold', team: 'blue', value: 9 },
      { kind: 'outcome-text', nodeId: 'n.up1.up1', text: 'War by the second move' },
    );
    // Rename the middle rung (labels change, ids do not) and let only Blue move: each round is
    // one move, so the outcome four moves deep (n.hold.hold.hold.hold) is gone, n.up1.up1 stays.
    const next: LadderSpec = {
      ...ladder,
      rungs: ladder.rungs.map((r) => (r.key === 'pressure' ? { ...r, name: 'Sanctions' } : r)),
      parties: ['blue'],
    };
    const rebuilt = rebuild(doc, { ...doc, ladder: next });
    expect(rebuilt.ok).toBe(true);
    if (!rebuilt.ok) return;
    const { result } = rebuilt;
    expect(result.kept.map((e) => e.kind)).toEqual(['outcome-text']);
    expect(result.dropped).toHaveLength(1);
    expect(result.dropped[0]!.reason).toBe('node n.hold.hold.hold.hold is no longer in the tree');
    expect(at(result.document, 'n.up1.up1')).toMatchObject({ outcome: 'War by the second move' });
    expect(childEdges(at(result.document, 'n')!).map((e) => e.label)).toContain('Climb to Sanctions');
    expect(result.replacedHandBuilt).toBe(false);
  });

  it('replays a payoff edit after a rung is renamed', () => {
    const doc = edited(start, { kind: 'payoff', nodeId: 'n.hold.hold.hold.hold', team: 'red', value: -4 });
    const next: LadderSpec = { ...ladder, rungs: ladder.rungs.map((r, i) => (i === 0 ? { ...r, name: 'Quiet talks' } : r)) };
    const rebuilt = rebuild(doc, { ...doc, ladder: next });
    if (!rebuilt.ok) throw new Error('did not rebuild');
    expect(at(rebuilt.result.document, 'n.hold.hold.hold.hold')).toMatchObject({ kind: 'terminal', payoffs: { red: -4 } });
    expect(rebuilt.result.dropped).toEqual([]);
  });

  it('says when the ladder cannot build, by path', () => {
    const rebuilt = rebuild(start, { ...start, ladder: { ...ladder, start: 2 } });
    expect(rebuilt).toEqual({ ok: false, faults: [{ path: 'ladder.start', message: 'the crisis must start below the top rung (0..1)' }] });
  });
});
