import { describe, expect, it } from 'vitest';
import {
  actionValues,
  beliefForecast,
  equilibriumPath,
  fitLogit,
  logitQre,
  MethodDoesNotApply,
  monteCarlo,
  sensitivity,
  solveSubgamePerfect,
  trembleLogLikelihood,
  type Observation,
} from '../../../src/lib/engine';
import { scenarioGame } from '../../../src/lib/scenario';
import { plain, simultaneous } from './helpers';
import { demoScenario } from '../../../server/seed/demo-scenario';

const entry = plain(['Entrant', 'Incumbent'], {
  team: 'Entrant',
  actions: [
    { label: 'Stay out', next: { payoffs: [0, 2] } },
    { label: 'Enter', next: { team: 'Incumbent', actions: [{ label: 'Fight', next: { payoffs: [-1, -1] } }, { label: 'Accommodate', next: { payoffs: [1, 1] } }] } },
  ],
});

const demoDocument = demoScenario();
const demo = scenarioGame(demoDocument);

describe('sensitivity of the equilibrium path to each payoff', () => {
  it('gives exact intervals in perfect information (entry deterrence, by hand)', () => {
    const { intervals } = sensitivity(entry, { exact: true });
    const at = (id: string, team: string) => intervals.find((i) => i.terminalId === id && i.team === team)!;
    // Enter-Accommodate stays the path while staying out pays the entrant less than 1,
    expect(at('n.stay-out', 'Entrant')).toMatchObject({ valueExact: '0', lowExact: null, highExact: '1', approximate: false });
    // fighting pays the incumbent less than accommodating (1),
    expect(at('n.enter.fight', 'Incumbent')).toMatchObject({ lowExact: null, highExact: '1' });
    // accommodation pays the entrant more than 0 and the incumbent more than -1.
    expect(at('n.enter.accommodate', 'Entrant')).toMatchObject({ lowExact: '0', highExact: null });
    expect(at('n.enter.accommodate', 'Incumbent')).toMatchObject({ lowExact: '-1', highExact: null });
    // The incumbent's payoff after staying out moves nobody's choice.
    expect(at('n.stay-out', 'Incumbent')).toMatchObject({ lowExact: null, highExact: null });
  });

  it('propagates through chance nodes', () => {
    // Blue takes the gamble L (x or 2, each with probability 1/2) when (x + 2)/2 >= 3, i.e. x >= 4.
    const game = plain(['Blue', 'Red'], {
      team: 'Blue',
      actions: [
        { label: 'L', next: { chance: [{ label: 'heads', p: '1/2', next: { payoffs: [0, 0] } }, { label: 'tails', p: '1/2', next: { payoffs: [2, 0] } }] } },
        { label: 'R', next: { payoffs: [3, 0] } },
      ],
    });
    const heads = sensitivity(game, { exact: true, terminals: ['n.l.heads'] }).intervals.find((i) => i.team === 'Blue')!;
    expect(heads).toMatchObject({ lowExact: null, highExact: '4' });
  });

  it('finds approximate intervals with imperfect information', () => {
    const pd = simultaneous(['A', 'B'], ['Silent', 'Testify'], ['Silent', 'Testify'], [
      [[3, 3], [0, 5]],
      [[5, 0], [1, 1]],
    ]);
    const result = sensitivity(pd, { terminals: ['n.testify.testify'] });
    expect(result.method).toMatch(/approximate/);
    const a = result.intervals.find((i) => i.team === 'A')!;
    expect(a.approximate).toBe(true);
    expect(a.low).toBeCloseTo(0, 5);
    expect(a.high).toBeNull();
  });
});

describe('Monte Carlo over payoff ranges', () => {
  const gamble = plain(['Blue', 'Red'], { team: 'Blue', actions: [{ label: 'Risk', next: { payoffs: [0, 0] } }, { label: 'Safe', next: { payoffs: [1, 0] } }] });

  it('gives each outcome the share of samples in which it is the equilibrium outcome, reproducibly from the seed', () => {
    const ranges = [{ terminalId: 'n.risk', team: 'Blue', distribution: { kind: 'uniform' as const, low: 0, high: 2 } }];
    const run = () => monteCarlo(gamble, ranges, { samples: 10_000, seed: 11 });
    const result = run();
    expect(result).toEqual(run());
    const risk = result.outcomes.find((o) => o.terminalId === 'n.risk')!.probability;
    // P(U(0, 2) > 1) = 1/2; standard deviation of the share 0.005.
    expect(Math.abs(risk - 0.5)).toBeLessThan(0.02);
  });

  it('samples triangular ranges', () => {
    // Triangular(0, 1/2, 2): P(X > 1) = (2 - 1)^2 / ((2 - 0)(2 - 1/2)) = 1/3.
    const ranges = [{ terminalId: 'n.risk', team: 'Blue', distribution: { kind: 'triangular' as const, low: 0, mode: '1/2', high: 2 } }];
    const risk = monteCarlo(gamble, ranges, { samples: 10_000, seed: 5 }).outcomes.find((o) => o.terminalId === 'n.risk')!.probability;
    expect(Math.abs(risk - 1 / 3)).toBeLessThan(0.02);
  });

  it('runs on a game with simultaneous stages and chance, shares summing to 1', () => {
    const ranges = demoDocument.payoffRanges.map((r) => ({ terminalId: r.nodeId, team: r.team, distribution: r.distribution }));
    const result = monteCarlo(demo, ranges, { samples: 200, seed: 3 });
    const total = result.outcomes.reduce((s, o) => s + o.probability, 0);
    expect(total).toBeCloseTo(1, 9);
    expect(result.outcomes[0]!.path.length).toBeGreaterThan(0);
  });

  it('rejects a range on a node that is not a terminal', () => {
    expect(() => monteCarlo(gamble, [{ terminalId: 'n', team: 'Blue', distribution: { kind: 'uniform', low: 0, high: 1 } }], { samples: 1, seed: 1 })).toThrow(
      'payoff range: "n" is not a terminal node',
    );
  });
});

describe('equilibrium path and continuation values', () => {
  const eq = solveSubgamePerfect(demo, { exact: true }).equilibria[0]!;

  it('follows the draws actually made at chance nodes', () => {
    const { steps } = equilibriumPath(demo, eq, { 'n.hold.hold': 'Collision between patrol vessels' });
    expect(steps.map((s) => s.label)).toEqual([
      'Hold at Naval shadowing',
      'Hold at Naval shadowing',
      'Collision between patrol vessels',
      'Hold at Exclusion zone',
      'Climb to Cargo inspections',
      'Broker a settlement',
    ]);
    expect(steps[2]).toMatchObject({ kind: 'chance', probability: 0.25 });
  });

  it('gives the continuation value of every action, from which the regret of a move follows', () => {
    const values = actionValues(demo, eq, 'n');
    expect(values.equilibriumAction).toBe('Hold at Naval shadowing');
    const velmora = (label: string) => values.actions.find((a) => a.label === label)!.values[0]!;
    expect(velmora('Hold at Naval shadowing') - velmora('Settle')).toBeCloseTo(179 / 400, 12);
    expect(values.actions.find((a) => a.label === 'Settle')!.valuesExact![0]).toBe('23/4');
  });
});

describe('the subgame-perfect roll-up', () => {
  it('combines the equilibria of simultaneous stages (two battle-of-the-sexes stages under a choice)', () => {
    const stage = (infoset: string) => ({
      team: 'A',
      actions: ['Opera', 'Fight'].map((r, i) => ({
        label: r,
        next: { team: 'B', infoset, actions: ['Opera', 'Fight'].map((c, j) => ({ label: c, next: { payoffs: i === j ? (i === 0 ? [2, 1] : [1, 2]) : [0, 0] } })) },
      })),
    });
    const game = plain(['A', 'B'], { team: 'A', actions: [{ label: 'Left', next: stage('left') }, { label: 'Right', next: stage('right') }] });
    const result = solveSubgamePerfect(game, { exact: true, maxListed: 20 });
    // Each stage has three equilibria, worth 2, 1 and 2/3 to A. Of the 3 x 3 combinations,
    // A's first choice is strict in 6 and tied (two choices) in 3: 6 + 2 * 3 = 12.
    expect(result.count).toBe(12);
    expect(result.countExact).toBe(true);
    expect(result.equilibria).toHaveLength(12);
    expect(result.stages).toMatchObject({ decision: 1, simultaneous: 2 });
  });

  it('finds pure equilibria by enumeration with more than two teams and imperfect information', () => {
    const leaf = (same: boolean) => ({ payoffs: same ? [1, 1, 1] : [0, 0, 0] });
    const game = plain(['A', 'B', 'C'], {
      team: 'A',
      actions: ['x', 'y'].map((a) => ({
        label: a,
        next: { team: 'B', infoset: 'b', actions: ['x', 'y'].map((b) => ({ label: b, next: { team: 'C', infoset: 'c', actions: ['x', 'y'].map((c) => ({ label: c, next: leaf(a === b && b === c) })) } })) },
      })),
    });
    const result = solveSubgamePerfect(game, { exact: true, maxListed: 10 });
    expect(result.method).toMatch(/pure-strategy enumeration/);
    expect(result.equilibria.map((e) => e.path.join(''))).toEqual(expect.arrayContaining(['xxx', 'yyy']));
    expect(result.countExact).toBe(false);
  });

  it('says when the method does not apply', () => {
    const labels = Array.from({ length: 30 }, (_, k) => `m${k}`);
    const game = plain(['A', 'B', 'C'], {
      team: 'A',
      actions: labels.map((a) => ({
        label: a,
        next: { team: 'B', infoset: 'b', actions: labels.map((b) => ({ label: b, next: { team: 'C', infoset: 'c', actions: labels.map((c) => ({ label: c, next: { payoffs: [a === b ? 1 : 0, b === c ? 1 : 0, 0] } })) } })) },
      })),
    });
    expect(() => solveSubgamePerfect(game)).toThrow(MethodDoesNotApply);
    expect(() => solveSubgamePerfect(game)).toThrow(/27000 pure strategy profiles for more than two teams with imperfect information/);
  });
});

describe('logit lambda fit and tremble likelihood', () => {
  const choice = plain(['Blue', 'Red'], {
    team: 'Blue',
    actions: [
      { label: 'Better', next: { team: 'Red', actions: [{ label: 'Good', next: { payoffs: [1, 2] } }, { label: 'Bad', next: { payoffs: [1, 0] } }] } },
      { label: 'Worse', next: { payoffs: [0, 0] } },
    ],
  });
  const repeat = (n: number, o: Observation) => Array.from({ length: n }, () => o);

  it('recovers lambda per team: with a payoff gap d and a share s of the better move, lambda = ln(s / (1 - s)) / d', () => {
    const observations = [
      ...repeat(73, { node: 'n', label: 'Better' }),
      ...repeat(27, { node: 'n', label: 'Worse' }),
      ...repeat(9, { node: 'n.better', label: 'Good' }),
      ...repeat(1, { node: 'n.better', label: 'Bad' }),
    ];
    const fit = fitLogit(choice, observations);
    expect(fit.teams.Blue!.lambda).toBeCloseTo(Math.log(73 / 27) / 1, 3);
    expect(fit.teams.Red!.lambda).toBeCloseTo(Math.log(9) / 2, 3);
    expect(fit.teams.Blue!.logLikelihood).toBeCloseTo(73 * Math.log(0.73) + 27 * Math.log(0.27), 6);
    expect(fit.teams.Blue!.uniformLogLikelihood).toBeCloseTo(100 * Math.log(0.5), 12);
    expect(fit.uniformLogLikelihood).toBeCloseTo(110 * Math.log(0.5), 12);
  });

  it('scores equilibrium play with trembles: each move follows the equilibrium with probability 1 - epsilon', () => {
    const eq = solveSubgamePerfect(choice).equilibria[0]!;
    const observations = [...repeat(3, { node: 'n', label: 'Better' }), { node: 'n', label: 'Worse' }];
    const result = trembleLogLikelihood(choice, eq, observations, 0.2);
    expect(result.logLikelihood).toBeCloseTo(3 * Math.log(0.9) + Math.log(0.1), 12);
    expect(result.teams.Blue).toEqual({ logLikelihood: result.logLikelihood, observations: 4 });
  });

  it('rejects an observation of a move that does not exist', () => {
    expect(() => fitLogit(choice, [{ node: 'n', label: 'Retreat' }])).toThrow('observation 0: "Retreat" is not an action there (actions: Better, Worse)');
  });
});

describe('QRE with a lambda per team and the belief forecast', () => {
  it('leaves a team with lambda 0 uniform', () => {
    const q = logitQre(entry, { lambda: { Entrant: 0, Incumbent: 5 } });
    expect(q.behaviour.n).toEqual({ 'Stay out': 0.5, Enter: 0.5 });
    expect(q.behaviour['n.enter']!.Accommodate!).toBeGreaterThan(0.99);
  });

  it("sets the quarter law's forecast beside the QRE forecast for a simultaneous stage", () => {
    const pd = simultaneous(['A', 'B'], ['Silent', 'Testify'], ['Silent', 'Testify'], [
      [[3, 3], [0, 5]],
      [[5, 0], [1, 1]],
    ]);
    const f = beliefForecast(pd, 'n', 'A', 'Silent', 1);
    // Testifying gains 2 against silence and 1 against testimony.
    const known = (1 / (1 + Math.exp(2)) + 1 / (1 + Math.exp(1))) / 2;
    expect(f.knownMove).toBeCloseTo(known, 12);
    expect(f.quarterLaw.probability).toBeCloseTo(known + 0.25, 12);
    expect(f.qre).toBeGreaterThan(0);
    expect(f.qre).toBeLessThan(0.5);
  });
});
