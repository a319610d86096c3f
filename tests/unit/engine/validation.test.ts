import { describe, expect, it } from 'vitest';
import { parsePlainGame, validateGame, type FaultCode } from '../../../src/lib/engine';

const teams = [
  { id: 'Blue', name: 'Blue' },
  { id: 'Red', name: 'Red' },
];
const leaf = (id: string, blue: number | string = 1, red: number | string = 0) => ({ id, kind: 'terminal', payoffs: { Blue: blue, Red: red } });

function faultsOf(root: unknown, options = {}) {
  const result = validateGame({ teams, root }, options);
  expect(result.ok).toBe(false);
  return result.ok ? [] : result.faults;
}

function only(root: unknown, code: FaultCode, options = {}) {
  const faults = faultsOf(root, options);
  expect(faults.map((f) => f.code)).toEqual([code]);
  return faults[0]!;
}

describe('validation names the node path and the fault', () => {
  it('accepts payoffs and probabilities as numbers or exact strings', () => {
    const result = validateGame({
      teams,
      root: {
        id: 'n',
        kind: 'chance',
        outcomes: [
          { label: 'Storm', p: '1/3', next: leaf('a', '7/3', '-2') },
          { label: 'Fog', p: '0.25', next: leaf('b', 0.5, 3) },
          { label: 'Calm', p: '5/12', next: leaf('c') },
        ],
      },
    });
    expect(result.ok).toBe(true);
  });

  it('probabilities not summing to 1', () => {
    const fault = only(
      { id: 'n', kind: 'decision', team: 'Blue', actions: [{ label: 'Sail', next: { id: 'c', kind: 'chance', outcomes: [{ label: 'Storm', p: '1/4', next: leaf('a') }, { label: 'Calm', p: 0.5, next: leaf('b') }] } }] },
      'probability-sum',
    );
    expect(fault.path).toBe('root.actions[0].next.outcomes');
    expect(fault.nodeId).toBe('c');
    expect(fault.message).toBe('at Sail: probabilities sum to 3/4, not 1');
  });

  it('a probability outside 0..1', () => {
    const faults = faultsOf({ id: 'c', kind: 'chance', outcomes: [{ label: 'Storm', p: '3/2', next: leaf('a') }, { label: 'Calm', p: '-1/2', next: leaf('b') }] });
    expect(faults.map((f) => [f.code, f.path])).toEqual([
      ['probability-range', 'root.outcomes[0].p'],
      ['probability-range', 'root.outcomes[1].p'],
    ]);
    expect(faults[0]!.message).toBe('at the root: probability of "Storm" is 3/2, outside 0..1');
  });

  it('duplicate action labels', () => {
    const fault = only({ id: 'n', kind: 'decision', team: 'Blue', actions: [{ label: 'Hold', next: leaf('a') }, { label: 'Hold', next: leaf('b') }] }, 'duplicate-label');
    expect(fault.path).toBe('root.actions[1].label');
    expect(fault.message).toBe('at the root: action label "Hold" appears twice');
  });

  it('an information set spanning different teams', () => {
    const fault = only(
      {
        id: 'n',
        kind: 'decision',
        team: 'Blue',
        actions: [
          { label: 'L', next: { id: 'x', kind: 'decision', team: 'Red', infoset: 'h', actions: [{ label: 'a', next: leaf('xa') }] } },
          { label: 'R', next: { id: 'y', kind: 'decision', team: 'Blue', infoset: 'h', actions: [{ label: 'a', next: leaf('ya') }] } },
        ],
      },
      'infoset-teams',
    );
    expect(fault.path).toBe('root.actions[1].next.team');
    expect(fault.message).toBe('at R: information set "h" spans teams "Red" and "Blue"');
  });

  it('an information set with different action sets', () => {
    const fault = only(
      {
        id: 'n',
        kind: 'decision',
        team: 'Blue',
        actions: [
          { label: 'L', next: { id: 'x', kind: 'decision', team: 'Red', infoset: 'h', actions: [{ label: 'a', next: leaf('xa') }, { label: 'b', next: leaf('xb') }] } },
          { label: 'R', next: { id: 'y', kind: 'decision', team: 'Red', infoset: 'h', actions: [{ label: 'a', next: leaf('ya') }, { label: 'c', next: leaf('yc') }] } },
        ],
      },
      'infoset-actions',
    );
    expect(fault.message).toContain('at R: information set "h" offers [a, c] here but [a, b] at L');
  });

  it('perfect recall broken: a team forgets its own earlier move', () => {
    const second = (id: string) => ({ id, kind: 'decision', team: 'Blue', infoset: 'later', actions: [{ label: 'x', next: leaf(`${id}x`) }, { label: 'y', next: leaf(`${id}y`) }] });
    const fault = only(
      {
        id: 'n',
        kind: 'decision',
        team: 'Blue',
        actions: [
          { label: 'Early', next: { id: 'r1', kind: 'decision', team: 'Red', actions: [{ label: 'ok', next: second('b1') }] } },
          { label: 'Late', next: { id: 'r2', kind: 'decision', team: 'Red', actions: [{ label: 'ok', next: second('b2') }] } },
        ],
      },
      'perfect-recall',
    );
    expect(fault.path).toBe('root.actions[1].next.actions[0].next.infoset');
    expect(fault.message).toContain('at Late › ok: perfect recall is broken');
  });

  it('an unknown team', () => {
    const fault = only({ id: 'n', kind: 'decision', team: 'Green', actions: [{ label: 'Go', next: leaf('a') }] }, 'unknown-team');
    expect(fault.path).toBe('root.team');
    expect(fault.message).toBe('at the root: the mover "Green" is not one of the teams');
  });

  it('a payoff that is not finite', () => {
    const parsed = parsePlainGame(JSON.parse('{"teams": ["Blue", "Red"], "root": {"team": "Blue", "actions": [{"label": "Go", "next": {"payoffs": [1, 1e400]}}]}}'));
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    expect(parsed.faults).toHaveLength(1);
    expect(parsed.faults[0]!.code).toBe('payoff-not-finite');
    expect(parsed.faults[0]!.path).toBe('root.actions[0].next.payoffs[1]');
    expect(parsed.faults[0]!.message).toMatch(/^at Go: payoff for Red must be a finite number/);
  });

  it('a payoff that is not a number or an exact value', () => {
    const fault = only({ id: 'n', kind: 'decision', team: 'Blue', actions: [{ label: 'Go', next: leaf('a', 'seven', 1) }] }, 'payoff-not-finite');
    expect(fault.path).toBe('root.actions[0].next.payoffs.Blue');
  });

  it('a missing payoff', () => {
    const fault = only({ id: 'n', kind: 'decision', team: 'Blue', actions: [{ label: 'Go', next: { id: 'a', kind: 'terminal', payoffs: { Blue: 1 } } }] }, 'payoff-missing');
    expect(fault.message).toContain('no payoff for team "Red"');
  });

  it('a tree over the size limit', () => {
    const actions = Array.from({ length: 20 }, (_, i) => ({ label: `a${i}`, next: leaf(`t${i}`) }));
    const fault = only({ id: 'n', kind: 'decision', team: 'Blue', actions }, 'too-large', { maxNodes: 10 });
    expect(fault.message).toBe('the tree has 21 nodes, over the limit of 10');
  });

  it('duplicate node ids', () => {
    const fault = only({ id: 'n', kind: 'decision', team: 'Blue', actions: [{ label: 'A', next: leaf('same') }, { label: 'B', next: leaf('same') }] }, 'duplicate-id');
    expect(fault.message).toBe('at B: node id "same" is already used at A');
  });

  it('an information-set id that is another node\'s id', () => {
    const fault = only(
      { id: 'n', kind: 'decision', team: 'Blue', actions: [{ label: 'A', next: { id: 'x', kind: 'decision', team: 'Red', infoset: 'n', actions: [{ label: 'a', next: leaf('xa') }] } }] },
      'infoset-id-clash',
    );
    expect(fault.path).toBe('root.actions[0].next.infoset');
  });

  it('plain format paths use "chance" and payoff positions', () => {
    const parsed = parsePlainGame({ teams: ['Blue', 'Red'], root: { chance: [{ label: 'Storm', p: '1/4', next: { payoffs: [2, '1/3'] } }] } });
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.faults[0]).toMatchObject({ code: 'probability-sum', path: 'root.chance' });
  });
});
