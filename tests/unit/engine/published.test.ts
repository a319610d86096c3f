/**
 * Checks against published and textbook results. The source of each is named beside it;
 * values that follow from a short derivation are derived in the test.
 */
import { describe, expect, it } from 'vitest';
import {
  EWL_C,
  EWL_D,
  EWL_Q,
  assessMarks,
  backwardInduction,
  ewlCurves,
  ewlEquilibria,
  ewlOutcome,
  logitQre,
  quarterLaw,
  solveSubgamePerfect,
  supportEnumeration,
  type TwoByTwo,
} from '../../../src/lib/engine';
import { compiledGame } from '../../../src/lib/engine/compile';
import { exactField } from '../../../src/lib/engine/numbers';
import { bestResponseValue } from '../../../src/lib/engine/solvers/pure-enumeration';
import { reducedValues } from '../../../src/lib/engine/reduced';
import { plain, simultaneous, wholeGame } from './helpers';

const bimatrix = (rowPayoff: number[][], colPayoff: number[][]) => ({
  rowLabels: rowPayoff.map((_, i) => `r${i}`),
  colLabels: rowPayoff[0]!.map((_, j) => `c${j}`),
  rowPayoff,
  colPayoff,
});

describe("Prisoner's Dilemma, 5 years the maximum sentence, payoffs as years saved", () => {
  // Textbook Prisoner's Dilemma (e.g. Osborne, An Introduction to Game Theory, 2004, ch. 2):
  // both silent 2 years each, both testify 4 each, lone testifier free and the other 5 years.
  // Years saved out of 5: (3,3), (0,5), (5,0), (1,1).
  const pd = simultaneous(['A', 'B'], ['Silent', 'Testify'], ['Silent', 'Testify'], [
    [[3, 3], [0, 5]],
    [[5, 0], [1, 1]],
  ]);

  it('has mutual testimony (defection) as its only equilibrium', () => {
    const result = solveSubgamePerfect(pd, { exact: true, maxListed: 10 });
    expect(result.count).toBe(1);
    expect(result.equilibria[0]!.path).toEqual(['Testify', 'Testify']);
    expect(result.equilibria[0]!.payoffsExact).toEqual(['1', '1']);
    const stage = supportEnumeration(bimatrix([[3, 0], [5, 1]], [[3, 5], [0, 1]]));
    expect(stage.equilibria.map((e) => [e.rowExact, e.colExact])).toEqual([[['0', '1'], ['0', '1']]]);
  });
});

describe('Entry deterrence (Selten, "The chain store paradox", Theory and Decision 9, 1978)', () => {
  const entry = plain(['Entrant', 'Incumbent'], {
    team: 'Entrant',
    actions: [
      { label: 'Stay out', next: { payoffs: [0, 2] } },
      { label: 'Enter', next: { team: 'Incumbent', actions: [{ label: 'Fight', next: { payoffs: [-1, -1] } }, { label: 'Accommodate', next: { payoffs: [1, 1] } }] } },
    ],
  });

  it('enter and accommodate is the subgame-perfect equilibrium', () => {
    const result = backwardInduction(entry, { exact: true, maxListed: 5 });
    expect(result.count).toBe(1);
    expect(result.equilibria[0]!.path).toEqual(['Enter', 'Accommodate']);
    expect(result.decisions['n.enter']).toMatchObject({ chosen: 'Accommodate', marginExact: '2' });
  });

  it('stay out and fight is a Nash equilibrium but not subgame perfect: the threat to fight is not credible', () => {
    const game = wholeGame(entry, exactField);
    const one = exactField.one;
    const zero = exactField.zero;
    const flat = compiledGame(entry);
    // Information sets in compiled order: the entrant's (root) first, then the incumbent's.
    const profile = new Map([
      [flat.aux[0]!, [one, zero]],
      [flat.aux[flat.childStart[0]! + 1]!, [one, zero]],
    ]);
    const value = reducedValues(exactField, game, profile)[0]!;
    expect(value.map((v) => v.toFraction())).toEqual(['0', '2']);
    for (const team of [0, 1]) expect(bestResponseValue(exactField, game, profile, team).equals(value[team]!)).toBe(true);
    const [verdict] = assessMarks(entry, [{ nodeId: 'n.enter', action: 'Fight', kind: 'threat' }], { exact: true });
    expect(verdict).toMatchObject({ credible: false, marginExact: '-2', equilibriumAction: 'Accommodate' });
  });
});

describe('Centipede game (Rosenthal, Journal of Economic Theory 25, 1981)', () => {
  it('takes at the first node (four-move payoffs of McKelvey and Palfrey, Econometrica 60, 1992)', () => {
    const take = [[0.4, 0.1], [0.2, 0.8], [1.6, 0.4], [0.8, 3.2]];
    const pass = [6.4, 1.6];
    const node = (k: number): unknown =>
      k === take.length
        ? { payoffs: pass }
        : { team: k % 2 === 0 ? 'One' : 'Two', actions: [{ label: 'Take', next: { payoffs: take[k] } }, { label: 'Pass', next: node(k + 1) }] };
    const result = backwardInduction(plain(['One', 'Two'], node(0)), { exact: true });
    expect(result.count).toBe(1);
    expect(result.equilibria[0]!.path).toEqual(['Take']);
    expect(result.equilibria[0]!.payoffsExact).toEqual(['2/5', '1/10']);
  });
});

describe('Mixed equilibria of 2x2 games (textbook; probabilities derived from the indifference conditions)', () => {
  it('matching pennies: both mix 1/2', () => {
    const r = supportEnumeration(bimatrix([[1, -1], [-1, 1]], [[-1, 1], [1, -1]]));
    expect(r.equilibria.map((e) => [e.rowExact, e.colExact])).toEqual([[['1/2', '1/2'], ['1/2', '1/2']]]);
  });

  it('battle of the sexes (Osborne 2004, Bach or Stravinsky): two pure equilibria and the mix (2/3, 1/3)', () => {
    // Row gets 2 at (B,B) and 1 at (S,S); column the reverse. Column indifferent: p = 2(1-p), p = 2/3;
    // row indifferent: 2q = 1 - q, q = 1/3.
    const r = supportEnumeration(bimatrix([[2, 0], [0, 1]], [[1, 0], [0, 2]]));
    expect(r.equilibria.map((e) => [e.rowExact, e.colExact])).toEqual([
      [['1', '0'], ['1', '0']],
      [['0', '1'], ['0', '1']],
      [['2/3', '1/3'], ['1/3', '2/3']],
    ]);
    expect(r.equilibria[2]!.payoffsExact).toEqual(['2/3', '2/3']);
  });

  it('chicken: two pure equilibria and each going straight with probability 1/10', () => {
    // Swerve/Swerve (0,0), Swerve/Straight (-1,1), Straight/Swerve (1,-1), crash (-10,-10).
    // Against straight with probability s: swerve gives -s, straight 1 - 11s, equal at s = 1/10.
    const r = supportEnumeration(bimatrix([[0, -1], [1, -10]], [[0, 1], [-1, -10]]));
    const mixed = r.equilibria.find((e) => e.rowExact![0] !== '0' && e.rowExact![0] !== '1');
    expect(r.equilibria).toHaveLength(3);
    expect(mixed).toMatchObject({ rowExact: ['9/10', '1/10'], colExact: ['9/10', '1/10'], payoffsExact: ['-1/10', '-1/10'] });
  });
});

describe('Logit QRE (McKelvey and Palfrey, Games and Economic Behavior 10, 1995)', () => {
  // Asymmetric matching pennies (Ochs 1995, used by McKelvey and Palfrey): Nash has the row
  // team mix 1/2 and the column team play L with probability 1/10 (9q = 1 - q).
  const ochs = simultaneous(['Row', 'Col'], ['U', 'D'], ['L', 'R'], [
    [[9, 0], [0, 1]],
    [[0, 1], [1, 0]],
  ]);

  it('is uniform at lambda = 0', () => {
    const q = logitQre(ochs, { lambda: 0 });
    expect(q.behaviour.n).toEqual({ U: 0.5, D: 0.5 });
    expect(q.behaviour.stage).toEqual({ L: 0.5, R: 0.5 });
  });

  it('approaches the Nash equilibrium as lambda grows, with the row team over-playing U on the way', () => {
    const distance = [0.5, 2, 10, 200].map((lambda) => {
      const q = logitQre(ochs, { lambda });
      expect(q.converged).toBe(true);
      expect(q.behaviour.n!.U!).toBeGreaterThan(0.5);
      return Math.abs(q.behaviour.n!.U! - 0.5) + Math.abs(q.behaviour.stage!.L! - 0.1);
    });
    for (let k = 1; k < distance.length; k++) expect(distance[k]!).toBeLessThan(distance[k - 1]!);
    expect(distance[3]!).toBeLessThan(0.01);
  });

  it('agrees with the closed form of a 2x2 game where one team has a constant payoff difference', () => {
    // Row: D beats U by exactly 2 whatever the column does, so P(D) = 1 / (1 + exp(-2 lambda)).
    // Column: L - R = 2 P(U) - (1 - P(U)), so P(L) = 1 / (1 + exp(-lambda (3 P(U) - 1))).
    const game = simultaneous(['Row', 'Col'], ['U', 'D'], ['L', 'R'], [
      [[1, 2], [0, 0]],
      [[3, 0], [2, 1]],
    ]);
    for (const lambda of [0.3, 1, 4]) {
      const q = logitQre(game, { lambda });
      const pD = 1 / (1 + Math.exp(-2 * lambda));
      const pL = 1 / (1 + Math.exp(-lambda * (3 * (1 - pD) - 1)));
      expect(q.behaviour.n!.D!).toBeCloseTo(pD, 9);
      expect(q.behaviour.stage!.L!).toBeCloseTo(pL, 9);
    }
  });

  it('satisfies the logit equations in a game with no closed form', () => {
    const lambda = 1.3;
    const q = logitQre(ochs, { lambda });
    const p = q.behaviour.n!.U!;
    const l = q.behaviour.stage!.L!;
    const logistic = (x: number) => 1 / (1 + Math.exp(-x));
    expect(p).toBeCloseTo(logistic(lambda * (9 * l - (1 - l))), 9);
    expect(l).toBeCloseTo(logistic(lambda * ((1 - p) - p)), 9);
  });
});

describe('Eisert-Wilkens-Lewenstein scheme (Phys. Rev. Lett. 83, 3077, 1999)', () => {
  const pd: TwoByTwo = { rowTeam: 'A', colTeam: 'B', payoffs: [[[3, 3], [0, 5]], [[5, 0], [1, 1]]] };
  const gammaFor = (sin2: number) => Math.asin(Math.sqrt(sin2));

  it('at gamma = pi/2, Q x Q is an equilibrium with payoffs (3,3) and D x D is not', () => {
    const found = ewlEquilibria(pd, Math.PI / 2);
    const names = found.map((e) => `${e.rowName ?? '?'},${e.colName ?? '?'}`);
    expect(names).toContain('Q,Q');
    expect(names).not.toContain('D,D');
    expect(ewlOutcome(pd, Math.PI / 2, EWL_Q, EWL_Q).payoffs.map((x) => Number(x.toFixed(12)))).toEqual([3, 3]);
    // Q "beats" D at maximal entanglement.
    expect(ewlOutcome(pd, Math.PI / 2, EWL_Q, EWL_D).payoffs[0]).toBeCloseTo(5, 12);
  });

  it('is the classical game at gamma = 0', () => {
    const moves = [EWL_C, EWL_D];
    moves.forEach((a, i) =>
      moves.forEach((b, j) => {
        const [x, y] = ewlOutcome(pd, 0, a, b).payoffs;
        expect(x).toBeCloseTo(pd.payoffs[i]![j]![0], 12);
        expect(y).toBeCloseTo(pd.payoffs[i]![j]![1], 12);
      }),
    );
    const names = ewlEquilibria(pd, 0).map((e) => `${e.rowName},${e.colName}`);
    expect(names).toEqual(['D,D']);
  });

  it('Q against D earns 5 sin^2(gamma), so D x D stays an equilibrium exactly while sin^2(gamma) <= 1/5', () => {
    // Derivation: J|CC> = cos(g/2)|CC> + i sin(g/2)|DD>; (Q x D) and J' give
    // -i cos(g)|CD> + sin(g)|DC>, so P(DC) = sin^2 g and the row team earns 5 sin^2 g
    // against D (and the column team 5 cos^2 g). D x D always ends in DD with payoff 1.
    for (const g of [0.1, 0.4, 0.9, 1.3]) expect(ewlOutcome(pd, g, EWL_Q, EWL_D).payoffs[0]).toBeCloseTo(5 * Math.sin(g) ** 2, 12);
    const dd = (sin2: number) => ewlEquilibria(pd, gammaFor(sin2)).some((e) => e.rowName === 'D' && e.colName === 'D');
    expect(dd(0.19)).toBe(true);
    expect(dd(0.21)).toBe(false);
  });

  it('Q x Q becomes an equilibrium at sin^2(gamma) = 2/5 (threshold from memory of the EWL literature; D against Q earns 5 cos^2 gamma, and 5 cos^2 gamma <= 3 gives it)', () => {
    const qq = (sin2: number) => ewlEquilibria(pd, gammaFor(sin2)).some((e) => e.rowName === 'Q' && e.colName === 'Q');
    expect(ewlOutcome(pd, 0.7, EWL_D, EWL_Q).payoffs[0]).toBeCloseTo(5 * Math.cos(0.7) ** 2, 12);
    expect(qq(0.39)).toBe(false);
    expect(qq(0.41)).toBe(true);
  });

  it('gives payoff curves against gamma for the named profiles', () => {
    const { gamma, curves } = ewlCurves(pd, { steps: 10 });
    expect(gamma[0]).toBe(0);
    expect(gamma[10]).toBeCloseTo(Math.PI / 2, 12);
    const qq = curves.find((c) => c.profile === 'Q,Q')!;
    expect(qq.payoffs.every(([a, b]) => Math.abs(a - 3) < 1e-12 && Math.abs(b - 3) < 1e-12)).toBe(true);
    expect(qq.equilibrium[0]).toBe(false);
    expect(qq.equilibrium[10]).toBe(true);
  });
});

describe('Quarter law (Yukalov and Sornette) against the disjunction effect (Shafir and Tversky, Cognitive Psychology 24, 1992)', () => {
  it('turns a 10% cooperation rate with the other move known into about 35% when it is not, beside the 37% observed', () => {
    const forecast = quarterLaw(0.1);
    expect(forecast.probability).toBeCloseTo(0.35, 12);
    expect(Math.abs(forecast.probability - 0.37)).toBeLessThan(0.03);
  });

  it('caps the attraction so that the probability stays within 0..1', () => {
    expect(quarterLaw(0.9).probability).toBe(1);
    expect(quarterLaw(0.1, -0.25).probability).toBe(0);
  });
});
