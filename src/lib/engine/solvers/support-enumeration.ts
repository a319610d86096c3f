/**
 * All Nash equilibria of a two-team simultaneous stage (a bimatrix game) by support
 * enumeration. For every pair of equal-size sets (S, K) it solves for the mixed
 * strategy x of one team with support S that makes every opponent strategy in K
 * indifferent and best; the extreme equilibria are the pairs (x, y) where each support
 * lies within the other's best responses. Decoupling the equation set K from the
 * opponent's support keeps the method complete for degenerate games, whose equilibrium
 * sets are then the convex hulls of compatible extreme equilibria (reported with
 * `degenerate: true`). Candidates are found in floats and, in exact mode, recomputed
 * and checked in rational arithmetic.
 */
import { solveUnique } from '../linear';
import { exactField, floatCmp, floatField, type Field, type Num } from '../numbers';

export interface BimatrixGame {
  rowLabels: string[];
  colLabels: string[];
  /** rowPayoff[i][j]: payoff of the row team when it plays i and the column team plays j. */
  rowPayoff: Num[][];
  colPayoff: Num[][];
}

export interface MixedEquilibrium {
  row: number[];
  col: number[];
  payoffs: [number, number];
  rowExact?: string[];
  colExact?: string[];
  payoffsExact?: [string, string];
}

export interface SupportEnumerationResult {
  method: string;
  equilibria: MixedEquilibrium[];
  /** True when some strategy has more best responses than its support size: there may be continua of equilibria between the listed extreme ones. */
  degenerate: boolean;
}

export interface StageEquilibrium<T> {
  row: T[];
  col: T[];
  values: [T, T];
}

export function supportEnumeration(game: BimatrixGame, options: { exact?: boolean } = {}): SupportEnumerationResult {
  const exact = options.exact ?? true;
  return exact ? report(exactField, game) : report(floatField, game);
}

function report<T>(field: Field<T>, game: BimatrixGame): SupportEnumerationResult {
  const A = game.rowPayoff.map((row) => row.map((v) => field.from(v)));
  const B = game.colPayoff.map((row) => row.map((v) => field.from(v)));
  const { equilibria, degenerate } = bimatrixEquilibria(field, A, B);
  const num = (xs: T[]) => xs.map((v) => field.toNumber(v));
  const fmt = (xs: T[]) => xs.map((v) => field.format(v)!);
  return {
    method: `support enumeration (${field.exact ? 'exact' : 'float'})`,
    degenerate,
    equilibria: equilibria.map((e) => ({
      row: num(e.row),
      col: num(e.col),
      payoffs: [field.toNumber(e.values[0]), field.toNumber(e.values[1])],
      ...(field.exact
        ? { rowExact: fmt(e.row), colExact: fmt(e.col), payoffsExact: [field.format(e.values[0])!, field.format(e.values[1])!] as [string, string] }
        : {}),
    })),
  };
}

interface Vertex<T> {
  strategy: T[];
  /** The opponent's best-response value against this strategy. */
  value: T;
  support: number[];
  bestResponses: number[];
}

/**
 * Extreme equilibria of the bimatrix game (A, B) in the field's arithmetic.
 * A[i][j] and B[i][j] are the payoffs of the row and column team. Vertices are found
 * and paired in floats; in exact mode only the vertices of float pairs are recomputed
 * exactly (every (S, K) behind them), and each pair is confirmed exactly.
 */
export function bimatrixEquilibria<T>(field: Field<T>, A: T[][], B: T[][]): { equilibria: StageEquilibrium<T>[]; degenerate: boolean; continuum: boolean } {
  const m = A.length;
  const n = A[0]!.length;
  // x (row team) must make the column team indifferent: its payoffs are B^T.
  const Bt = Array.from({ length: n }, (_, j) => Array.from({ length: m }, (_, i) => B[i]![j]!));
  const floats = (P: T[][]) => P.map((row) => row.map((v) => field.toNumber(v)));
  const [Af, Btf] = [floats(A), floats(Bt)];
  const xs = floatCandidates(Btf, m, n).map((c) => ({ ...c, ...describe(floatField, Btf, c) }));
  const ys = floatCandidates(Af, n, m).map((c) => ({ ...c, ...describe(floatField, Af, c) }));
  const degenerate = [...xs, ...ys].some((v) => v.bestResponses.length > v.support.length);
  // In exact mode every (S, K) of a float candidate is solved exactly and each distinct
  // vertex that holds is kept: next to a tie, one float strategy can stand for a pure
  // vertex and a mixed one a hair away (a probability under the float snap), and only
  // the mixed one may pair into an equilibrium.
  const exactX = new Map<number, Vertex<T>[]>();
  const exactY = new Map<number, Vertex<T>[]>();
  const confirm = (cache: Map<number, Vertex<T>[]>, P: T[][], c: Candidate, own: number, index: number) => {
    let found = cache.get(index);
    if (!found) {
      found = [];
      for (const { S, K } of [c, ...c.alternatives]) {
        const solved = solveFor(field, P, S, K, own);
        if (!solved || !isBestResponseVertex(field, P, solved)) continue;
        if (found.some((v) => sameStrategy(field, v.strategy, solved.strategy))) continue;
        found.push(describe(field, P, solved));
      }
      cache.set(index, found);
    }
    return found;
  };
  const equilibria: StageEquilibrium<T>[] = [];
  const add = (x: Vertex<T>, y: Vertex<T>) => {
    if (!compatible(x, y)) return;
    if (field.exact && equilibria.some((e) => sameStrategy(field, e.row, x.strategy) && sameStrategy(field, e.col, y.strategy))) return;
    equilibria.push({ row: x.strategy, col: y.strategy, values: [y.value, x.value] });
  };
  xs.forEach((xf, xi) => {
    ys.forEach((yf, yi) => {
      if (!compatible(xf, yf)) return;
      if (!field.exact) return add(xf as unknown as Vertex<T>, yf as unknown as Vertex<T>);
      for (const x of confirm(exactX, Bt, xf, m, xi)) for (const y of confirm(exactY, A, yf, n, yi)) add(x, y);
    });
  });
  return { equilibria, degenerate, continuum: hasContinuum(field, equilibria) };
}

/**
 * Whether the stage has a continuum of equilibria: the equilibrium sets of a bimatrix game
 * are unions of products of convex hulls of mutually compatible extreme equilibria
 * (Jansen 1981, "Maximal Nash subsets for bimatrix games", Naval Research Logistics
 * Quarterly 28; Avis, Rosenberg, Savani and von Stengel 2010, Economic Theory 42; both
 * cited from memory), so there is one exactly when some extreme strategy of one team is
 * paired with two different extreme strategies of the other.
 */
function hasContinuum<T>(field: Field<T>, equilibria: StageEquilibrium<T>[]): boolean {
  return equilibria.some((e, i) => equilibria.some((f, j) => j > i && sameStrategy(field, e.row, f.row) !== sameStrategy(field, e.col, f.col)));
}

function sameStrategy<T>(field: Field<T>, a: T[], b: T[]): boolean {
  return a.every((v, k) => field.cmp(v, b[k]!) === 0);
}

function compatible(x: { support: number[]; bestResponses: number[] }, y: { support: number[]; bestResponses: number[] }): boolean {
  return y.support.every((j) => x.bestResponses.includes(j)) && x.support.every((i) => y.bestResponses.includes(i));
}

interface Candidate {
  S: number[];
  K: number[];
  strategy: number[];
  value: number;
  /**
   * Other (S, K) whose float solution is the same strategy to 9 decimals, on the same
   * support. Next to a tie
   * the float tolerance lets a K that misses the true best response through; the exact
   * pass tries these in turn when the first does not hold exactly.
   */
  alternatives: { S: number[]; K: number[] }[];
}

/** The float pass: one (S, K) per distinct best-response vertex, with its float solution. */
function floatCandidates(P: number[][], own: number, other: number): Candidate[] {
  const out: Candidate[] = [];
  const seen = new Map<string, Candidate>();
  const size = Math.min(own, other) + 1;
  const m = new Float64Array(size * (size + 1));
  const z = new Float64Array(size);
  for (let k = 1; k < size; k++) {
    const ownSets = [...subsets(own, k)];
    for (const K of subsets(other, k)) {
      for (const S of ownSets) {
        if (!solveSquare(P, S, K, m, z) || !isFloatVertex(P, S, z, k)) continue;
        const strategy = new Array<number>(own).fill(0);
        S.forEach((i, a) => (strategy[i] = Math.abs(z[a]!) < 1e-12 ? 0 : z[a]!));
        // The support is part of the key: a probability of 1e-10 rounds to 0 at 9 decimals,
        // and merging such a mixed vertex into the pure one beside it would lose the only
        // equilibrium of a near-degenerate stage when the exact pass confirms the pure one.
        const key = strategy.map((v) => (v > 0 ? v.toFixed(9) : '0')).join(',');
        const known = seen.get(key);
        if (known) {
          known.alternatives.push({ S, K });
          continue;
        }
        const candidate = { S, K, strategy, value: z[k]!, alternatives: [] };
        seen.set(key, candidate);
        out.push(candidate);
      }
    }
  }
  return out;
}

/** Float check of a solution: non-negative, and no opponent action beats the value. */
function isFloatVertex(P: number[][], S: number[], z: Float64Array, k: number): boolean {
  for (let a = 0; a < k; a++) if (floatCmp(z[a]!, 0) < 0) return false;
  const value = z[k]!;
  for (const row of P) {
    let sum = 0;
    for (let a = 0; a < k; a++) sum += row[S[a]!]! * z[a]!;
    if (floatCmp(sum, value) > 0) return false;
  }
  return true;
}

/** solveFor in floats on a preallocated buffer: unknowns s_S and the value, k+1 equations. */
function solveSquare(P: number[][], S: number[], K: number[], m: Float64Array, z: Float64Array): boolean {
  const k = S.length;
  const n = k + 1;
  const w = n + 1;
  for (let r = 0; r < k; r++) {
    const row = P[K[r]!]!;
    for (let c = 0; c < k; c++) m[r * w + c] = row[S[c]!]!;
    m[r * w + k] = -1;
    m[r * w + n] = 0;
  }
  for (let c = 0; c < k; c++) m[k * w + c] = 1;
  m[k * w + k] = 0;
  m[k * w + n] = 1;
  for (let c = 0; c < n; c++) {
    let best = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r * w + c]!) > Math.abs(m[best * w + c]!)) best = r;
    const pivot = m[best * w + c]!;
    if (Math.abs(pivot) < 1e-12) return false;
    if (best !== c) {
      for (let j = 0; j < w; j++) {
        const t = m[c * w + j]!;
        m[c * w + j] = m[best * w + j]!;
        m[best * w + j] = t;
      }
    }
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r * w + c]! / pivot;
      if (f === 0) continue;
      for (let j = c; j < w; j++) m[r * w + j]! -= f * m[c * w + j]!;
    }
  }
  for (let r = 0; r < n; r++) z[r] = m[r * w + n]! / m[r * w + r]!;
  return true;
}

/** Solve sum_S s = 1 and P[j] . s = value for j in K, with s zero outside S. */
function solveFor<T>(field: Field<T>, P: T[][], S: number[], K: number[], own: number): { strategy: T[]; value: T } | null {
  const rows = K.map((j) => [...S.map((i) => P[j]![i]!), field.neg(field.one)]);
  rows.push([...S.map(() => field.one), field.zero]);
  const rhs = [...K.map(() => field.zero), field.one];
  const z = solveUnique(field, rows, rhs, S.length + 1);
  if (!z) return null;
  const strategy = new Array<T>(own).fill(field.zero);
  S.forEach((i, a) => (strategy[i] = z[a]!));
  return { strategy, value: z[S.length]! };
}

function payoffAgainst<T>(field: Field<T>, row: T[], s: T[]): T {
  let sum = field.zero;
  for (let i = 0; i < s.length; i++) sum = field.add(sum, field.mul(row[i]!, s[i]!));
  return sum;
}

function isBestResponseVertex<T>(field: Field<T>, P: T[][], c: { strategy: T[]; value: T }): boolean {
  if (c.strategy.some((v) => field.cmp(v, field.zero) < 0)) return false;
  return P.every((row) => field.cmp(payoffAgainst(field, row, c.strategy), c.value) <= 0);
}

/**
 * A vertex's support and the opponent's best responses to it. The support is the set of
 * strictly positive probabilities, never judged with the payoff tolerance: in floats a
 * probability of 1e-10 is still a mixed strategy (a near-degenerate stage can have its only
 * equilibrium there), and treating it as 0 while keeping the value solved with it would
 * make the vertex disagree with itself (floatCandidates has already snapped rounding noise
 * below 1e-12 to 0).
 */
function describe<T>(field: Field<T>, P: T[][], c: { strategy: T[]; value: T }): Vertex<T> {
  const positive = (v: T) => (field.exact ? field.cmp(v, field.zero) > 0 : field.toNumber(v) > 0);
  const strategy = c.strategy.map((v) => (positive(v) ? v : field.zero));
  return {
    strategy,
    value: c.value,
    support: strategy.flatMap((v, i) => (positive(v) ? [i] : [])),
    bestResponses: P.flatMap((row, j) => (field.cmp(payoffAgainst(field, row, strategy), c.value) === 0 ? [j] : [])),
  };
}

/** All k-element subsets of 0..n-1 in lexicographic order. */
function* subsets(n: number, k: number): Generator<number[]> {
  const idx = Array.from({ length: k }, (_, i) => i);
  for (;;) {
    yield [...idx];
    let i = k - 1;
    while (i >= 0 && idx[i] === n - k + i) i--;
    if (i < 0) return;
    idx[i]!++;
    for (let j = i + 1; j < k; j++) idx[j] = idx[j - 1]! + 1;
  }
}
