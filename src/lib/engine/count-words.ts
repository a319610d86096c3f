/**
 * How many subgame-perfect equilibria there are, in words for facilitators. What matters
 * is how many distinct ways of playing the game they make, and whether those lead to
 * different payoffs; the number of strategy profiles (which ties off the path multiply)
 * follows in brackets.
 */
import type { SubgamePerfectResult } from './solvers/subgame-perfect';

/** The counts every screen that shows them keeps (the Review stores this much). */
export type EquilibriumCounts = Pick<SubgamePerfectResult, 'count' | 'countExact' | 'plays' | 'playsExact' | 'distinctPayoffs'>;

export function equilibriumCounts(result: EquilibriumCounts): EquilibriumCounts {
  const { count, countExact, plays, playsExact, distinctPayoffs } = result;
  return { count, countExact, plays, playsExact, distinctPayoffs };
}

const number = (n: number) => n.toLocaleString('en-GB');
const atLeast = (exact: boolean) => (exact ? '' : 'at least ');

/** True when there is more than one play, or there may be. */
export function hasSeveralPlays(counts: EquilibriumCounts): boolean {
  return counts.plays > 1 || !counts.playsExact;
}

/**
 * "One equilibrium play (294,912 strategy profiles that differ only at moves off the
 * path)", "3 distinct equilibrium plays, with 2 different expected payoffs for the teams
 * (12 strategy profiles)". No final full stop: screens add what they show of them.
 */
export function equilibriumCountWords(counts: EquilibriumCounts): string {
  const phrase = equilibriumCountPhrase(counts);
  return phrase.charAt(0).toUpperCase() + phrase.slice(1);
}

/** The same words inside a sentence: "The scenario has one equilibrium play (...)". */
export function equilibriumCountPhrase(counts: EquilibriumCounts): string {
  const profiles = `${atLeast(counts.countExact)}${number(counts.count)} strategy profiles`;
  if (!hasSeveralPlays(counts)) {
    return counts.count === 1 && counts.countExact
      ? 'one equilibrium play (a single subgame-perfect equilibrium)'
      : `one equilibrium play (${profiles} that differ only at moves off the path)`;
  }
  const plays = counts.plays === 1 ? 'at least one equilibrium play' : `${atLeast(counts.playsExact)}${number(counts.plays)} distinct equilibrium plays`;
  const extra = counts.count === counts.plays && counts.countExact === counts.playsExact ? '' : ` (${profiles})`;
  return `${plays}${counts.plays > 1 ? payoffWords(counts) : ''}${extra}`;
}

function payoffWords(counts: EquilibriumCounts): string {
  if (counts.distinctPayoffs > 1) return `, with ${atLeast(counts.playsExact)}${number(counts.distinctPayoffs)} different expected payoffs for the teams`;
  return counts.playsExact ? ', all with the same expected payoffs for every team' : ', all those found with the same expected payoffs';
}
