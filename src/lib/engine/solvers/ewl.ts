/**
 * The agreement lens for 2x2 stages: the Eisert-Wilkens-Lewenstein scheme (Eisert,
 * Wilkens and Lewenstein, Phys. Rev. Lett. 83, 3077, 1999). Each team's move is a
 * unitary U(theta, phi) applied to its half of the entangled state J|CC>, with
 *   J = exp(i gamma D x D / 2),
 *   U(theta, phi) = [[e^{i phi} cos(theta/2), sin(theta/2)], [-sin(theta/2), e^{-i phi} cos(theta/2)]],
 * theta in [0, pi], phi in [0, pi/2]; the outcome probabilities are |<s| J' (U_A x U_B) J |CC>|^2.
 * Here gamma, from 0 (no entanglement: the classical game) to pi/2 (maximal), is read as
 * the strength of a binding agreement or norm between the teams; it is an analogy for
 * discussion, not a model of any real negotiation.
 * C = U(0, 0), D = U(pi, 0), Q = U(0, pi/2).
 */

export interface EwlStrategy {
  theta: number;
  phi: number;
}

export const EWL_C: EwlStrategy = { theta: 0, phi: 0 };
export const EWL_D: EwlStrategy = { theta: Math.PI, phi: 0 };
export const EWL_Q: EwlStrategy = { theta: 0, phi: Math.PI / 2 };

/** A 2x2 stage; index 0 of each team is its cooperative (restrained) move "C", index 1 its "D". */
export interface TwoByTwo {
  rowTeam: string;
  colTeam: string;
  /** payoffs[i][j] = [row team, column team] when row plays i and column plays j. */
  payoffs: [[[number, number], [number, number]], [[number, number], [number, number]]];
}

type Complex = [number, number];
const mul = (a: Complex, b: Complex): Complex => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const add = (a: Complex, b: Complex): Complex => [a[0] + b[0], a[1] + b[1]];

function unitary({ theta, phi }: EwlStrategy): Complex[][] {
  const c = Math.cos(theta / 2);
  const s = Math.sin(theta / 2);
  return [
    [[c * Math.cos(phi), c * Math.sin(phi)], [s, 0]],
    [[-s, 0], [c * Math.cos(phi), -c * Math.sin(phi)]],
  ];
}

/** J = cos(gamma/2) I + i sin(gamma/2) D x D, since (D x D)^2 = I. Applied to a 4-vector over |CC>,|CD>,|DC>,|DD>. */
function entangle(state: Complex[], gamma: number, inverse: boolean): Complex[] {
  const c = Math.cos(gamma / 2);
  const s = (inverse ? -1 : 1) * Math.sin(gamma / 2);
  // D x D maps |00> -> |11>, |01> -> -|10>, |10> -> -|01>, |11> -> |00>.
  const dd: Complex[] = [state[3]!, [-state[2]![0], -state[2]![1]], [-state[1]![0], -state[1]![1]], state[0]!];
  return state.map((v, k) => add([c * v[0], c * v[1]], mul([0, s], dd[k]!)));
}

export interface EwlOutcome {
  /** Probabilities of CC, CD, DC, DD (row move first). */
  probabilities: [number, number, number, number];
  payoffs: [number, number];
}

export function ewlOutcome(game: TwoByTwo, gamma: number, a: EwlStrategy, b: EwlStrategy): EwlOutcome {
  const start = entangle([[1, 0], [0, 0], [0, 0], [0, 0]], gamma, false);
  const ua = unitary(a);
  const ub = unitary(b);
  const moved: Complex[] = [0, 1, 2, 3].map((row) => {
    let sum: Complex = [0, 0];
    for (let col = 0; col < 4; col++) {
      const factor = mul(ua[row >> 1]![col >> 1]!, ub[row & 1]![col & 1]!);
      sum = add(sum, mul(factor, start[col]!));
    }
    return sum;
  });
  const final = entangle(moved, gamma, true);
  const probabilities = final.map((v) => v[0] * v[0] + v[1] * v[1]) as [number, number, number, number];
  const cells = [game.payoffs[0][0], game.payoffs[0][1], game.payoffs[1][0], game.payoffs[1][1]];
  const payoffs: [number, number] = [0, 0];
  probabilities.forEach((p, k) => {
    payoffs[0] += p * cells[k]![0];
    payoffs[1] += p * cells[k]![1];
  });
  return { probabilities, payoffs };
}

/** The strategy grid: theta and phi in steps of pi/(2*resolution); at theta = pi, where phi has no effect, only phi = 0. */
function strategyGrid(resolution: number): EwlStrategy[] {
  const out: EwlStrategy[] = [];
  for (let i = 0; i <= 2 * resolution; i++) {
    const phis = i === 2 * resolution ? 0 : resolution;
    for (let j = 0; j <= phis; j++) out.push({ theta: (Math.PI * i) / (2 * resolution), phi: (Math.PI * j) / (2 * resolution) });
  }
  return out;
}

export interface EwlEquilibrium {
  row: EwlStrategy;
  col: EwlStrategy;
  /** "C", "D" or "Q" when the strategy is one of them. */
  rowName?: string;
  colName?: string;
  payoffs: [number, number];
  /** Largest gain either team could make by deviating to any strategy of the fine check grid. */
  regret: number;
}

function nameOf(s: EwlStrategy): string | undefined {
  const near = (x: EwlStrategy) => Math.abs(x.theta - s.theta) < 1e-9 && Math.abs(x.phi - s.phi) < 1e-9;
  return near(EWL_C) ? 'C' : near(EWL_D) ? 'D' : near(EWL_Q) ? 'Q' : undefined;
}

/** Best payoff a team can reach against the other's fixed strategy, over a grid. */
function bestReply(game: TwoByTwo, gamma: number, other: EwlStrategy, side: 0 | 1, grid: EwlStrategy[]): number {
  let best = -Infinity;
  for (const s of grid) {
    const out = side === 0 ? ewlOutcome(game, gamma, s, other) : ewlOutcome(game, gamma, other, s);
    best = Math.max(best, out.payoffs[side]);
  }
  return best;
}

/**
 * Pure equilibria over the two-parameter strategy set: the profiles of a search grid
 * where each strategy is a best reply on that grid, kept if no deviation on a finer
 * grid gains more than `tolerance`.
 */
export function ewlEquilibria(game: TwoByTwo, gamma: number, options: { resolution?: number; tolerance?: number } = {}): EwlEquilibrium[] {
  const grid = strategyGrid(options.resolution ?? 6);
  const fine = strategyGrid(3 * (options.resolution ?? 6));
  const tolerance = options.tolerance ?? 1e-6;
  const table = grid.map((a) => grid.map((b) => ewlOutcome(game, gamma, a, b).payoffs));
  const colBest = grid.map((_, i) => Math.max(...table[i]!.map((p) => p[1])));
  const rowBest = grid.map((_, j) => Math.max(...table.map((r) => r[j]![0])));
  const found: EwlEquilibrium[] = [];
  grid.forEach((a, i) => {
    grid.forEach((b, j) => {
      const p = table[i]![j]!;
      if (p[0] < rowBest[j]! - 1e-9 || p[1] < colBest[i]! - 1e-9) return;
      const regret = Math.max(bestReply(game, gamma, b, 0, fine) - p[0], bestReply(game, gamma, a, 1, fine) - p[1], 0);
      if (regret > tolerance) return;
      const rowName = nameOf(a);
      const colName = nameOf(b);
      found.push({ row: a, col: b, ...(rowName ? { rowName } : {}), ...(colName ? { colName } : {}), payoffs: p, regret });
    });
  });
  return found;
}

export interface EwlCurve {
  profile: string;
  row: EwlStrategy;
  col: EwlStrategy;
  /** payoffs[k] at gamma[k]: [row team, column team]. */
  payoffs: [number, number][];
  /** Whether the profile is an equilibrium (checked on the fine grid) at gamma[k]. */
  equilibrium: boolean[];
}

const NAMED_PROFILES: [string, EwlStrategy, EwlStrategy][] = [
  ['C,C', EWL_C, EWL_C],
  ['D,D', EWL_D, EWL_D],
  ['Q,Q', EWL_Q, EWL_Q],
  ['Q,D', EWL_Q, EWL_D],
  ['D,Q', EWL_D, EWL_Q],
];

/** Payoffs of the named profiles against gamma from 0 to pi/2, with where each is an equilibrium. */
export function ewlCurves(game: TwoByTwo, options: { steps?: number; resolution?: number } = {}): { gamma: number[]; curves: EwlCurve[] } {
  const steps = options.steps ?? 30;
  const fine = strategyGrid(3 * (options.resolution ?? 6));
  const gamma = Array.from({ length: steps + 1 }, (_, k) => (Math.PI / 2) * (k / steps));
  const curves = NAMED_PROFILES.map(([profile, row, col]): EwlCurve => {
    const payoffs = gamma.map((g) => ewlOutcome(game, g, row, col).payoffs);
    const equilibrium = gamma.map((g, k) => {
      const p = payoffs[k]!;
      return bestReply(game, g, col, 0, fine) - p[0] <= 1e-9 && bestReply(game, g, row, 1, fine) - p[1] <= 1e-9;
    });
    return { profile, row, col, payoffs, equilibrium };
  });
  return { gamma, curves };
}
