import { describe, expect, it } from 'vitest';
import { buildLadder, indexGame, nodeById, stageAt, validateGame, type Game, type GameNode, type LadderSpec } from '../../../src/lib/engine';

const teams = [
  { id: 'A', name: 'Azure' },
  { id: 'B', name: 'Brick' },
  { id: 'C', name: 'Council' },
];
const attributes = ['cost', 'position', 'face-a', 'face-b', 'standing'];

function spec(overrides: Partial<LadderSpec> = {}): LadderSpec {
  return {
    rungs: [
      { key: 'r0', name: 'Words', intensity: 1, description: 'Protests only.', attributes: { cost: 0, position: 5 } },
      { key: 'r1', name: 'Ships', intensity: 2, description: 'Ships close.', attributes: { cost: 1, position: 4 } },
      { key: 'r2', name: 'Shots', intensity: 3, description: 'Warning shots.', attributes: { cost: 4, position: 2 } },
      { key: 'r3', name: 'War', intensity: 4, description: 'Open war.', attributes: { cost: 50, position: 0 } },
    ],
    start: 0,
    rounds: 2,
    parties: ['A', 'B'],
    moves: { climbUpTo: 1, hold: true, stepDown: true, settle: true },
    flows: ['cost'],
    concessions: { A: { 'face-a': -2 }, B: { 'face-b': -2 } },
    stepDownCosts: { A: { 'face-a': -1 } },
    ...overrides,
  };
}

function build(s: LadderSpec): GameNode {
  const built = buildLadder(s, teams, attributes);
  if (!built.ok) throw new Error(JSON.stringify(built.faults));
  return built.root;
}

const weights = { A: { cost: -1, position: 1, 'face-a': 1 }, B: { cost: -1, position: -1, 'face-b': 1 }, C: { cost: -1, standing: 1 } };
const asGame = (root: GameNode, rungs = spec().rungs): Game => ({ teams, rungs, weights, root });

describe('ladder builder', () => {
  it('offers climb, hold, step down and settle, with ids from the path', () => {
    const root = build(spec());
    expect(root).toMatchObject({ id: 'n', kind: 'decision', team: 'A' });
    if (root.kind !== 'decision') return;
    expect(root.actions.map((a) => [a.label, a.move, a.rung, a.next.id])).toEqual([
      ['Climb to Ships', 'climb', 1, 'n.up1'],
      ['Hold at Words', 'hold', 0, 'n.hold'],
      ['Settle', 'settle', 0, 'n.settle'],
    ]);
    const afterClimb = root.actions[0]!.next;
    if (afterClimb.kind !== 'decision') throw new Error('expected a decision');
    expect(afterClimb.actions.map((a) => a.label)).toEqual(['Climb to Shots', 'Hold at Ships', 'Step down to Words', 'Settle']);
  });

  it('climb up to k offers every climb of 1..k rungs below the top', () => {
    const root = build(spec({ moves: { climbUpTo: 2, hold: false, stepDown: false, settle: false } }));
    if (root.kind !== 'decision') throw new Error('expected a decision');
    expect(root.actions.map((a) => a.label)).toEqual(['Climb to Ships', 'Climb 2 rungs to Shots']);
  });

  it('settling ends the crisis where it stands, with the settler\'s concessions and the round\'s flows', () => {
    const game = asGame(build(spec()));
    expect(nodeById(game, 'n.settle')).toEqual({
      id: 'n.settle',
      kind: 'terminal',
      outcome: 'Settled by Azure at Words (round 1)',
      attributes: { cost: 0, 'face-a': -2, position: 5 },
    });
    // A climbs, B holds: round 1 ends at Ships (cost 1); in round 2 A settles at Ships: cost 1 + 1.
    expect(nodeById(game, 'n.up1.hold.settle')).toMatchObject({ outcome: 'Settled by Azure at Ships (round 2)', attributes: { cost: 2, 'face-a': -2, position: 4 } });
  });

  it('reaching the top rung ends the game at once', () => {
    const game = asGame(build(spec()));
    // Round 1 ends at Shots (cost 4); in round 2 A climbs to War: cost 4 + 50.
    expect(nodeById(game, 'n.up1.up1.up1')).toEqual({
      id: 'n.up1.up1.up1',
      kind: 'terminal',
      outcome: 'Escalation reaches War (round 2)',
      attributes: { cost: 54, position: 0 },
    });
  });

  it('stepping down costs the team its step-down costs each time', () => {
    const game = asGame(build(spec()));
    // A climbs then B climbs (Shots); round 2: A steps down (face -1), B holds: standoff at Ships.
    expect(nodeById(game, 'n.up1.up1.down.hold')).toMatchObject({
      outcome: 'Standoff at Ships after round 2',
      attributes: { cost: 5, 'face-a': -1, position: 4 },
    });
  });

  it('in the simultaneous round the later party cannot see the earlier move, and moves add up', () => {
    const game = asGame(build(spec({ simultaneousRound: 2 })));
    const stage = stageAt(game, 'n.up1.hold');
    expect(stage.kind).toBe('simultaneous');
    if (stage.kind !== 'simultaneous') return;
    expect(stage.movers.map((m) => [m.team, m.key])).toEqual([
      ['A', 'n.up1.hold'],
      ['B', 'h:n.up1.hold:B'],
    ]);
    // Both climb from Ships: Ships + 2 = War.
    expect(nodeById(game, 'n.up1.hold.up1.up1')).toMatchObject({ outcome: 'Escalation reaches War (round 2)' });
    // One climbs, one steps down: back at Ships, and A pays for stepping down.
    expect(nodeById(game, 'n.up1.hold.down.up1')).toMatchObject({ outcome: 'Standoff at Ships after round 2', attributes: { 'face-a': -1 } });
    // If anyone settles, the crisis ends at the round's starting rung with each settler's concession.
    expect(nodeById(game, 'n.up1.hold.settle.settle')).toMatchObject({
      outcome: 'Settled by Azure and Brick at Ships (round 2)',
      attributes: { cost: 2, 'face-a': -2, 'face-b': -2, position: 4 },
    });
    expect(validateGame(game).ok).toBe(true);
  });

  it('the third party moves after the parties once the crisis reaches its rung; chance acts after its round from its rung', () => {
    const root = build(
      spec({
        thirdParty: { team: 'C', fromRung: 2, actions: [{ key: 'aside', label: 'Stand aside', shift: 0, ends: false }, { key: 'broker', label: 'Broker talks', shift: 0, ends: true, attributes: { standing: 3 } }] },
        chance: { afterRound: 1, fromRung: 1, label: 'Incident', outcomes: [{ key: 'clash', label: 'Clash', p: '1/3', shift: 1 }, { key: 'calm', label: 'Calm', p: '2/3', shift: 0 }] },
      }),
    );
    const game = asGame(root);
    expect(nodeById(game, 'n.hold.hold')).toMatchObject({ kind: 'decision', team: 'A' });
    expect(nodeById(game, 'n.up1.hold')).toMatchObject({ kind: 'chance', outcomes: [{ label: 'Clash', p: '1/3', rung: 2 }, { label: 'Calm', p: '2/3', rung: 1 }] });
    expect(nodeById(game, 'n.up1.up1')).toMatchObject({ kind: 'decision', team: 'C' });
    expect(nodeById(game, 'n.up1.up1.broker')).toMatchObject({ outcome: 'Broker talks at Shots (round 1)', attributes: { cost: 4, position: 2, standing: 3 } });
    expect(nodeById(game, 'n.up1.up1.aside')).toMatchObject({ kind: 'chance' });
    expect(validateGame(game).ok).toBe(true);
  });

  it('keeps the ids of every node whose path still exists when the ladder is edited', () => {
    const before = indexGame(asGame(build(spec())));
    const edited = spec();
    edited.rungs[1] = { ...edited.rungs[1]!, description: 'Warships within sight.' };
    const renamed = indexGame(asGame(build(edited)));
    expect([...renamed.byId.keys()]).toEqual([...before.byId.keys()]);
    const fewer = indexGame(asGame(build(spec({ moves: { climbUpTo: 1, hold: true, stepDown: false, settle: true } }))));
    for (const id of fewer.byId.keys()) expect(before.byId.has(id)).toBe(true);
    expect(fewer.byId.size).toBeLessThan(before.byId.size);
  });

  it('reports a ladder that would generate too many nodes', () => {
    const built = buildLadder(spec({ rounds: 6 }), teams, attributes, 500);
    expect(built).toEqual({ ok: false, faults: [expect.objectContaining({ code: 'too-large', path: 'ladder' })] });
  });

  it('names the path of each fault in the ladder', () => {
    const built = buildLadder(
      spec({
        start: 3,
        parties: ['A', 'Z'],
        chance: { afterRound: 3, label: 'Incident', outcomes: [{ key: 'clash', label: 'Clash', p: '1/3', shift: 1 }] },
        flows: ['weather'],
      }),
      teams,
      attributes,
    );
    expect(built.ok).toBe(false);
    if (built.ok) return;
    expect(built.faults.map((f) => [f.path, f.message])).toEqual([
      ['ladder.start', 'the crisis must start below the top rung (0..2)'],
      ['ladder.parties[1]', 'unknown team "Z"'],
      ['ladder.chance.afterRound', 'there are only 2 rounds'],
      ['ladder.chance.outcomes', 'probabilities sum to 1/3, not 1'],
      ['ladder.flows[0]', 'unknown attribute "weather"'],
      ['ladder.concessions.B', '"B" is not one of the parties'],
    ]);
  });
});
