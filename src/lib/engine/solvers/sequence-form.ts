/**
 * One Nash equilibrium of a two-team game with imperfect information (and chance), by
 * Lemke's algorithm on the sequence form (Koller, Megiddo and von Stengel, Games and
 * Economic Behavior 14, 1996). Realization plans x, y satisfy E x = e, F y = f; the
 * equilibrium conditions form the linear complementarity problem
 *   w = q + M z >= 0, z >= 0, w . z = 0 with z = (x, y, u+, u-, v+, v-),
 *   M = [[0, -A, E', -E', 0, 0], [-B', 0, 0, 0, F', -F'], [-E, 0..], [E, 0..], [0, -F, ..], [0, F, ..]],
 *   q = (0, 0, e, -e, f, -f),
 * the free dual values split as u = u+ - u-. Payoffs are shifted to be negative, which
 * makes M copositive. Lemke's method runs with covering vector 1 and a lexicographic
 * ratio test, so degenerate games do not cycle.
 */
import type { Field } from '../numbers';
import { movers, reducedValues, type ReducedGame, type ReducedSolution } from '../reduced';

interface SequenceForm<T> {
  /** Sequences per team: index 0 is the empty sequence. */
  sequences: [number, number];
  /** For each team, infoset index -> [parent sequence, first sequence of its actions, action count]. */
  infosets: [Map<number, [number, number, number]>, Map<number, [number, number, number]>];
  /** Payoff entries: [seq of team 0, seq of team 1, payoff of team 0, payoff of team 1]. */
  entries: [number, number, T, T][];
}

function buildSequenceForm<T>(field: Field<T>, game: ReducedGame<T>, teams: [number, number]): SequenceForm<T> {
  const sf: SequenceForm<T> = { sequences: [1, 1], infosets: [new Map(), new Map()], entries: [] };
  const shift = payoffShift(field, game, teams);
  const stack: [number, number, number, T][] = [[0, 0, 0, field.one]];
  while (stack.length > 0) {
    const [i, s0, s1, p] = stack.pop()!;
    const node = game.nodes[i]!;
    if (node.kind === 'leaf') {
      const v = node.value!;
      if (field.cmp(p, field.zero) !== 0) {
        sf.entries.push([s0, s1, field.mul(p, field.sub(v[teams[0]]!, shift)), field.mul(p, field.sub(v[teams[1]]!, shift))]);
      }
      continue;
    }
    if (node.kind === 'chance') {
      node.children.forEach((c, k) => stack.push([c, s0, s1, field.mul(p, node.probs![k]!)]));
      continue;
    }
    const side = node.team === teams[0] ? 0 : 1;
    const own = side === 0 ? s0 : s1;
    let entry = sf.infosets[side].get(node.infoset!);
    if (!entry) {
      entry = [own, sf.sequences[side], node.children.length];
      sf.infosets[side].set(node.infoset!, entry);
      sf.sequences[side] += node.children.length;
    }
    const first = entry[1];
    node.children.forEach((c, k) => stack.push(side === 0 ? [c, first + k, s1, p] : [c, s0, first + k, p]));
  }
  return sf;
}

/** A constant making every leaf payoff of the two teams negative. */
function payoffShift<T>(field: Field<T>, game: ReducedGame<T>, teams: [number, number]): T {
  let max = field.zero;
  for (const node of game.nodes) {
    if (node.kind !== 'leaf') continue;
    for (const t of teams) if (field.cmp(node.value![t]!, max) > 0) max = node.value![t]!;
  }
  return field.add(max, field.one);
}

/** Rows of the constraint matrix E (root row, then one row per infoset) as sparse [column, coefficient]. */
function constraintRows(infosets: Map<number, [number, number, number]>): [number, number][][] {
  const rows: [number, number][][] = [[[0, 1]]];
  for (const [parent, first, count] of infosets.values()) {
    const row: [number, number][] = [[parent, -1]];
    for (let k = 0; k < count; k++) row.push([first + k, 1]);
    rows.push(row);
  }
  return rows;
}

export class RayTermination extends Error {}

/**
 * An equilibrium of a reduced game in which at most two teams move.
 * Throws RayTermination if Lemke's method ends on a ray (it should not for these games).
 */
export function sequenceFormEquilibrium<T>(field: Field<T>, game: ReducedGame<T>): ReducedSolution<T> {
  const active = movers(game);
  if (active.length > 2) throw new Error('the sequence form solver handles two teams');
  const teams: [number, number] = [active[0] ?? 0, active[1] ?? (active[0] === 0 ? 1 : 0)];
  const sf = buildSequenceForm(field, game, teams);
  const [n1, n2] = sf.sequences;
  const E = constraintRows(sf.infosets[0]);
  const F = constraintRows(sf.infosets[1]);
  const m1 = E.length;
  const m2 = F.length;
  // Variable blocks of z.
  const X = 0;
  const Y = n1;
  const UP = n1 + n2;
  const UM = UP + m1;
  const VP = UM + m1;
  const VM = VP + m2;
  const N = VM + m2;
  const M: T[][] = Array.from({ length: N }, () => new Array<T>(N).fill(field.zero));
  const q = new Array<T>(N).fill(field.zero);
  const addTo = (r: number, c: number, v: T) => (M[r]![c] = field.add(M[r]![c]!, v));
  for (const [s0, s1, a, b] of sf.entries) {
    addTo(X + s0, Y + s1, field.neg(a));
    addTo(Y + s1, X + s0, field.neg(b));
  }
  const one = field.one;
  const minusOne = field.neg(one);
  E.forEach((row, h) => {
    for (const [col, coef] of row) {
      const c = coef > 0 ? one : minusOne;
      addTo(X + col, UP + h, c);
      addTo(X + col, UM + h, field.neg(c));
      addTo(UP + h, X + col, field.neg(c));
      addTo(UM + h, X + col, c);
    }
  });
  F.forEach((row, h) => {
    for (const [col, coef] of row) {
      const c = coef > 0 ? one : minusOne;
      addTo(Y + col, VP + h, c);
      addTo(Y + col, VM + h, field.neg(c));
      addTo(VP + h, Y + col, field.neg(c));
      addTo(VM + h, Y + col, c);
    }
  });
  q[UP] = one;
  q[UM] = minusOne;
  q[VP] = one;
  q[VM] = minusOne;
  const z = lemke(field, M, q);
  const profile = new Map<number, T[]>();
  const plans: [T[], T[]] = [z.slice(X, X + n1), z.slice(Y, Y + n2)];
  sf.infosets.forEach((sets, side) => {
    const x = plans[side]!;
    for (const [infoset, [parent, first, count]] of sets) {
      const reach = x[parent]!;
      profile.set(
        infoset,
        Array.from({ length: count }, (_, k) =>
          field.cmp(reach, field.zero) > 0 ? field.div(x[first + k]!, reach) : k === 0 ? field.one : field.zero,
        ),
      );
    }
  });
  return { profile, value: reducedValues(field, game, profile)[0]! };
}

/**
 * Lemke's complementary pivoting for w = q + M z with covering vector 1.
 * Tableau columns: w (N), z (N), z0, right-hand side.
 */
function lemke<T>(field: Field<T>, M: T[][], q: T[]): T[] {
  const N = q.length;
  const Z0 = 2 * N;
  const RHS = 2 * N + 1;
  const T: T[][] = Array.from({ length: N }, (_, r) => {
    const row = new Array<T>(2 * N + 2).fill(field.zero);
    row[r] = field.one;
    for (let c = 0; c < N; c++) row[N + c] = field.neg(M[r]![c]!);
    row[Z0] = field.neg(field.one);
    row[RHS] = q[r]!;
    return row;
  });
  const basis = Array.from({ length: N }, (_, r) => r);
  if (q.every((v) => field.cmp(v, field.zero) >= 0)) return new Array<T>(N).fill(field.zero);
  // First pivot: z0 enters where q is most negative (the last such row keeps the tableau lexicographically positive).
  let leave = 0;
  for (let r = 1; r < N; r++) if (field.cmp(q[r]!, q[leave]!) <= 0) leave = r;
  let entering = Z0;
  const maxPivots = 50 * N + 1000;
  for (let step = 0; step < maxPivots; step++) {
    pivot(field, T, leave, entering);
    const left = basis[leave]!;
    basis[leave] = entering;
    if (left === Z0) return solution(field, T, basis, N);
    entering = left < N ? left + N : left - N;
    const row = ratioTest(field, T, entering, N);
    if (row < 0) throw new RayTermination("Lemke's method ended on a ray");
    leave = row;
  }
  throw new Error("Lemke's method did not finish within its pivot limit");
}

function pivot<T>(field: Field<T>, T: T[][], r: number, c: number) {
  const row = T[r]!;
  const p = row[c]!;
  for (let j = 0; j < row.length; j++) row[j] = field.div(row[j]!, p);
  for (let k = 0; k < T.length; k++) {
    if (k === r) continue;
    const other = T[k]!;
    const f = other[c]!;
    if (field.cmp(f, field.zero) === 0) continue;
    for (let j = 0; j < row.length; j++) {
      if (field.cmp(row[j]!, field.zero) !== 0) other[j] = field.sub(other[j]!, field.mul(f, row[j]!));
    }
    other[c] = field.zero;
  }
}

/** Lexicographic minimum ratio over rows with a positive entry in column c; -1 if none. */
function ratioTest<T>(field: Field<T>, T: T[][], c: number, N: number): number {
  let best = -1;
  const RHS = 2 * N + 1;
  for (let r = 0; r < T.length; r++) {
    if (field.cmp(T[r]![c]!, field.zero) <= 0) continue;
    if (best < 0) {
      best = r;
      continue;
    }
    const a = T[r]![c]!;
    const b = T[best]![c]!;
    let order = field.cmp(field.mul(T[r]![RHS]!, b), field.mul(T[best]![RHS]!, a));
    for (let j = 0; order === 0 && j < N; j++) order = field.cmp(field.mul(T[r]![j]!, b), field.mul(T[best]![j]!, a));
    if (order < 0) best = r;
  }
  return best;
}

function solution<T>(field: Field<T>, T: T[][], basis: number[], N: number): T[] {
  const z = new Array<T>(N).fill(field.zero);
  basis.forEach((v, r) => {
    if (v >= N && v < 2 * N) z[v - N] = T[r]![2 * N + 1]!;
  });
  return z;
}
