/**
 * The maximum-likelihood lambda fit is a maximiser: never below uniform play, not beaten by
 * moving any one team's lambda near or far from the one it returns, monotone in its sweeps, converged, and equal to the
 * closed form where there is one. Random games come from helpers.ts.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FIT_TOLERANCE, fitLogit, type Game, type LogitFit, type Observation } from '../../../src/lib/engine';
import { demoGame, freshLikelihood, gamesOfDepth, movesAt, plain, seededRunMoves } from './helpers';

/**
 * One decision of one team (the other team only receives payoffs): "Better" pays the mover
 * base + d, "Worse" pays base. Under logit choice P(Better) = 1 / (1 + e^(-lambda d)), so k
 * choices of Better in n give log L(lambda) = k ln P + (n - k) ln (1 - P), whose derivative
 * d (k - n P) vanishes at P = k / n: lambda* = ln(k / (n - k)) / d (derived here; the
 * binary logit MLE, McFadden 1974). log L is concave in lambda, so for k <= n / 2 the
 * maximum over lambda >= 0 is at 0, and for k = n it rises without end (the bound).
 */
function oneDecision(base: number, d: number): Game {
  return plain(['Solo', 'Bystander'], {
    team: 'Solo',
    actions: [
      { label: 'Better', next: { payoffs: [base + d, 0] } },
      { label: 'Worse', next: { payoffs: [base, 0] } },
    ],
  });
}

const choices = (k: number, n: number): Observation[] => Array.from({ length: n }, (_, i) => ({ node: 'n', label: i < k ? 'Better' : 'Worse' }));

const lambdasOf = (game: Game, fit: LogitFit) => game.teams.map((t) => fit.teams[t.id]!.lambda);

describe('the lambda fit on one decision (closed form)', () => {
  const cases = fc.record({ base: fc.integer({ min: -10, max: 10 }), d: fc.integer({ min: 1, max: 400 }).map((x) => x / 20), n: fc.integer({ min: 2, max: 40 }) });

  it('meets lambda* = ln(k / (n - k)) / d and its log-likelihood when more than half the choices are the better one', () => {
    fc.assert(
      fc.property(cases, fc.nat(), ({ base, d, n }, pick) => {
        fc.pre(n >= 3);
        const half = Math.floor(n / 2);
        const k = half + 1 + (pick % (n - 1 - half));
        const fit = fitLogit(oneDecision(base, d), choices(k, n));
        const solo = fit.teams.Solo!;
        expect(Math.abs(solo.lambda / (Math.log(k / (n - k)) / d) - 1)).toBeLessThan(1e-5);
        expect(solo.logLikelihood).toBeCloseTo(k * Math.log(k / n) + (n - k) * Math.log((n - k) / n), 9);
        expect(solo.atBound).toBeNull();
        expect(fit.converged).toBe(true);
        expect(fit.teams.Bystander).toMatchObject({ lambda: 0, atBound: null, observations: 0 });
      }),
      { numRuns: 100 },
    );
  });

  it('stops at lambda = 0 (the lower bound) when at most half the choices are the better one', () => {
    fc.assert(
      fc.property(cases, fc.nat(), ({ base, d, n }, pick) => {
        const k = pick % (Math.floor(n / 2) + 1);
        const fit = fitLogit(oneDecision(base, d), choices(k, n));
        expect(fit.teams.Solo).toMatchObject({ lambda: 0, atBound: 'lower' });
        expect(fit.logLikelihood).toBeCloseTo(n * Math.log(1 / 2), 12);
        expect(fit.converged).toBe(true);
      }),
      { numRuns: 50 },
    );
  });

  it('reports the upper bound, not some large number, when every choice is the better one', () => {
    const game = oneDecision(2, 3);
    const fit = fitLogit(game, choices(7, 7));
    // Payoff range 5 - 0: the range ends at 10,000 / 5.
    expect(fit.maxLambda).toBe(2000);
    expect(fit.teams.Solo).toMatchObject({ lambda: 2000, atBound: 'upper' });
    expect(fit.converged).toBe(true);
    expect(fitLogit(game, choices(7, 7), { maxLambda: 4 }).teams.Solo).toMatchObject({ lambda: 4, atBound: 'upper' });
  });
});

/** One team's lambda scaled by e^(+-spread), sent to 0 or to the bound, within [0, max]. */
const perturbation = fc.tuple(
  fc.nat(2),
  fc.oneof(fc.double({ min: -2, max: 2, noNaN: true }), fc.double({ min: -0.01, max: 0.01, noNaN: true }), fc.constantFrom('zero' as const, 'max' as const)),
);

function perturbed(fit: LogitFit, game: Game, [team, move]: [number, number | 'zero' | 'max']): number[] {
  return game.teams.map((t, i) => {
    const { lambda, observations } = fit.teams[t.id]!;
    // A team without moves is not fitted: it stays at 0 (uniform play).
    if (i !== team % game.teams.length || observations === 0) return lambda;
    if (move === 'zero') return 0;
    if (move === 'max') return fit.maxLambda;
    return Math.min(fit.maxLambda, (lambda || fit.maxLambda * 1e-4) * Math.exp(move));
  });
}

describe('the lambda fit on random games', () => {
  const picks = fc.array(fc.tuple(fc.nat(40), fc.nat(2)), { minLength: 1, maxLength: 10 });

  // A coordinate-wise maximum once converged: no one team's lambda, near or far, does
  // better. Several changed at once may (the likelihood is not concave across teams), see
  // coordinateAscent. Where one team's lambda pins another's sharply, the ascent can crawl
  // along a bending ridge past the sweep cap (about 1 fit in 1,000 of these games): it then
  // says so (converged false, Review prints a caution), and is still never below uniform.
  it('is never below uniform play and, converged, never below the likelihood with any one team\'s lambda moved near or far', () => {
    let runs = 0;
    let converged = 0;
    fc.assert(
      fc.property(gamesOfDepth(3), picks, fc.array(perturbation, { minLength: 6, maxLength: 6 }), (game, chosen, trials) => {
        const observations = movesAt(game, chosen);
        const fit = fitLogit(game, observations);
        runs++;
        expect(fit.logLikelihood).toBeGreaterThanOrEqual(fit.uniformLogLikelihood - 1e-12);
        expect(fit.logLikelihood).toBeGreaterThanOrEqual(freshLikelihood(game, observations, game.teams.map(() => 0)) - 1e-12);
        if (!fit.converged) {
          expect(fit.sweeps).toBe(FIT_TOLERANCE.maxSweeps);
          return;
        }
        converged++;
        for (const trial of trials) {
          expect(fit.logLikelihood).toBeGreaterThanOrEqual(freshLikelihood(game, observations, perturbed(fit, game, trial)) - 1e-8);
        }
      }),
      { numRuns: 150 },
    );
    expect(converged).toBeGreaterThanOrEqual(runs - 3);
  });

  it('reports the bound exactly: a team at a bound has lambda 0 or maxLambda, any other lies strictly between', () => {
    fc.assert(
      fc.property(gamesOfDepth(3), picks, (game, chosen) => {
        const fit = fitLogit(game, movesAt(game, chosen));
        for (const team of Object.values(fit.teams)) {
          if (team.atBound === 'upper') expect(team.lambda).toBe(fit.maxLambda);
          else if (team.atBound === 'lower' || team.observations === 0) expect(team.lambda).toBe(0);
          else expect(team.lambda > 0 && team.lambda < fit.maxLambda).toBe(true);
        }
      }),
      { numRuns: 80 },
    );
  });
});

describe('the lambda fit on the demo exercise', () => {
  const demo = demoGame();
  const moves = seededRunMoves(demo);
  const fit = fitLogit(demo, moves);

  it('converges, with Ostrakh at the upper bound and the other two inside the range', () => {
    expect(fit.converged).toBe(true);
    expect(fit.teams.ostrakh).toMatchObject({ lambda: fit.maxLambda, atBound: 'upper' });
    expect(fit.teams.velmora!.atBound).toBeNull();
    expect(fit.teams.lantern!.atBound).toBeNull();
    expect(fit.logLikelihood).toBeGreaterThan(fit.uniformLogLikelihood);
  });

  it('gains with every further sweep and ends where the unbounded run ends', () => {
    // Before this fit, more sweeps moved the lambdas on and the bound widening could end lower.
    let previous = -Infinity;
    for (let sweeps = 1; sweeps <= fit.sweeps; sweeps++) {
      const capped = fitLogit(demo, moves, { maxSweeps: sweeps });
      expect(capped.logLikelihood).toBeGreaterThanOrEqual(previous);
      expect(capped.converged).toBe(sweeps === fit.sweeps);
      previous = capped.logLikelihood;
    }
    expect(previous).toBe(fit.logLikelihood);
  });

  it('is not beaten by lambdas 5% either side of its own, one team or all at once', () => {
    const best = lambdasOf(demo, fit);
    const trials = [...best.flatMap((_, t) => [0.95, 1.05].map((f) => best.map((l, s) => (s === t ? Math.min(fit.maxLambda, l * f) : l)))), best.map((l) => l * 0.95)];
    for (const trial of trials) expect(fit.logLikelihood).toBeGreaterThanOrEqual(freshLikelihood(demo, moves, trial));
  });
});
