/** Clock arithmetic, settings and the play adapter over a small hand-made tree. */
import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../../../src/lib/engine';
import type { Game } from '../../../src/lib/engine';
import { extendClock, freshClock, holdClock, NO_CLOCK, startClock } from '../../../src/lib/exercise/clock';
import { drawSeed } from '../../../src/lib/exercise/draws';
import { advance, drawAt, holdAction, reachableEndings, stageAt } from '../../../src/lib/exercise/play';
import { DEFAULT_SETTINGS, readSettings } from '../../../src/lib/exercise/settings';

const end = (id: string, outcome: string, blue: number, red: number) => ({ id, kind: 'terminal' as const, outcome, payoffs: { blue, red } });
/** Blue moves; Red answers; then chance; then a simultaneous 2x2 (Red's nodes share one information set). */
const game: Game = {
  teams: [
    { id: 'blue', name: 'Blue' },
    { id: 'red', name: 'Red' },
  ],
  root: {
    id: 'n',
    kind: 'decision',
    team: 'blue',
    actions: [
      { label: 'Wait', move: 'hold', next: end('n.wait', 'Quiet', 0, 0) },
      {
        label: 'Protest',
        move: 'climb',
        next: {
          id: 'n.p',
          kind: 'chance',
          outcomes: [
            { label: 'Calm', p: '3/4', next: end('n.p.calm', 'Calm', 1, 1) },
            {
              label: 'Storm',
              p: '1/4',
              next: {
                id: 'n.p.s',
                kind: 'decision',
                team: 'blue',
                actions: [
                  { label: 'Hold', move: 'hold', next: { id: 'n.p.s.h', kind: 'decision', team: 'red', infoset: 'r', actions: [{ label: 'Hold', next: end('n.p.s.h.h', 'Standoff', 2, 2) }, { label: 'Push', next: end('n.p.s.h.p', 'Red ahead', 0, 3) }] } },
                  { label: 'Push', move: 'climb', next: { id: 'n.p.s.p', kind: 'decision', team: 'red', infoset: 'r', actions: [{ label: 'Hold', next: end('n.p.s.p.h', 'Blue ahead', 3, 0) }, { label: 'Push', next: end('n.p.s.p.p', 'Standoff', -1, -1) }] } },
                ],
              },
            },
          ],
        },
      },
    ],
  },
};

describe('live play adapter', () => {
  it('sees a sequential decision, a chance node and a simultaneous stage', () => {
    expect(stageAt(game, 'n')).toMatchObject({ kind: 'decision', movers: [{ team: 'blue', actions: ['Wait', 'Protest'] }] });
    expect(stageAt(game, 'n.p')).toMatchObject({ kind: 'chance' });
    expect(stageAt(game, 'n.p.s')).toMatchObject({ kind: 'simultaneous', movers: [{ team: 'blue' }, { team: 'red', key: 'r' }] });
    expect(stageAt(game, 'n.p.s.h')).toMatchObject({ kind: 'decision', movers: [{ team: 'red' }] });
  });

  it('advances a simultaneous stage and says where each move was made', () => {
    const stage = stageAt(game, 'n.p.s');
    if (stage.kind !== 'simultaneous') throw new Error('not simultaneous');
    expect(advance(game, stage, { blue: 'Push', red: 'Hold' })).toEqual({
      nodeId: 'n.p.s.p.h',
      steps: [
        { teamId: 'blue', nodeId: 'n.p.s', label: 'Push' },
        { teamId: 'red', nodeId: 'n.p.s.p', label: 'Hold' },
      ],
    });
  });

  it('draws by the cumulative probabilities with a repeatable seed', () => {
    for (const index of [0, 1, 2, 3, 4, 5]) {
      const seed = drawSeed('424242', index);
      const draw = drawAt(game, 'n.p', seed);
      expect(draw.value).toBe(mulberry32(seed)());
      expect(draw.label).toBe(draw.value < 0.75 ? 'Calm' : 'Storm');
    }
    expect(drawSeed('4294967295', 1)).toBe((4294967295 + 0x9e3779b9) % 2 ** 32);
  });

  it('lists one ending per outcome, shallowest first, and finds the hold action', () => {
    expect(reachableEndings(game, 'n.p.s').map((t) => t.id)).toEqual(['n.p.s.h.h', 'n.p.s.h.p', 'n.p.s.p.h']);
    const stage = stageAt(game, 'n');
    if (stage.kind !== 'decision') throw new Error('not a decision');
    expect(holdAction(stage.movers[0]!)).toBe('Wait');
  });
});

describe('turn clock', () => {
  it('runs, holds with the time left, extends and resumes', () => {
    const held = freshClock(600, false, 0);
    expect(held).toEqual({ status: 'held', deadlineAt: null, leftMs: 600_000, resumeOnLive: true });
    const running = startClock(held, 1_000);
    expect(running).toMatchObject({ status: 'running', deadlineAt: 601_000 });
    const paused = holdClock(running, 101_000);
    expect(paused).toMatchObject({ status: 'held', leftMs: 500_000 });
    expect(extendClock(paused, 60, 0)).toMatchObject({ leftMs: 560_000 });
    expect(extendClock({ ...running, status: 'expired' }, 30, 700_000)).toMatchObject({ status: 'running', deadlineAt: 730_000 });
    expect(freshClock(null, true, 0)).toEqual(NO_CLOCK);
  });
});

describe('exercise settings', () => {
  it('fall back to the defaults key by key', () => {
    expect(readSettings(undefined)).toEqual(DEFAULT_SETTINGS);
    expect(readSettings({ submitter: 'any', turnSeconds: 'soon', tags: ['a', 'a'] })).toEqual({ ...DEFAULT_SETTINGS, submitter: 'any' });
  });
});
