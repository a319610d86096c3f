/** Review: actual play against the subgame-perfect equilibrium. Pure functions over a game and play records. */
export { reviewPlay, observationsOf, DEFAULT_TREMBLE, type ReviewOptions } from './review';
export { engineObservations } from './likelihood';
export { equilibriumCountSentence } from './count-sentence';
export { compareRuns, compareReviews, UNFINISHED, type RunInput, type RunsOverview, type RunSummary, type RungFrequency, type OutcomeCount } from './runs';
export { PlayMismatch } from './paths';
export { REVIEW_TABLES, RUNS_TABLES, type ReviewTable, type RunsTable } from './tables';
export { toCsv, csvCell, type Column } from './csv';
export type * from './types';
