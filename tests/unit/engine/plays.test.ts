/**
 * Distinct equilibrium plays beside the count of strategy profiles, on small trees whose
 * numbers are worked out by hand in each test. A play is what happens at the nodes
 * reached with positive probability; profiles that differ only elsewhere are one play.
 */
import { describe, expect, it } from 'vitest';
import { backwardInduction, equilibriumCountWords, reachesNode, solveSubgamePerfect, type Game } from '../../../src/lib/engine';
import { scenarioGame } from '../../../src/lib/scenario';
import { plain } from './helpers';
import { demoScenario } from '../../../server/seed/demo-scenario';

const leaf = (payoffs: (number | string)[]) => ({ payoffs });
const choose = (team: string, actions: [string, unknown][], infoset?: string) => ({
  team,
  ...(infoset ? { infoset } : {}),
  actions: actions.map(([label, next]) => ({ label, next })),
});
const chance = (outcomes: [string, string, unknown][]) => ({ chance: outcomes.map(([label, p, next]) => ({ label, p, next })) });

function counts(game: Game) {
  const results = [true, false].map((exact) => solveSubgamePerfect(game, { exact, maxListed: 20 }));
  // Exact and float arithmetic count alike.
  expect(results[1]).toMatchObject({ count: results[0]!.count, plays: results[0]!.plays, distinctPayoffs: results[0]!.distinctPayoffs });
  const { count, countExact, plays, playsExact, distinctPayoffs } = results[0]!;
  return { count, countExact, plays, playsExact, distinctPayoffs, result: results[0]! };
}

describe('distinct equilibrium plays in perfect information', () => {
  it('a tie off the path doubles the profiles, not the plays', () => {
    // A gets 3 from Left and at most 1 from Right, so Right is never reached; B's tie
    // there (1 = 1) gives 2 profiles, both playing Left: 1 play.
    const game = plain(['A', 'B'], choose('A', [['Left', leaf([3, 0])], ['Right', choose('B', [['x', leaf([0, 1])], ['y', leaf([1, 1])]])]]));
    expect(counts(game)).toMatchObject({ count: 2, countExact: true, plays: 1, playsExact: true, distinctPayoffs: 1 });
    expect(equilibriumCountWords(counts(game))).toBe('One equilibrium play (2 strategy profiles that differ only at moves off the path)');
  });

  it('a tie on the path doubles both, with different payoffs when the tied moves differ for others', () => {
    // A takes Left (worth 1 or 2 to A, against 0); there B is tied (1 = 1): x gives A 1,
    // y gives A 2. 2 profiles, 2 plays, 2 payoff vectors: (1, 1) and (2, 1).
    const game = plain(['A', 'B'], choose('A', [['Left', choose('B', [['x', leaf([1, 1])], ['y', leaf([2, 1])]])], ['Right', leaf([0, 0])]]));
    const c = counts(game);
    expect(c).toMatchObject({ count: 2, plays: 2, playsExact: true, distinctPayoffs: 2 });
    expect(c.result.playPayoffs.map((p) => [p.payoffsExact, p.plays])).toEqual([
      [['1', '1'], 1],
      [['2', '1'], 1],
    ]);
    expect(equilibriumCountWords(c)).toBe('2 distinct equilibrium plays, with 2 different expected payoffs for the teams');
  });

  it('a tie on the path between equal outcomes gives two plays with the same payoffs', () => {
    const game = plain(['A', 'B'], choose('A', [['Left', choose('B', [['x', leaf([1, 1])], ['y', leaf([1, 1])]])], ['Right', leaf([0, 0])]]));
    const c = counts(game);
    expect(c).toMatchObject({ count: 2, plays: 2, distinctPayoffs: 1 });
    expect(c.result.playPayoffs).toEqual([{ payoffs: [1, 1], payoffsExact: ['1', '1'], plays: 2 }]);
    expect(equilibriumCountWords(c)).toBe('2 distinct equilibrium plays, all with the same expected payoffs for every team');
  });

  it('a chance node multiplies the plays of its branches', () => {
    // Each of two equally likely branches holds B's tie between x (A gets 0) and y (A
    // gets 2): 2 x 2 = 4 profiles and 4 plays. A's expected payoff is 0, 1, 1 or 2, so
    // 3 payoff vectors, (1, 1) reached by 2 plays.
    const tie = () => choose('B', [['x', leaf([0, 1])], ['y', leaf([2, 1])]]);
    const game = plain(['A', 'B'], chance([['Calm', '1/2', tie()], ['Storm', '1/2', tie()]]));
    const c = counts(game);
    expect(c).toMatchObject({ count: 4, plays: 4, distinctPayoffs: 3 });
    expect(Object.fromEntries(c.result.playPayoffs.map((p) => [p.payoffsExact!.join(','), p.plays]))).toEqual({ '0,1': 1, '1,1': 2, '2,1': 1 });
  });

  it('a chance outcome of probability zero is off the path', () => {
    // The tie sits behind an outcome of probability 0: 2 profiles, 1 play.
    const game = plain(['A', 'B'], chance([['Calm', '1', leaf([1, 1])], ['Storm', '0', choose('B', [['x', leaf([0, 1])], ['y', leaf([2, 1])]])]]));
    expect(counts(game)).toMatchObject({ count: 2, plays: 1, distinctPayoffs: 1 });
  });

  it('ties on and off the path: the off-path one multiplies only the profiles', () => {
    // On the path B is tied between x and y (2 plays); off the path (Right, worth -5 to
    // A) C is tied three ways. 2 x 3 = 6 profiles, 2 plays.
    const game = plain(
      ['A', 'B', 'C'],
      choose('A', [
        ['Left', choose('B', [['x', leaf([1, 1, 0])], ['y', leaf([2, 1, 0])]])],
        ['Right', choose('C', [['p', leaf([-5, 0, 1])], ['q', leaf([-6, 0, 1])], ['r', leaf([-7, 0, 1])]])],
      ]),
    );
    expect(counts(game)).toMatchObject({ count: 6, plays: 2, distinctPayoffs: 2 });
  });

  it('what happens off the path can widen the choice on it', () => {
    // Right leads to B, tied between x (A gets 1) and y (A gets 0); Left gives A 1.
    // Subgame-perfect profiles: (Left, x), (Right, x) where A is tied, and (Left, y):
    // 3 profiles. (Left, x) and (Left, y) play alike: 2 plays, worth (1, 0) and (1, 5).
    const game = plain(['A', 'B'], choose('A', [['Left', leaf([1, 0])], ['Right', choose('B', [['x', leaf([1, 5])], ['y', leaf([0, 5])]])]]));
    const c = counts(game);
    expect(c).toMatchObject({ count: 3, plays: 2, distinctPayoffs: 2 });
    expect(equilibriumCountWords(c)).toBe('2 distinct equilibrium plays, with 2 different expected payoffs for the teams (3 strategy profiles)');
    const bi = backwardInduction(game, { exact: true });
    expect(bi).toMatchObject({ count: 3, plays: 2, playsExact: true, distinctPayoffs: 2 });
  });

  it('the payoffs of the first listed equilibrium come first', () => {
    const game = plain(['A', 'B'], choose('A', [['Left', choose('B', [['x', leaf([2, 1])], ['y', leaf([1, 1])]])], ['Right', leaf([0, 0])]]));
    const { result } = counts(game);
    expect(result.playPayoffs[0]!.payoffs).toEqual(result.equilibria[0]!.payoffs);
  });
});

/** Battle of the sexes: equilibria (Opera, Opera) worth (2, 1), (Fight, Fight) worth (1, 2), and a mixed one worth (2/3, 2/3). */
const battle = (infoset: string) =>
  choose(
    'A',
    ['Opera', 'Fight'].map((r, i) => [r, choose('B', ['Opera', 'Fight'].map((c, j) => [c, leaf(i === j ? (i === 0 ? [2, 1] : [1, 2]) : [0, 0])]), infoset)]),
  );

describe('distinct equilibrium plays through the subgame roll-up', () => {
  it('a simultaneous stage on the path: each of its equilibria is a play', () => {
    // A takes the stage (worth at least 2/3 to A) over -10: 3 profiles, 3 plays, 3 payoff vectors.
    const game = plain(['A', 'B'], choose('A', [['Meet', battle('s')], ['Walk away', leaf([-10, 0])]]));
    expect(counts(game)).toMatchObject({ count: 3, plays: 3, playsExact: true, distinctPayoffs: 3 });
  });

  it('a simultaneous stage off the path: its equilibria multiply only the profiles', () => {
    const game = plain(['A', 'B'], choose('A', [['Walk away', leaf([10, 0])], ['Meet', battle('s')]]));
    expect(counts(game)).toMatchObject({ count: 3, plays: 1, playsExact: true, distinctPayoffs: 1 });
  });

  it('a stage that does not reach a nested tie makes one play of the profiles that differ there', () => {
    // A prisoners' dilemma: Defect is strictly dominant for both, so only (Defect, Defect)
    // is played. Behind (Cooperate, Cooperate) B is tied between (3, 3) and (4, 3); with
    // either, the stage keeps its one equilibrium. 2 profiles, 1 play.
    const cell = (i: number, j: number) =>
      i === 0 && j === 0 ? choose('B', [['x', leaf([3, 3])], ['y', leaf([4, 3])]]) : leaf(i === 1 && j === 1 ? [1, 1] : i === 1 ? [5, 0] : [0, 5]);
    const game = plain(
      ['A', 'B'],
      choose(
        'A',
        ['Cooperate', 'Defect'].map((r, i) => [r, choose('B', ['Cooperate', 'Defect'].map((c, j) => [c, cell(i, j)]), 'pd')]),
      ),
    );
    const c = counts(game);
    expect(c).toMatchObject({ count: 2, plays: 1, playsExact: true, distinctPayoffs: 1 });
    expect(c.result.stages).toMatchObject({ simultaneous: 1 });
  });

  it('a continuum of equilibria on the path makes the count of plays a lower bound', () => {
    // A is best off with Top whatever B does, and B is indifferent: (Top, any mix) are
    // all equilibria, a continuum between the extreme (Top, Left) and (Top, Right).
    const stage = (infoset: string) =>
      choose('A', [
        ['Top', choose('B', [['Left', leaf([1, 1])], ['Right', leaf([1, 1])]], infoset)],
        ['Bottom', choose('B', [['Left', leaf([0, 0])], ['Right', leaf([0, 0])]], infoset)],
      ]);
    const onPath = counts(plain(['A', 'B'], stage('s')));
    expect(onPath).toMatchObject({ count: 2, plays: 2, playsExact: false });
    expect(onPath.result.continua).toBe(true);
    expect(equilibriumCountWords(onPath)).toBe('At least 2 distinct equilibrium plays, all those found with the same expected payoffs (2 strategy profiles)');

    const offPath = counts(plain(['A', 'B'], choose('A', [['Out', leaf([5, 5])], ['In', stage('s')]])));
    expect(offPath).toMatchObject({ count: 2, plays: 1, playsExact: true });
    expect(offPath.result.continua).toBe(true);
  });
});

describe('the demo scenario', () => {
  const demo = scenarioGame(demoScenario());

  it('has one equilibrium play although ties off the path make many strategy profiles (a regression figure of our own)', () => {
    const result = solveSubgamePerfect(demo);
    expect(result).toMatchObject({ count: 294912, countExact: true, plays: 1, playsExact: true, distinctPayoffs: 1 });
    expect(result.playPayoffs[0]!.payoffs).toEqual(result.equilibria[0]!.payoffs);
    expect(equilibriumCountWords(result)).toBe('One equilibrium play (294,912 strategy profiles that differ only at moves off the path)');
  });
});

describe('reachesNode', () => {
  it('tells nodes on the equilibrium play, every chance branch included, from those off it', () => {
    const game = plain(['A', 'B'], choose('A', [['Left', chance([['Calm', '1/2', leaf([1, 0])], ['Storm', '1/2', leaf([2, 0])]])], ['Right', leaf([0, 0])]]));
    const eq = solveSubgamePerfect(game).equilibria[0]!;
    const left = game.root.kind === 'decision' ? game.root.actions : [];
    const calm = left[0]!.next.kind === 'chance' ? left[0]!.next.outcomes : [];
    expect(reachesNode(game, eq, game.root.id)).toBe(true);
    expect(reachesNode(game, eq, calm[1]!.next.id)).toBe(true);
    expect(reachesNode(game, eq, left[1]!.next.id)).toBe(false);
  });
});
