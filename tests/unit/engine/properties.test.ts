/**
 * Property tests on random games (fast-check): the one-shot deviation principle holds at
 * every node of every reported equilibrium, exact and float modes agree, the counts of
 * pure subgame-perfect equilibria and of their distinct plays match brute force (also
 * through the subgame roll-up), support enumeration results meet the best-response
 * conditions, and Lemke's sequence-form result is a Nash equilibrium.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  actionValues,
  backwardInduction,
  indexGame,
  PLAY_PAYOFFS_LISTED,
  solveFlat,
  solveSubgamePerfect,
  supportEnumeration,
  type BimatrixGame,
  type Game,
  type GameNode,
} from '../../../src/lib/engine';
import { compiledGame } from '../../../src/lib/engine/compile';
import { Fraction, exactField, floatField, toExact } from '../../../src/lib/engine/numbers';
import { reducedValues } from '../../../src/lib/engine/reduced';
import { solveFlatWith } from '../../../src/lib/engine/solvers/backward-induction';
import { bestResponseValue } from '../../../src/lib/engine/solvers/pure-enumeration';
import { sequenceFormEquilibrium } from '../../../src/lib/engine/solvers/sequence-form';
import { numbersOf } from '../../../src/lib/engine/profile';
import { bruteForceEquilibria, plain, wholeGame } from './helpers';

const TEAMS = ['A', 'B', 'C'];

type Plain = { payoffs: number[] } | { team: string; actions: { label: string; next: Plain }[] } | { chance: { label: string; p: string; next: Plain }[] };

function leaf(teams: number) {
  return fc.array(fc.integer({ min: -3, max: 3 }), { minLength: teams, maxLength: teams }).map((payoffs): Plain => ({ payoffs }));
}

/** Random perfect-information trees with chance nodes; small integer payoffs make ties common. */
function tree(teams: number, depth: number): fc.Arbitrary<Plain> {
  if (depth === 0) return leaf(teams);
  const child = tree(teams, depth - 1);
  const decision = fc
    .record({ team: fc.integer({ min: 0, max: teams - 1 }), children: fc.array(child, { minLength: 1, maxLength: 3 }) })
    .map(({ team, children }): Plain => ({ team: TEAMS[team]!, actions: children.map((next, k) => ({ label: `a${k}`, next })) }));
  // Weights from 0: an outcome of probability zero is never reached.
  const chance = fc.array(fc.tuple(fc.integer({ min: 0, max: 4 }), child), { minLength: 1, maxLength: 3 }).map((outcomes): Plain => {
    const weights = outcomes.map(([w], k) => (k === 0 ? Math.max(w, 1) : w));
    const total = weights.reduce((s, w) => s + w, 0);
    return { chance: outcomes.map(([, next], k) => ({ label: `c${k}`, p: `${weights[k]}/${total}`, next })) };
  });
  return fc.oneof({ weight: 1, arbitrary: leaf(teams) }, { weight: 3, arbitrary: decision }, { weight: 1, arbitrary: chance });
}

const trees = fc.integer({ min: 2, max: 3 }).chain((teams) => tree(teams, 4).map((root) => ({ teams: TEAMS.slice(0, teams), root })));
const games = trees.map(({ teams, root }) => plain(teams, root));

function decisionNodes(game: Game): GameNode[] {
  return indexGame(game).nodes.filter((n) => n.kind === 'decision');
}

/** Number of pure strategy profiles: the product of the action counts of the decision nodes. */
function profileCount(game: Game): number {
  return (decisionNodes(game) as Extract<GameNode, { kind: 'decision' }>[]).reduce((n, d) => n * d.actions.length, 1);
}

describe('backward induction on random perfect-information trees', () => {
  it('every listed equilibrium passes the one-shot deviation test at every decision node', () => {
    fc.assert(
      fc.property(games, (game) => {
        const result = backwardInduction(game, { exact: true, maxListed: 6 });
        for (const eq of result.equilibria) {
          for (const node of decisionNodes(game)) {
            const { actions, equilibriumAction } = actionValues(game, eq, node.id);
            const m = game.teams.findIndex((t) => t.id === (node as { team: string }).team);
            const chosen = toExact(actions.find((a) => a.label === equilibriumAction)!.valuesExact![m]!);
            for (const a of actions) expect(toExact(a.valuesExact![m]!).compare(chosen)).toBeLessThanOrEqual(0);
          }
        }
      }),
      { numRuns: 150 },
    );
  });

  it('exact and float modes agree', () => {
    fc.assert(
      fc.property(games, (game) => {
        const exact = backwardInduction(game, { exact: true, maxListed: 3 });
        const float = backwardInduction(game, { maxListed: 3 });
        expect(float.count).toBe(exact.count);
        expect(float.equilibria.map((e) => e.choices)).toEqual(exact.equilibria.map((e) => e.choices));
        float.equilibria[0]!.payoffs.forEach((v, t) => expect(v).toBeCloseTo(exact.equilibria[0]!.payoffs[t]!, 9));
        const flat = compiledGame(game);
        const kernel = solveFlat(flat);
        const generic = solveFlatWith(flat, exactField, numbersOf(flat, exactField));
        kernel.value.forEach((v, k) => expect(v).toBeCloseTo(generic.value[k]!.valueOf(), 9));
      }),
      { numRuns: 150 },
    );
  });

  it('counts exactly the pure strategy profiles that are subgame perfect (brute force on small trees)', () => {
    fc.assert(
      fc.property(games, (game) => {
        fc.pre(profileCount(game) <= 2048);
        expect(backwardInduction(game, { exact: true }).count).toBe(bruteForceEquilibria(game).length);
      }),
      { numRuns: 150 },
    );
  });

  it('counts exactly the distinct plays and their distinct payoffs, in both modes (brute force on small trees)', () => {
    fc.assert(
      fc.property(games, (game) => {
        fc.pre(profileCount(game) <= 2048);
        const profiles = bruteForceEquilibria(game);
        const plays = new Set(profiles.map((p) => p.play));
        const payoffs = new Set(profiles.map((p) => p.payoffs.join(',')));
        for (const exact of [true, false]) {
          const result = backwardInduction(game, { exact, maxListed: 1 });
          expect(result.plays).toBe(plays.size);
          expect(result.playsExact).toBe(true);
          expect(result.distinctPayoffs).toBe(payoffs.size);
          expect(result.playPayoffs).toHaveLength(Math.min(payoffs.size, PLAY_PAYOFFS_LISTED));
          if (payoffs.size <= PLAY_PAYOFFS_LISTED) expect(result.playPayoffs.reduce((n, p) => n + p.plays, 0)).toBe(plays.size);
        }
        const exact = backwardInduction(game, { exact: true, maxListed: 1 });
        for (const p of exact.playPayoffs) {
          const key = p.payoffsExact!.join(',');
          expect(p.plays).toBe(new Set(profiles.filter((q) => q.payoffs.join(',') === key).map((q) => q.play)).size);
        }
        expect(exact.playPayoffs[0]!.payoffsExact).toEqual(exact.equilibria[0]!.payoffsExact);
      }),
      { numRuns: 200 },
    );
  });

  it('the subgame roll-up counts the same plays when an unreached simultaneous stage makes the game imperfect', () => {
    fc.assert(
      fc.property(trees, ({ teams, root }) => {
        const game = plain(teams, root);
        fc.pre(profileCount(game) <= 2048);
        const profiles = bruteForceEquilibria(game);
        // A takes the random tree (worth at least -3 to A) over a stage worth at most -100
        // to A, with one equilibrium (Hold, Push) by strict dominance: the stage is off the path.
        const worth = (a: number) => teams.map((_, t) => (t === 0 ? -100 - a : a));
        const stage = {
          team: 'A',
          actions: ['Hold', 'Push'].map((r, i) => ({
            label: r,
            next: { team: 'B', infoset: 'stage', actions: ['Hold', 'Push'].map((c, j) => ({ label: c, next: { payoffs: worth(i + 2 * j) } })) },
          })),
        };
        const wrapped = plain(teams, { team: 'A', actions: [{ label: 'Tree', next: root }, { label: 'Stage', next: stage }] });
        const result = solveSubgamePerfect(wrapped, { exact: true });
        expect(result.method).toMatch(/roll-up/);
        expect(result.count).toBe(profiles.length);
        expect(result.plays).toBe(new Set(profiles.map((p) => p.play)).size);
        expect(result.playsExact).toBe(true);
        expect(result.distinctPayoffs).toBe(new Set(profiles.map((p) => p.payoffs.join(','))).size);
      }),
      { numRuns: 100 },
    );
  });
});

const matrix = (m: number, n: number, range: number) =>
  fc.array(fc.array(fc.integer({ min: -range, max: range }), { minLength: n, maxLength: n }), { minLength: m, maxLength: m });

const bimatrices = (range: number) =>
  fc.tuple(fc.integer({ min: 1, max: 4 }), fc.integer({ min: 1, max: 4 })).chain(([m, n]) => fc.tuple(matrix(m, n, range), matrix(m, n, range)));

describe('support enumeration on random bimatrix stages', () => {
  it('every equilibrium meets the best-response conditions exactly', () => {
    fc.assert(
      fc.property(bimatrices(3), ([A, B]) => {
        const result = supportEnumeration({ rowLabels: A.map((_, i) => `${i}`), colLabels: A[0]!.map((_, j) => `${j}`), rowPayoff: A, colPayoff: B });
        expect(result.equilibria.length).toBeGreaterThan(0);
        for (const e of result.equilibria) {
          const x = e.rowExact!.map(toExact);
          const y = e.colExact!.map(toExact);
          const sum = (v: Fraction[]) => v.reduce((s, p) => s.add(p), new Fraction(0));
          expect(sum(x).equals(1) && sum(y).equals(1)).toBe(true);
          expect([...x, ...y].every((p) => p.compare(0) >= 0)).toBe(true);
          const rowValues = A.map((row) => row.reduce((s, a, j) => s.add(y[j]!.mul(a)), new Fraction(0)));
          const colValues = A[0]!.map((_, j) => B.reduce((s, row, i) => s.add(x[i]!.mul(row[j]!)), new Fraction(0)));
          const best = (v: Fraction[]) => v.reduce((m, p) => (p.compare(m) > 0 ? p : m));
          x.forEach((p, i) => p.compare(0) > 0 && expect(rowValues[i]!.equals(best(rowValues))).toBe(true));
          y.forEach((p, j) => p.compare(0) > 0 && expect(colValues[j]!.equals(best(colValues))).toBe(true));
          expect(e.payoffsExact).toEqual([best(rowValues).toFraction(), best(colValues).toFraction()]);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('finds an odd number of equilibria in nondegenerate games (Wilson, SIAM J. Applied Math. 21, 1971)', () => {
    fc.assert(
      fc.property(bimatrices(1000), ([A, B]) => {
        const result = supportEnumeration({ rowLabels: A.map((_, i) => `${i}`), colLabels: A[0]!.map((_, j) => `${j}`), rowPayoff: A, colPayoff: B });
        fc.pre(!result.degenerate);
        expect(result.equilibria.length % 2).toBe(1);
      }),
      { numRuns: 200 },
    );
  });

  it('finds at least one equilibrium (Nash 1951) in floats and exactly when payoffs differ by a hair, where a mix may put 1e-10 on a move', () => {
    // One payoff of an integer stage nudged by 1e-12 to 1e-6: the stages that payoff
    // intervals and Monte Carlo samples meet next to a tie.
    const nudged = fc.tuple(bimatrices(3), fc.nat(), fc.nat(), fc.boolean(), fc.double({ min: -6, max: -1, noNaN: true }), fc.boolean());
    fc.assert(
      fc.property(nudged, ([[A0, B0], i, j, onRow, exponent, up]) => {
        const [A, B] = [A0.map((row) => [...row]), B0.map((row) => [...row])];
        const [P, r, c] = [onRow ? A : B, i % A.length, j % A[0]!.length];
        P[r]![c]! += (up ? 1 : -1) * 10 ** (exponent * 2);
        const stage = { rowLabels: A.map((_, k) => `${k}`), colLabels: A[0]!.map((_, k) => `${k}`), rowPayoff: A, colPayoff: B };
        for (const exact of [false, true]) {
          const { equilibria } = supportEnumeration(stage, { exact });
          expect(equilibria.length).toBeGreaterThan(0);
          for (const e of equilibria) {
            const rowValues = A.map((row) => row.reduce((s, a, k) => s + a * e.col[k]!, 0));
            const colValues = A[0]!.map((_, k) => B.reduce((s, row, h) => s + row[k]! * e.row[h]!, 0));
            e.row.forEach((p, h) => p > 0 && expect(rowValues[h]!).toBeGreaterThan(Math.max(...rowValues) - 1e-8));
            e.col.forEach((p, k) => p > 0 && expect(colValues[k]!).toBeGreaterThan(Math.max(...colValues) - 1e-8));
          }
        }
      }),
      { numRuns: 300 },
    );
  });

  it('keeps a mixed equilibrium a hair from a pure strategy, which the float pass rounds onto it (worked by hand)', () => {
    const exactOf = (stage: BimatrixGame) => supportEnumeration(stage).equilibria.map((e) => [e.rowExact, e.colExact]);
    // Row indifference: (1 - y)(-3 + 2e-10) = y - 3(1 - y), so y = 2e-10 / (1 + 2e-10) = 1 / 5,000,000,001,
    // which is 0 at the 9 decimals the float pass compares; column indifference: 3x = 2(1 - x).
    const cycle = { rowLabels: ['a', 'b'], colLabels: ['c', 'd'], rowPayoff: [[0, '-2.9999999998'], [1, -3]], colPayoff: [[3, 0], [-2, 0]] };
    expect(exactOf(cycle)).toEqual([[['2/5', '3/5'], ['1/5000000001', '5000000000/5000000001']]]);
    // Column indifference at q = 1/2: with x = (a, 0, 1 - a), 1 + a = (1 + 1e-12)(1 - a), so
    // a = 1e-12 / (2 + 1e-12) = 1 / 2,000,000,000,001, under the 1e-12 at which floats are taken for 0;
    // with x = (0, b, 1 - b) the same b. The two extreme equilibria span the equilibrium set.
    const shelf = {
      rowLabels: ['a', 'b', 'c'],
      colLabels: ['d', 'e'],
      rowPayoff: [[0, 0], [0, 0], [1, -1]],
      colPayoff: [[2, 0], [1, -1], [1, '1.000000000001']],
    };
    expect(exactOf(shelf)).toEqual([
      [['1/2000000000001', '0', '2000000000000/2000000000001'], ['1/2', '1/2']],
      [['0', '1/2000000000001', '2000000000000/2000000000001'], ['1/2', '1/2']],
    ]);
  });

  it('finds the one mixed equilibrium of a stage whose column mix is 13 in 14,166,500,013 (worked by hand)', () => {
    // Row indifference: 2(1 - y) = 2.8333 y + 1.9999999974 (1 - y), so y = 2.6e-9 / 2.8333000026;
    // column indifference: 0 = -x + 0.1667 (1 - x), so x = 1667 / 11667.
    const stage = { rowLabels: ['a', 'b'], colLabels: ['c', 'd'], rowPayoff: [[0, 2], [2.8333, 1.9999999974]], colPayoff: [[0, -1], [0, 0.1667]] };
    expect(supportEnumeration(stage).equilibria.map((e) => [e.rowExact, e.colExact])).toEqual([[['1667/11667', '10000/11667'], ['13/14166500013', '14166500000/14166500013']]]);
    const [float] = supportEnumeration(stage, { exact: false }).equilibria;
    expect(float!.col[0]).toBeCloseTo(13 / 14166500013, 15);
  });
});

/** Two-team games where the second mover cannot see the first move (and chance may intervene). */
const hiddenMoveGames = fc
  .record({
    first: fc.integer({ min: 2, max: 3 }),
    second: fc.integer({ min: 2, max: 3 }),
    chanceAfter: fc.array(fc.boolean(), { minLength: 3, maxLength: 3 }),
    payoffs: fc.array(fc.integer({ min: -5, max: 5 }), { minLength: 36, maxLength: 36 }),
  })
  .map(({ first, second, chanceAfter, payoffs }) => {
    let k = 0;
    const pay = () => ({ payoffs: [payoffs[k++ % 36]!, payoffs[k++ % 36]!] });
    const responder = () => ({ team: 'B', infoset: 'hidden', actions: Array.from({ length: second }, (_, j) => ({ label: `b${j}`, next: pay() })) });
    return plain(['A', 'B'], {
      team: 'A',
      actions: Array.from({ length: first }, (_, i) => ({
        label: `a${i}`,
        next: chanceAfter[i]
          ? { chance: [{ label: 'seen', p: '1/3', next: pay() }, { label: 'unseen', p: '2/3', next: responder() }] }
          : responder(),
      })),
    });
  });

describe("Lemke's algorithm on the sequence form", () => {
  it('returns a Nash equilibrium of random two-team games with imperfect information', () => {
    fc.assert(
      fc.property(hiddenMoveGames, (game) => {
        for (const field of [exactField, floatField] as const) {
          const reduced = wholeGame(game, field as typeof exactField);
          const solution = sequenceFormEquilibrium(field as typeof exactField, reduced);
          const value = reducedValues(field as typeof exactField, reduced, solution.profile)[0]!;
          for (const team of [0, 1]) {
            const best = bestResponseValue(field as typeof exactField, reduced, solution.profile, team);
            if (field.exact) expect(best.compare(value[team]!)).toBeLessThanOrEqual(0);
            else expect(Number(best) - Number(value[team])).toBeLessThan(1e-7);
          }
        }
      }),
      { numRuns: 150 },
    );
  });
});
