import { describe, expect, it } from 'vitest';
import { PlayError, advance, drawChance, mulberry32, nodeById, parentOf, pathTo, stageAt, type ChanceNode, type Moves } from '../../../src/lib/engine';
import { scenarioGame } from '../../../src/lib/scenario';
import { demoScenario } from '../../../server/seed/demo-scenario';

const game = scenarioGame(demoScenario());

function playError(nodeId: string, moves: Moves): PlayError {
  try {
    advance(game, nodeId, moves);
  } catch (e) {
    if (e instanceof PlayError) return e;
    throw e;
  }
  throw new Error('expected a PlayError');
}

describe('tree lookups', () => {
  it('finds nodes by id, their parent and the path of labels from the root', () => {
    expect(nodeById(game, 'n.hold.hold')?.kind).toBe('chance');
    expect(parentOf(game, 'n.hold.hold')?.id).toBe('n.hold');
    expect(pathTo(game, 'n.hold.hold.quiet')).toEqual(['Hold at Naval shadowing', 'Hold at Naval shadowing', 'A quiet night in the channel']);
    expect(pathTo(game, 'n')).toEqual([]);
    expect(pathTo(game, 'nowhere')).toBeUndefined();
  });
});

describe('stageAt', () => {
  it('describes a sequential decision with the rung each action leads to', () => {
    const stage = stageAt(game, 'n');
    expect(stage.kind).toBe('decision');
    if (stage.kind !== 'decision') return;
    expect(stage.team).toBe('velmora');
    expect(stage.actions.map((a) => [a.label, a.move, a.rung?.name])).toEqual([
      ['Climb to Exclusion zone', 'climb', 'Exclusion zone'],
      ['Hold at Naval shadowing', 'hold', 'Naval shadowing'],
      ['Step down to Coast guard escorts', 'step-down', 'Coast guard escorts'],
      ['Settle', 'settle', 'Naval shadowing'],
    ]);
    expect(stage.actions[0]!.rung!.description).toMatch(/exclusion zone/);
  });

  it('describes a simultaneous stage with its movers and their action sets', () => {
    const stage = stageAt(game, 'n.hold.hold.quiet');
    expect(stage.kind).toBe('simultaneous');
    if (stage.kind !== 'simultaneous') return;
    expect(stage.movers.map((m) => [m.team, m.key, m.actions.length])).toEqual([
      ['velmora', 'n.hold.hold.quiet', 4],
      ['ostrakh', 'h:n.hold.hold.quiet:ostrakh', 4],
    ]);
  });

  it('describes a chance node with exact and float probabilities', () => {
    const stage = stageAt(game, 'n.hold.hold');
    expect(stage).toMatchObject({
      kind: 'chance',
      outcomes: [
        { label: 'Collision between patrol vessels', probability: 0.25, exact: '1/4' },
        { label: 'A quiet night in the channel', probability: 0.75, exact: '3/4' },
      ],
    });
  });

  it('describes a terminal with payoffs per team and the outcome attributes', () => {
    const stage = stageAt(game, 'n.settle');
    expect(stage.kind).toBe('terminal');
    if (stage.kind !== 'terminal') return;
    expect(stage.outcome).toBe('Settled by Velmora at Naval shadowing (round 1)');
    // Velmora: 2 * (5 - 1) - 2 (concession) - (1/2) * (1/2) (trade) = 23/4.
    expect(stage.payoffs.velmora).toEqual({ value: 5.75, exact: '23/4' });
    expect(stage.attributes.channel).toEqual({ value: 4, exact: '4', label: 'Velmoran control of the eastern channel', unit: 'index 0-10' });
  });
});

describe('advance', () => {
  it('follows a decision, a chance outcome and a simultaneous stage', () => {
    expect(advance(game, 'n', { velmora: 'Hold at Naval shadowing' })).toBe('n.hold');
    expect(advance(game, 'n.hold.hold', { chance: 'A quiet night in the channel' })).toBe('n.hold.hold.quiet');
    expect(advance(game, 'n.hold.hold.quiet', { velmora: 'Hold at Naval shadowing', ostrakh: 'Climb to Exclusion zone' })).toBe('n.hold.hold.quiet.hold.up1');
  });

  it('refuses a wrong team, an unknown label, a missing move, a chance draw given as a move, and a finished game', () => {
    expect(playError('n', { ostrakh: 'Hold at Naval shadowing' })).toMatchObject({ code: 'wrong-team', message: '"ostrakh" cannot move here; the movers are: velmora' });
    expect(playError('n', { velmora: 'Invade' }).message).toBe(
      '"Invade" is not a move of velmora here; the moves are: Climb to Exclusion zone, Hold at Naval shadowing, Step down to Coast guard escorts, Settle',
    );
    expect(playError('n.hold.hold.quiet', { velmora: 'Settle' })).toMatchObject({ code: 'missing-move', message: 'no move given for ostrakh' });
    expect(playError('n.hold.hold', { velmora: 'Settle' }).code).toBe('not-chance');
    expect(playError('n.settle', { velmora: 'Settle' }).code).toBe('game-over');
    expect(playError('n.nowhere', {}).code).toBe('unknown-node');
  });
});

describe('seeded chance draws (mulberry32)', () => {
  it('repeats a draw from its seed and matches the probabilities over many draws', () => {
    const node = nodeById(game, 'n.hold.hold') as ChanceNode;
    const a = mulberry32(2024);
    const b = mulberry32(2024);
    for (let k = 0; k < 5; k++) expect(drawChance(node, a)).toEqual(drawChance(node, b));
    const rng = mulberry32(7);
    let collisions = 0;
    const draws = 20_000;
    for (let k = 0; k < draws; k++) {
      const draw = drawChance(node, rng);
      expect(draw.u).toBeGreaterThanOrEqual(0);
      expect(draw.u).toBeLessThan(1);
      if (draw.index === 0) collisions++;
    }
    // Binomial(20000, 1/4): standard deviation about 0.003 in the share.
    expect(Math.abs(collisions / draws - 0.25)).toBeLessThan(0.012);
  });

  it('gives different streams for different seeds', () => {
    expect(mulberry32(1)()).not.toBe(mulberry32(2)());
  });
});
