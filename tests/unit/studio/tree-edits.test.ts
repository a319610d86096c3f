import { describe, expect, it } from 'vitest';
import { type GameNode } from '../../../src/lib/engine';
import { applyEdit, describeEdit, recordEdit, replayEdits, type TreeEdit } from '../../../src/lib/studio/tree-edits';

/** Blue protests or stays quiet; after a protest Red yields or presses on. */
const tree = (): GameNode => ({
  id: 'n',
  kind: 'decision',
  team: 'blue',
  actions: [
    {
      label: 'Protest',
      next: {
        id: 'n.protest',
        kind: 'decision',
        team: 'red',
        actions: [
          { label: 'Yield', next: { id: 'n.protest.yield', kind: 'terminal', payoffs: { blue: 2, red: 0 } } },
          { label: 'Press on', next: { id: 'n.protest.press', kind: 'terminal', payoffs: { blue: -1, red: 1 } } },
        ],
      },
    },
    { label: 'Stay quiet', next: { id: 'n.quiet', kind: 'terminal', payoffs: { blue: 0, red: 2 } } },
  ],
});

const terminal = (root: GameNode, path: number[]) => {
  let node = root;
  for (const i of path) node = (node as Extract<GameNode, { kind: 'decision' }>).actions[i]!.next;
  return node;
};

describe('studio: hand edits of the tree', () => {
  it('sets a payoff without touching the original tree', () => {
    const original = tree();
    const result = applyEdit(original, { kind: 'payoff', nodeId: 'n.protest.press', team: 'red', value: '5/2' });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(terminal(result.root, [0, 1])).toMatchObject({ payoffs: { blue: -1, red: '5/2' } });
    expect(terminal(original, [0, 1])).toMatchObject({ payoffs: { blue: -1, red: 1 } });
    // Untouched branches are shared, not copied.
    expect(terminal(result.root, [1])).toBe(terminal(original, [1]));
  });

  it('adds an action with fresh path ids and renames and removes actions by the node they lead to', () => {
    const added = applyEdit(tree(), {
      kind: 'add-action',
      nodeId: 'n.protest',
      label: 'Ask the mediator',
      next: { id: 'x', kind: 'terminal', payoffs: { blue: 1, red: 1 } },
    });
    expect(added.ok && terminal(added.root, [0, 2]).id).toBe('n.protest.ask-the-mediator');
    const renamed = applyEdit(tree(), { kind: 'rename', nodeId: 'n', childId: 'n.quiet', label: 'Stay quiet', to: 'Wait' });
    expect(renamed.ok && (renamed.root as Extract<GameNode, { kind: 'decision' }>).actions[1]!.label).toBe('Wait');
    const removed = applyEdit(tree(), { kind: 'remove-action', nodeId: 'n.protest', childId: 'n.protest.yield', label: 'Yield' });
    expect(removed.ok && (terminal(removed.root, [0]) as Extract<GameNode, { kind: 'decision' }>).actions.map((a) => a.label)).toEqual(['Press on']);
  });

  it('refuses what does not fit, with the reason', () => {
    expect(applyEdit(tree(), { kind: 'payoff', nodeId: 'n.protest', team: 'red', value: 1 })).toEqual({ ok: false, reason: 'node n.protest is no longer an outcome' });
    expect(applyEdit(tree(), { kind: 'mover', nodeId: 'n.gone', team: 'red' })).toEqual({ ok: false, reason: 'node n.gone is no longer in the tree' });
    expect(applyEdit(tree(), { kind: 'rename', nodeId: 'n', childId: 'n.quiet', label: 'Stay quiet', to: 'Protest' })).toMatchObject({ ok: false, reason: expect.stringContaining('already') });
    expect(applyEdit(tree(), { kind: 'remove-action', nodeId: 'n.protest', childId: 'n.protest.gone', label: 'Gone' })).toMatchObject({ ok: false });
  });

  it('replays edits on a regenerated tree and lists those it could not keep', () => {
    const edits: TreeEdit[] = [
      { kind: 'payoff', nodeId: 'n.protest.yield', team: 'blue', value: 3 },
      { kind: 'infoset', nodeId: 'n.protest', infoset: 'h1' },
      { kind: 'payoff', nodeId: 'n.protest.press', team: 'red', value: 4 },
    ];
    // The regenerated tree lost the "press on" branch.
    const smaller = applyEdit(tree(), { kind: 'remove-action', nodeId: 'n.protest', childId: 'n.protest.press', label: 'Press on' });
    if (!smaller.ok) throw new Error(smaller.reason);
    const replay = replayEdits(smaller.root, edits);
    expect(replay.kept).toHaveLength(2);
    expect(replay.dropped).toEqual([{ edit: edits[2], reason: 'node n.protest.press is no longer in the tree' }]);
    expect(terminal(replay.root, [0, 0])).toMatchObject({ payoffs: { blue: 3 } });
    expect(describeEdit(replay.dropped[0]!.edit)).toBe('payoff of red set to 4');
  });

  it('keeps one edit per payoff, the latest', () => {
    let edits: TreeEdit[] = [];
    edits = recordEdit(edits, { kind: 'payoff', nodeId: 'n.quiet', team: 'red', value: 1 });
    edits = recordEdit(edits, { kind: 'payoff', nodeId: 'n.quiet', team: 'blue', value: 1 });
    edits = recordEdit(edits, { kind: 'payoff', nodeId: 'n.quiet', team: 'red', value: 7 });
    expect(edits).toEqual([
      { kind: 'payoff', nodeId: 'n.quiet', team: 'blue', value: 1 },
      { kind: 'payoff', nodeId: 'n.quiet', team: 'red', value: 7 },
    ]);
  });
});
