import { describe, expect, it } from 'vitest';
import { equilibriumCountSentence, PlayMismatch, reviewPlay } from '../../../src/lib/review';
import { CENTIPEDE, ENTRY, LADDER, ladderVariant, playRecord } from './fixtures';

const logistic = (x: number) => 1 / (1 + Math.exp(-x));

describe('review of the centipede game (McKelvey and Palfrey 1992; Rosenthal 1981)', () => {
  // Play as most of McKelvey and Palfrey's pairs did: pass twice, then take.
  const record = playRecord(CENTIPEDE, [['n1', 'Pass'], ['n2', 'Pass'], ['n3', 'Take']]);
  const review = reviewPlay(CENTIPEDE, record);

  it('puts the subgame-perfect path at "take at once" (backward induction, Rosenthal 1981)', () => {
    expect(review.equilibrium.end).toMatchObject({ nodeId: 't1', terminal: true, path: ['Take'], payoffs: [0.4, 0.1] });
    expect(review.actual).toMatchObject({ nodeId: 't3', outcome: 'First takes at move 3', payoffs: [1.6, 0.4] });
  });

  it('gives per move the equilibrium action, the deviation and the continuation value given up', () => {
    expect(review.moves.map((m) => [m.mover, m.label, m.equilibriumAction, m.deviated])).toEqual([
      ['First', 'Pass', 'Take', true],
      ['Second', 'Pass', 'Take', true],
      ['First', 'Take', 'Take', false],
    ]);
    // Passing at move k hands the opponent a take at k+1: 0.40 - 0.20, 0.80 - 0.40, then nothing given up.
    expect(review.moves.map((m) => m.regret)).toEqual([expect.closeTo(0.2, 12), expect.closeTo(0.4, 12), 0]);
    expect(review.regret.map((p) => [p.step, p.team, p.regret])).toEqual([
      [1, 'First', expect.closeTo(0.2, 12)],
      [2, 'Second', expect.closeTo(0.4, 12)],
      [3, 'First', 0],
    ]);
  });

  it('gives the probability of each move under the agent logit QRE at the fitted lambdas (McKelvey and Palfrey 1998)', () => {
    const l1 = review.lambdas.first!;
    const l2 = review.lambdas.second!;
    // The agent QRE of a perfect-information game by hand, from the last move back.
    const pTake4 = logistic(l2 * (3.2 - 1.6));
    const v4 = [pTake4 * 0.8 + (1 - pTake4) * 6.4, pTake4 * 3.2 + (1 - pTake4) * 1.6];
    const pTake3 = logistic(l1 * (1.6 - v4[0]!));
    const v3 = [pTake3 * 1.6 + (1 - pTake3) * v4[0]!, pTake3 * 0.4 + (1 - pTake3) * v4[1]!];
    const pTake2 = logistic(l2 * (0.8 - v3[1]!));
    const v2First = pTake2 * 0.2 + (1 - pTake2) * v3[0]!;
    const pTake1 = logistic(l1 * (0.4 - v2First));
    expect(review.moves[0]!.qreProbability).toBeCloseTo(1 - pTake1, 9);
    expect(review.moves[1]!.qreProbability).toBeCloseTo(1 - pTake2, 9);
    expect(review.moves[2]!.qreProbability).toBeCloseTo(pTake3, 9);
  });

  it('sets each team’s log-likelihood beside uniform play and equilibrium play with trembles', () => {
    const [first, second] = review.fits;
    expect(first).toMatchObject({ team: 'First', moves: 2, deviations: 1 });
    expect(second).toMatchObject({ team: 'Second', moves: 1, deviations: 1 });
    expect(first!.logLikelihood.uniform).toBeCloseTo(2 * Math.log(1 / 2), 12);
    expect(second!.logLikelihood.uniform).toBeCloseTo(Math.log(1 / 2), 12);
    // Tremble 0.01: an equilibrium move has 0.99 + 0.01/2, a deviation 0.01/2.
    expect(first!.logLikelihood.trembles).toBeCloseTo(Math.log(0.005) + Math.log(0.995), 12);
    expect(second!.logLikelihood.trembles).toBeCloseTo(Math.log(0.005), 12);
    // Lambda = 0 is uniform play and lies in the search range, so the fit is at least as good.
    const total = (k: 'qre' | 'uniform') => review.fits.reduce((s, f) => s + (f.logLikelihood[k] ?? 0), 0);
    expect(total('qre')).toBeGreaterThanOrEqual(total('uniform') - 1e-9);
    expect(first!.logLikelihood.qre).toBeCloseTo(Math.log(review.moves[0]!.qreProbability!) + Math.log(review.moves[2]!.qreProbability!), 9);
  });

  it('tells where equilibrium play from each deviation on would have ended', () => {
    expect(review.counterfactuals.map((c) => [c.team, c.label, c.instead.nodeId, c.after.nodeId])).toEqual([
      ['First', 'Pass', 't1', 't2'],
      ['Second', 'Pass', 't2', 't3'],
    ]);
    expect(review.counterfactuals[1]!.after.path).toEqual(['Pass', 'Pass', 'Take']);
  });
});

describe('review of the entry game (Osborne 2004, section 5.1; Selten 1978)', () => {
  const review = reviewPlay(ENTRY, playRecord(ENTRY, [['c', 'In'], ['i', 'Fight']]));

  it('treats the fight as a deviation from the credible response, with regret 1 for the incumbent', () => {
    expect(review.equilibrium.end).toMatchObject({ nodeId: 'ia', outcome: 'Entry accommodated', payoffs: [2, 1] });
    expect(review.moves.map((m) => [m.label, m.deviated, m.regret])).toEqual([
      ['In', false, 0],
      ['Fight', true, 1],
    ]);
    expect(review.counterfactuals).toHaveLength(1);
    expect(review.counterfactuals[0]!.instead).toMatchObject({ nodeId: 'ia', outcome: 'Entry accommodated' });
    expect(review.counterfactuals[0]!.after).toMatchObject({ nodeId: 'if', outcome: 'Price war' });
  });

  it('reviews play the facilitator ended at an outcome, with where equilibrium play would have gone', () => {
    const ended = reviewPlay(
      ENTRY,
      playRecord(ENTRY, [['c', 'In']], {
        currentNodeId: 'o',
        ending: { moveId: 'e1', turn: 2, nodeId: 'i', teamId: 'second', outcomeNodeId: 'o', outcome: 'Challenger stays out', proposal: 'Buy the challenger out', reason: 'Both sides accepted the offer', at: '2026-01-05T09:30:00.000Z' },
      }),
    );
    expect(ended.actual).toMatchObject({ nodeId: 'o', terminal: true, outcome: 'Challenger stays out', payoffs: [1, 2] });
    expect(ended.ending).toMatchObject({ mover: 'Incumbent', turn: 2, equilibriumFromThere: { nodeId: 'ia' } });
    expect(ended.timeline.map((e) => e.kind)).toEqual(['move', 'ending']);
    expect(ended.tree.edges.find((e) => e.from === 'i' && e.to === 'o')).toMatchObject({ label: 'Ended by adjudication', actual: true });
  });

  it('draws the actual, equilibrium and counterfactual lines as one small tree', () => {
    const edge = (from: string, to: string) => review.tree.edges.find((e) => e.from === from && e.to === to);
    expect(edge('c', 'i')).toMatchObject({ actual: true, equilibrium: true });
    expect(edge('i', 'if')).toMatchObject({ actual: true, equilibrium: false });
    expect(edge('i', 'ia')).toMatchObject({ actual: false, equilibrium: true, counterfactual: true });
    expect(edge('c', 'o')).toBeUndefined();
    expect(review.tree.nodes.find((n) => n.id === 'if')).toMatchObject({ kind: 'terminal', label: 'Price war', payoffs: [0, 0] });
  });
});

describe('review of a ladder with a chance node (hand-made check, no source)', () => {
  it('tracks the escalation level step by step against the equilibrium, carrying rungs over chance draws', () => {
    const review = reviewPlay(LADDER, playRecord(LADDER, [['b', 'Raise'], ['w', 'Calm'], ['r', 'Match']]));
    // Red: Back down (-1) beats Match (-2); Blue: Raise (1/4 * 0 + 3/4 * 3 = 2.25) beats Hold (1).
    expect(review.equilibrium.end.path).toEqual(['Raise', 'Calm', 'Back down']);
    expect(review.escalation.map((p) => [p.turn, p.actual, p.equilibrium])).toEqual([
      [1, 2, 2],
      [2, 2, 2],
      [3, 4, 2],
    ]);
    expect(review.escalation[2]).toMatchObject({ actualRung: 'Harbour closure', equilibriumRung: 'Patrol' });
    const chance = review.moves[1]!;
    expect(chance).toMatchObject({ mover: 'Chance', teamId: null, regret: null, deviated: false, equilibriumAction: null });
    expect(review.moves[2]).toMatchObject({ deviated: true, regret: 1, rung: { name: 'Harbour closure' }, equilibriumRung: { name: 'Patrol' } });
    expect(review.regret).toHaveLength(2);
  });

  it('follows the storm that was actually drawn when it lays the equilibrium path', () => {
    const review = reviewPlay(LADDER, playRecord(LADDER, [['b', 'Raise'], ['w', 'Storm']]));
    expect(review.equilibrium.end).toMatchObject({ nodeId: 'w.storm', path: ['Raise', 'Storm'] });
    expect(review.counterfactuals).toEqual([]);
  });

  it('reports where play stands while the exercise is under way', () => {
    const review = reviewPlay(LADDER, playRecord(LADDER, [['b', 'Raise']], { state: 'live', endedAt: null }));
    expect(review.actual).toMatchObject({ nodeId: 'w', terminal: false, outcome: null, payoffs: [], rung: { name: 'Patrol' } });
    expect(review.escalation.map((p) => p.actual)).toEqual([2, null, null]);
  });

  it('places observer notes and injects on the timeline in time order', () => {
    const record = playRecord(LADDER, [['b', 'Raise'], ['w', 'Calm']], {
      notes: [{ id: 'o1', turn: 1, moveId: 'm1', tags: ['signal'], text: 'Blue read the protest as weak', authorName: 'Observer', at: '2026-01-05T09:05:00.000Z' }],
      injects: [{ id: 'i1', turn: 2, title: 'Port report', body: 'Fog', to: 'all', at: '2026-01-05T09:12:00.000Z' }],
    });
    const review = reviewPlay(LADDER, record);
    expect(review.timeline.map((e) => e.kind)).toEqual(['move', 'note', 'move', 'inject']);
  });

  it('refuses a record that does not follow the tree, naming the move and the node', () => {
    expect(() => reviewPlay(LADDER, playRecord(LADDER, [['r', 'Match']]))).toThrow(PlayMismatch);
    expect(() => reviewPlay(LADDER, playRecord(LADDER, [['r', 'Match']]))).toThrow(/Move m1 \(turn 1\) was made at node "r", which is not where play stood \(expected "b"\)/);
    const bad = playRecord(LADDER, [['b', 'Raise']]);
    bad.moves[0]!.label = 'Invade';
    expect(() => reviewPlay(LADDER, bad)).toThrow(/chose "Invade", which node "b" does not offer/);
  });
});

describe('the equilibrium count of a review (hand-made checks, no source)', () => {
  it('says nothing when the equilibrium is unique', () => {
    const review = reviewPlay(LADDER, playRecord(LADDER, [['b', 'Hold']]));
    expect(review.equilibrium).toMatchObject({ count: 1, plays: 1, distinctPayoffs: 1 });
    expect(equilibriumCountSentence(review.equilibrium)).toBeNull();
  });

  it('leads with the one play when a tie lies off the path', () => {
    // Red is tied (-1 = -1) but Blue holds for 3 whatever Red would do: 2 profiles, 1 play.
    const game = ladderVariant({ hold: [3, 1], match: [-2, -1] });
    const review = reviewPlay(game, playRecord(game, [['b', 'Hold']]));
    expect(review.equilibrium).toMatchObject({ count: 2, countExact: true, plays: 1, playsExact: true, distinctPayoffs: 1 });
    expect(equilibriumCountSentence(review.equilibrium)).toBe('The scenario has one equilibrium play (2 strategy profiles that differ only at moves off the path).');
  });

  it('counts two plays with different payoffs when the tie decides the path', () => {
    // Red tied: if Red backs down Blue raises (3/4 x 3 = 9/4 > 1), if Red matches Blue holds.
    const game = ladderVariant({ hold: [1, 1], match: [-2, -1] });
    const review = reviewPlay(game, playRecord(game, [['b', 'Hold']]));
    expect(review.equilibrium).toMatchObject({ count: 2, plays: 2, distinctPayoffs: 2 });
    expect(equilibriumCountSentence(review.equilibrium)).toBe(
      'The scenario has 2 distinct equilibrium plays, with 2 different expected payoffs for the teams; the comparison uses the first.',
    );
  });
});

