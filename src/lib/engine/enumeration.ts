/**
 * Counting and listing equilibria that combine the equilibria of subtrees.
 * A Summary holds the distinct value vectors a subtree can take across its equilibria,
 * with how many equilibria (strategy profiles) give each and how many distinct plays:
 * equilibria that behave alike at every node reached with positive probability are one
 * play, whatever they do elsewhere. A play determines its value, so the plays of
 * different values are different plays. The odometer walks tuples of children's listed
 * equilibria in lexicographic order (the last child fastest).
 */
import type { Field } from './numbers';

export interface Summary<T> {
  values: T[][];
  counts: number[];
  plays: number[];
  /** open[k]: a play of value k passes a stage with a continuum of equilibria, so it stands for more plays than counted. */
  open: boolean[];
  /** Set when distinct values were dropped at SUMMARY_CAP: counts are then lower bounds. */
  truncated?: boolean;
}

const SUMMARY_CAP = 1024;

export function emptySummary<T>(truncated?: boolean): Summary<T> {
  return { values: [], counts: [], plays: [], open: [], truncated: truncated || undefined };
}

export function singleSummary<T>(value: T[]): Summary<T> {
  return { values: [value], counts: [1], plays: [1], open: [false] };
}

function sameVector<T>(field: Field<T>, a: T[], b: T[]): boolean {
  return a.every((v, t) => field.cmp(v, b[t]!) === 0);
}

/** Add `count` equilibria and `plays` new plays of this value (plays 0 when they repeat plays already added). */
export function addToSummary<T>(field: Field<T>, into: Summary<T>, value: T[], count: number, plays: number, open = false) {
  const at = into.values.findIndex((v) => sameVector(field, v, value));
  if (at >= 0) {
    into.counts[at]! += count;
    into.plays[at]! += plays;
    into.open[at] ||= open;
  } else if (into.values.length < SUMMARY_CAP) {
    into.values.push(value);
    into.counts.push(count);
    into.plays.push(plays);
    into.open.push(open);
  } else into.truncated = true;
}

export function summaryTotal<T>(summary: Summary<T>): number {
  return summary.counts.reduce((a, b) => a + b, 0);
}

/** The distinct expected payoffs of the plays, with how many plays reach each. */
export interface PlayPayoffs {
  payoffs: number[];
  payoffsExact?: string[];
  plays: number;
}

/** How many distinct plays the counted equilibria make, and what they are worth. */
export interface EquilibriumPlays {
  /** Distinct equilibrium plays: equilibria alike at every node reached with positive probability (every chance branch included) count once. */
  plays: number;
  /** False when `plays` is a lower bound: as for the count, or a stage on some play may have a continuum of equilibria. */
  playsExact: boolean;
  /** Distinct expected payoff vectors (team order) of the plays, at most PLAY_PAYOFFS_LISTED; the first listed equilibrium's first. */
  playPayoffs: PlayPayoffs[];
  /** How many distinct expected payoff vectors the plays have in all (a lower bound when playsExact is false). */
  distinctPayoffs: number;
}

export const PLAY_PAYOFFS_LISTED = 5;

/**
 * The plays of a root summary. `complete` is false when some part's equilibria were not
 * all found; `first` is the value of the first listed equilibrium, put first.
 */
export function equilibriumPlays<T>(field: Field<T>, summary: Summary<T>, complete: boolean, first: T[]): EquilibriumPlays {
  const plays = summary.plays.reduce((a, b) => a + b, 0);
  const order = summary.values.map((_, k) => k);
  const lead = summary.values.findIndex((v) => sameVector(field, v, first));
  if (lead > 0) order.unshift(...order.splice(lead, 1));
  return {
    plays,
    playsExact: complete && !summary.truncated && Number.isSafeInteger(plays) && !summary.open.some(Boolean),
    playPayoffs: order.slice(0, PLAY_PAYOFFS_LISTED).map((k) => ({
      payoffs: summary.values[k]!.map((v) => field.toNumber(v)),
      ...(field.exact ? { payoffsExact: summary.values[k]!.map((v) => field.format(v)!) } : {}),
      plays: summary.plays[k]!,
    })),
    distinctPayoffs: summary.values.length,
  };
}

/**
 * Equilibria at a perfect-information decision node of team m: action a with child value
 * v is chosen in count(v) * prod over other actions b of (equilibria of b whose value for
 * m is at most v[m]). Its plays are the plays of v below a, when every other action has
 * such an equilibrium: what the other actions do is off the path.
 */
export function decisionSummary<T>(field: Field<T>, m: number, children: Summary<T>[]): Summary<T> {
  const out = emptySummary<T>(children.some((c) => c.truncated));
  children.forEach((child, a) => {
    child.values.forEach((v, j) => {
      let count = child.counts[j]!;
      for (let b = 0; b < children.length && count > 0; b++) {
        if (b === a) continue;
        const other = children[b]!;
        let atMost = 0;
        other.values.forEach((w, k) => {
          if (field.cmp(w[m]!, v[m]!) <= 0) atMost += other.counts[k]!;
        });
        count *= atMost;
      }
      if (count > 0) addToSummary(field, out, v, count, child.plays[j]!, child.open[j]);
    });
  });
  return out;
}

/**
 * Equilibria at a chance node: every combination of the children's equilibria, valued by
 * expectation. A play follows every outcome of positive probability, so plays multiply;
 * an outcome of probability zero is off the path and adds no plays.
 */
export function chanceSummary<T>(field: Field<T>, children: Summary<T>[], weights: T[]): Summary<T> {
  const teams = children[0]!.values[0]!.length;
  let acc: Summary<T> = singleSummary(new Array<T>(teams).fill(field.zero));
  children.forEach((child, c) => {
    const reached = field.cmp(weights[c]!, field.zero) !== 0 ? child : offPath(child);
    const next = emptySummary<T>(acc.truncated || reached.truncated);
    acc.values.forEach((base, i) => {
      reached.values.forEach((v, j) => {
        const sum = base.map((b, t) => field.add(b, field.mul(weights[c]!, v[t]!)));
        addToSummary(field, next, sum, acc.counts[i]! * reached.counts[j]!, acc.plays[i]! * reached.plays[j]!, acc.open[i] || reached.open[j]);
      });
    });
    acc = next;
  });
  return acc;
}

/** A subtree play never reaches: all its equilibria in one entry, as one play (its value is weighted by zero). */
function offPath<T>(summary: Summary<T>): Summary<T> {
  if (summary.values.length === 0) return summary;
  return { values: [summary.values[0]!], counts: [summaryTotal(summary)], plays: [1], open: [false], truncated: summary.truncated };
}

export function expectation<T>(field: Field<T>, values: T[][], weights: T[]): T[] {
  return values[0]!.map((_, t) => values.reduce((sum, v, c) => field.add(sum, field.mul(weights[c]!, v[t]!)), field.zero));
}

/** Next tuple in lexicographic order (the last position fastest); false after the last one. */
export function advanceOdometer(picks: number[], sizes: number[]): boolean {
  for (let c = picks.length - 1; c >= 0; c--) {
    if (picks[c]! + 1 < sizes[c]!) {
      picks[c]!++;
      return true;
    }
    picks[c] = 0;
  }
  return false;
}
