/**
 * Sensitivity of the equilibrium path to each terminal payoff: for every terminal and
 * team, the interval of that one payoff (all others held) over which equilibrium play
 * stays the same.
 *
 * Perfect information, exact: along the line from the terminal up to the root each
 * node's value is a piecewise-linear function of the payoff x; a decision node splits a
 * piece where the child's value for the mover crosses the best alternative. The pieces
 * at the root record every choice on that line, so the interval is the run of pieces
 * around the current x in which the choices that equilibrium play meets are unchanged.
 *
 * Imperfect information, numerical: x is moved up and down (doubling, then bisection)
 * and only the proper subgames above the terminal are re-solved, up to the first whose
 * value comes out unchanged; the signature compared is the support of play at the
 * information sets reached. A direction in which no choice can feel x (see
 * RollUpSession.choicesFixed) is not searched. Intervals are then flagged approximate,
 * and a bound that is not found within the search span is reported as null.
 */
import { CHANCE, TERMINAL, compiledGame, isPerfectInformation, parentsOf, sourceOf, type FlatGame } from '../compile';
import type { Game } from '../model';
import { exactField, floatField, type Field } from '../numbers';
import { numbersOf } from '../profile';
import { solveFlatWith } from './backward-induction';
import type { Progress } from './qre';
import { RollUpSession } from './subgame-perfect';

export interface PayoffInterval {
  terminalId: string;
  team: string;
  value: number;
  /** Lowest value keeping the path; null when there is none (unbounded, or not found within the search span). */
  low: number | null;
  high: number | null;
  valueExact?: string;
  lowExact?: string | null;
  highExact?: string | null;
  approximate: boolean;
}

export interface SensitivityOptions {
  exact?: boolean;
  /** Terminal ids to analyse (default: all). */
  terminals?: string[];
  progress?: Progress;
}

export interface SensitivityResult {
  method: string;
  intervals: PayoffInterval[];
}

export function sensitivity(game: Game, options: SensitivityOptions = {}): SensitivityResult {
  const flat = compiledGame(game);
  const terminals = selectTerminals(flat, options.terminals);
  if (isPerfectInformation(flat)) {
    const intervals = options.exact ? exactIntervals(flat, exactField, terminals, options.progress) : exactIntervals(flat, floatField, terminals, options.progress);
    return { method: `piecewise-linear propagation (${options.exact ? 'exact' : 'float'})`, intervals };
  }
  return { method: 'bisection over re-solved subgames (float, approximate)', intervals: numericIntervals(flat, terminals, options.progress) };
}

function selectTerminals(flat: FlatGame, ids?: string[]): number[] {
  const source = sourceOf(flat);
  if (!ids) {
    const all: number[] = [];
    for (let i = 0; i < flat.size; i++) if (flat.mover[i] === TERMINAL) all.push(i);
    return all;
  }
  return ids.map((id) => {
    const i = source.indexOf.get(id);
    if (i === undefined || flat.mover[i] !== TERMINAL) throw new Error(`"${id}" is not a terminal node`);
    return i;
  });
}

/** An affine piece: on [from, to] (null = unbounded) the value vector is a * x + b; `choices` along the line. */
interface Piece<T> {
  from: T | null;
  to: T | null;
  a: T[];
  b: T[];
  choices: number[];
}

function exactIntervals<T>(flat: FlatGame, field: Field<T>, terminals: number[], progress?: Progress): PayoffInterval[] {
  const source = sourceOf(flat);
  const numbers = numbersOf(flat, field);
  const base = solveFlatWith(flat, field, numbers);
  const parent = parentsOf(flat);
  const onPlay = playedNodes(flat, base.choice);
  const out: PayoffInterval[] = [];
  terminals.forEach((z, n) => {
    const line: number[] = [];
    for (let x = parent[z]!; x >= 0; x = parent[x]!) line.push(x);
    for (let t = 0; t < flat.teams; t++) {
      const x0 = numbers.payoff[flat.aux[z]! * flat.teams + t]!;
      const pieces = propagate(flat, field, base, numbers.prob, z, t, line);
      const [low, high] = keptRange(field, pieces, x0, line, base.choice, onPlay);
      out.push(interval(field, source.nodes[z]!.id, source.game.teams[t]!.id, x0, low, high, false));
    }
    if (n % 64 === 63) progress?.((n + 1) / terminals.length, 'payoff intervals');
  });
  progress?.(1, 'payoff intervals');
  return out;
}

function playedNodes(flat: FlatGame, choice: Int32Array): Uint8Array {
  const played = new Uint8Array(flat.size);
  played[0] = 1;
  for (let i = 0; i < flat.size; i++) {
    if (!played[i] || flat.mover[i] === TERMINAL) continue;
    for (let c = flat.childStart[i]!; c < flat.childStart[i + 1]!; c++) {
      if (flat.mover[i] === CHANCE || c - flat.childStart[i]! === choice[i]) played[c] = 1;
    }
  }
  return played;
}

function propagate<T>(
  flat: FlatGame,
  field: Field<T>,
  base: { value: T[]; choice: Int32Array },
  prob: T[],
  z: number,
  t: number,
  line: number[],
): Piece<T>[] {
  const teams = flat.teams;
  const row = (i: number) => base.value.slice(i * teams, (i + 1) * teams);
  const a0 = Array.from({ length: teams }, (_, s) => (s === t ? field.one : field.zero));
  const b0 = row(z).map((v, s) => (s === t ? field.zero : v));
  let pieces: Piece<T>[] = [{ from: null, to: null, a: a0, b: b0, choices: [] }];
  let child = z;
  for (const p of line) {
    const first = flat.childStart[p]!;
    const k = child - first;
    const next: Piece<T>[] = [];
    if (flat.mover[p] === CHANCE) {
      const w = prob[flat.aux[p]! + k]!;
      const rest = row(p).map((v, s) => field.sub(v, field.mul(w, base.value[child * teams + s]!)));
      for (const piece of pieces) {
        next.push({ ...piece, a: piece.a.map((v) => field.mul(w, v)), b: piece.b.map((v, s) => field.add(field.mul(w, v), rest[s]!)), choices: [...piece.choices, -1] });
      }
    } else {
      const m = flat.mover[p]!;
      let alt = -1;
      for (let c = first; c < flat.childStart[p + 1]!; c++) {
        if (c !== child && (alt < 0 || field.cmp(base.value[c * teams + m]!, base.value[alt * teams + m]!) > 0)) alt = c;
      }
      for (const piece of pieces) next.push(...splitAtDecision(field, piece, m, k, alt < 0 ? null : { index: alt - first, value: row(alt) }));
    }
    pieces = merge(field, next);
    child = p;
  }
  return pieces;
}

/** At a decision of team m: action k (the line) against the best alternative `alt`; the earlier action wins ties. */
function splitAtDecision<T>(field: Field<T>, piece: Piece<T>, m: number, k: number, alt: { index: number; value: T[] } | null): Piece<T>[] {
  const keep = (from: T | null, to: T | null): Piece<T> => ({ from, to, a: piece.a, b: piece.b, choices: [...piece.choices, k] });
  if (!alt) return [keep(piece.from, piece.to)];
  const leave = (from: T | null, to: T | null): Piece<T> => ({
    from,
    to,
    a: alt.value.map(() => field.zero),
    b: alt.value,
    choices: [...piece.choices, alt.index],
  });
  const slope = piece.a[m]!;
  const gap = field.sub(alt.value[m]!, piece.b[m]!);
  const winsTie = k < alt.index;
  // The line's action is kept where slope * x - gap > 0 (or = 0 and it comes first).
  const keptAt = (x: T) => {
    const order = field.cmp(field.mul(slope, x), gap);
    return order > 0 || (order === 0 && winsTie);
  };
  if (field.cmp(slope, field.zero) !== 0) {
    const cross = field.div(gap, slope);
    const inside = (piece.from === null || field.cmp(cross, piece.from) > 0) && (piece.to === null || field.cmp(cross, piece.to) < 0);
    if (inside) {
      const rising = field.cmp(slope, field.zero) > 0;
      return rising ? [leave(piece.from, cross), keep(cross, piece.to)] : [keep(piece.from, cross), leave(cross, piece.to)];
    }
  }
  return [keptAt(interiorPoint(field, piece)) ? keep(piece.from, piece.to) : leave(piece.from, piece.to)];
}

/** A point strictly inside a piece. */
function interiorPoint<T>(field: Field<T>, piece: Piece<T>): T {
  if (piece.from !== null && piece.to !== null) return field.div(field.add(piece.from, piece.to), field.fromNumber(2));
  if (piece.from !== null) return field.add(piece.from, field.one);
  if (piece.to !== null) return field.sub(piece.to, field.one);
  return field.zero;
}

function merge<T>(field: Field<T>, pieces: Piece<T>[]): Piece<T>[] {
  const out: Piece<T>[] = [];
  for (const piece of pieces) {
    const last = out[out.length - 1];
    const same =
      last &&
      last.choices.every((c, i) => c === piece.choices[i]) &&
      last.a.every((v, s) => field.cmp(v, piece.a[s]!) === 0) &&
      last.b.every((v, s) => field.cmp(v, piece.b[s]!) === 0);
    if (same) last.to = piece.to;
    else out.push(piece);
  }
  return out;
}

/** Ends of the run of pieces around x0 in which the played choices on the line equal the base choices. */
function keptRange<T>(field: Field<T>, pieces: Piece<T>[], x0: T, line: number[], baseChoice: Int32Array, onPlay: Uint8Array): [T | null, T | null] {
  const matches = (piece: Piece<T>) => line.every((p, j) => !onPlay[p] || piece.choices[j] === -1 || piece.choices[j] === baseChoice[p]);
  let at = pieces.findIndex((p) => (p.from === null || field.cmp(x0, p.from) >= 0) && (p.to === null || field.cmp(x0, p.to) <= 0) && matches(p));
  if (at < 0) at = pieces.findIndex((p) => (p.from === null || field.cmp(x0, p.from) >= 0) && (p.to === null || field.cmp(x0, p.to) <= 0));
  let lo = at;
  let hi = at;
  while (lo > 0 && matches(pieces[lo - 1]!)) lo--;
  while (hi < pieces.length - 1 && matches(pieces[hi + 1]!)) hi++;
  return [pieces[lo]!.from, pieces[hi]!.to];
}

function interval<T>(field: Field<T>, terminalId: string, team: string, x0: T, low: T | null, high: T | null, approximate: boolean): PayoffInterval {
  return {
    terminalId,
    team,
    value: field.toNumber(x0),
    low: low === null ? null : field.toNumber(low),
    high: high === null ? null : field.toNumber(high),
    ...(field.exact
      ? { valueExact: field.format(x0)!, lowExact: low === null ? null : field.format(low)!, highExact: high === null ? null : field.format(high)! }
      : {}),
    approximate,
  };
}

function numericIntervals(flat: FlatGame, terminals: number[], progress?: Progress): PayoffInterval[] {
  const source = sourceOf(flat);
  const numbers = numbersOf(flat, floatField);
  const session = new RollUpSession(flat, floatField, { payoff: [...numbers.payoff], prob: numbers.prob });
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of flat.payoff) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  const scale = Math.max(hi - lo, 1);
  const out: PayoffInterval[] = [];
  terminals.forEach((z, n) => {
    const chain = session.chainAbove(z);
    const moving = new Set(chain.flatMap((r) => session.moversIn(r)));
    for (let t = 0; t < flat.teams; t++) {
      const x0 = session.payoff(z, t);
      const id = source.nodes[z]!.id;
      const team = source.game.teams[t]!.id;
      if (!moving.has(t)) {
        out.push(interval(floatField, id, team, x0, null, null, false));
        continue;
      }
      const base = session.playSignature(chain);
      const same = (x: number) => {
        session.setPayoff(z, t, x, chain);
        return session.playSignature(chain) === base;
      };
      const high = session.choicesFixed(z, t, 1, chain) ? null : searchBound(same, x0, scale, 1);
      const low = session.choicesFixed(z, t, -1, chain) ? null : searchBound(same, x0, scale, -1);
      session.setPayoff(z, t, x0, chain);
      out.push(interval(floatField, id, team, x0, low, high, true));
    }
    progress?.((n + 1) / terminals.length, 'payoff intervals');
  });
  return out;
}

/** The search steps away from the payoff: scale / 1024 doubled up to 16 times (the last is 64 times the payoff range). */
const STEPS = 17;
/** Every STRIDE-th step is tried first; the steps between are searched only where play has changed. */
const STRIDE = 4;

/**
 * The bound in `direction` where `same` stops holding: the first of the doubling steps
 * where play differs, then bisection between it and the step before. The steps are tried
 * STRIDE apart, then halved back to the first that differs; so a change of play confined
 * between two tried steps (play changing and changing back) is not seen.
 */
function searchBound(same: (x: number) => boolean, x0: number, scale: number, direction: 1 | -1): number | null {
  const step = (k: number) => (k < 0 ? 0 : (scale / 1024) * 2 ** k);
  const sameAt = (k: number) => same(x0 + direction * step(k));
  let kept = -1;
  let changed = -1;
  for (let k = 0; k < STEPS && changed < 0; k += STRIDE) {
    if (sameAt(k)) kept = k;
    else changed = k;
  }
  if (changed < 0) return null;
  while (changed - kept > 1) {
    const mid = (kept + changed) >> 1;
    if (sameAt(mid)) kept = mid;
    else changed = mid;
  }
  let inside = step(kept);
  let outside = step(changed);
  const resolution = 10 ** Math.floor(Math.log10(scale * 1e-6));
  while (outside - inside > resolution / 4) {
    const mid = (inside + outside) / 2;
    if (same(x0 + direction * mid)) inside = mid;
    else outside = mid;
  }
  const decimals = Math.max(0, -Math.round(Math.log10(resolution)));
  return Number((x0 + (direction * (inside + outside)) / 2).toFixed(decimals));
}
