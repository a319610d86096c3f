/**
 * Counting and listing equilibria that combine the equilibria of subtrees.
 * A Summary holds the distinct value vectors a subtree can take across its equilibria,
 * with how many equilibria give each; the odometer walks tuples of children's listed
 * equilibria in lexicographic order (the last child fastest).
 */
import type { Field } from './numbers';

export interface Summary<T> {
  values: T[][];
  counts: number[];
  /** Set when distinct values were dropped at SUMMARY_CAP: counts are then lower bounds. */
  truncated?: boolean;
}

const SUMMARY_CAP = 1024;

export function singleSummary<T>(value: T[]): Summary<T> {
  return { values: [value], counts: [1] };
}

function sameVector<T>(field: Field<T>, a: T[], b: T[]): boolean {
  return a.every((v, t) => field.cmp(v, b[t]!) === 0);
}

export function addToSummary<T>(field: Field<T>, into: Summary<T>, value: T[], count: number) {
  const at = into.values.findIndex((v) => sameVector(field, v, value));
  if (at >= 0) into.counts[at]! += count;
  else if (into.values.length < SUMMARY_CAP) {
    into.values.push(value);
    into.counts.push(count);
  } else into.truncated = true;
}

export function summaryTotal<T>(summary: Summary<T>): number {
  return summary.counts.reduce((a, b) => a + b, 0);
}

/**
 * Equilibria at a perfect-information decision node of team m: action a with child value
 * v is chosen in count(v) * prod over other actions b of (equilibria of b whose value for
 * m is at most v[m]).
 */
export function decisionSummary<T>(field: Field<T>, m: number, children: Summary<T>[]): Summary<T> {
  const out: Summary<T> = { values: [], counts: [], truncated: children.some((c) => c.truncated) || undefined };
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
      if (count > 0) addToSummary(field, out, v, count);
    });
  });
  return out;
}

/** Equilibria at a chance node: every combination of the children's equilibria, valued by expectation. */
export function chanceSummary<T>(field: Field<T>, children: Summary<T>[], weights: T[]): Summary<T> {
  const teams = children[0]!.values[0]!.length;
  let acc: Summary<T> = { values: [new Array<T>(teams).fill(field.zero)], counts: [1] };
  children.forEach((child, c) => {
    const next: Summary<T> = { values: [], counts: [], truncated: acc.truncated || child.truncated || undefined };
    acc.values.forEach((base, i) => {
      child.values.forEach((v, j) => {
        const sum = base.map((b, t) => field.add(b, field.mul(weights[c]!, v[t]!)));
        addToSummary(field, next, sum, acc.counts[i]! * child.counts[j]!);
      });
    });
    acc = next;
  });
  return acc;
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
