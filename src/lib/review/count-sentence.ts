/** The sentence Review and the report draft give the equilibrium count: the plays first, the strategy profiles after. */
import { equilibriumCountPhrase, hasSeveralPlays, type EquilibriumCounts } from './engine';

/** Null for a single equilibrium, where there is nothing to say. */
export function equilibriumCountSentence(counts: EquilibriumCounts): string | null {
  if (counts.count === 1 && counts.countExact) return null;
  return `The scenario has ${equilibriumCountPhrase(counts)}${hasSeveralPlays(counts) ? '; the comparison uses the first' : ''}.`;
}
