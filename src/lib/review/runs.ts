/**
 * Across the exercises of one scenario: how often each rung was chosen, the
 * lambda each team's play fits in every run, and the outcomes reached beside
 * the equilibrium outcome. Each run is reviewed on its own scenario version.
 */
import type { PlayRecord } from '../exercise/record';
import type { ExerciseState } from '../roles';
import type { Game } from './engine';
import { reviewPlay, type ReviewOptions } from './review';
import type { Review, TeamRef } from './types';

export type RunInput = { game: Game; record: PlayRecord };

export type RunSummary = {
  exerciseId: string;
  title: string;
  state: ExerciseState;
  startedAt: string | null;
  endedAt: string | null;
  /** How play ended (the terminal's outcome text), or null while it is under way. */
  outcome: string | null;
  equilibriumOutcome: string | null;
  /** True when play reached the same terminal as the subgame-perfect path. */
  reachedEquilibrium: boolean;
  moves: number;
  deviations: number;
  totalRegret: number;
  /** Fitted lambda per team id; null for a team without ladder moves. */
  lambdas: Record<string, number | null>;
  /** Team ids whose lambda is at the top of the range searched (read as "at least"). */
  lambdasAtBound: string[];
};

export type RungFrequency = { key: string; name: string; intensity: number; total: number; share: number; byTeam: Record<string, number> };

export type OutcomeCount = { outcome: string; runs: number; equilibrium: boolean };

export type RunsOverview = { teams: TeamRef[]; runs: RunSummary[]; rungs: RungFrequency[]; outcomes: OutcomeCount[] };

export const UNFINISHED = 'Not finished';

const outcomeName = (end: Review['actual']) => (end.terminal ? (end.outcome ?? `End at ${end.nodeId}`) : null);

function summarise(review: Review, record: PlayRecord): RunSummary {
  return {
    exerciseId: review.exerciseId,
    title: review.title,
    state: review.state,
    startedAt: record.startedAt,
    endedAt: record.endedAt,
    outcome: outcomeName(review.actual),
    equilibriumOutcome: outcomeName(review.equilibrium.end),
    reachedEquilibrium: review.actual.terminal && review.actual.nodeId === review.equilibrium.end.nodeId,
    moves: review.moves.length,
    deviations: review.moves.filter((m) => m.deviated).length,
    totalRegret: review.fits.reduce((sum, f) => sum + f.totalRegret, 0),
    lambdas: Object.fromEntries(review.fits.map((f) => [f.teamId, f.lambda])),
    lambdasAtBound: review.fits.filter((f) => f.lambdaBound === 'upper').map((f) => f.teamId),
  };
}

function rungFrequencies(reviews: Review[]): RungFrequency[] {
  const byKey = new Map<string, RungFrequency>();
  for (const review of reviews) {
    for (const rung of review.rungs) {
      if (!byKey.has(rung.key)) byKey.set(rung.key, { key: rung.key, name: rung.name, intensity: rung.intensity, total: 0, share: 0, byTeam: {} });
    }
    for (const move of review.moves) {
      if (!move.teamId || !move.rung) continue;
      const entry = byKey.get(move.rung.key)!;
      entry.total++;
      entry.byTeam[move.teamId] = (entry.byTeam[move.teamId] ?? 0) + 1;
    }
  }
  const all = [...byKey.values()].sort((a, b) => a.intensity - b.intensity);
  const chosen = all.reduce((sum, r) => sum + r.total, 0);
  return all.map((r) => ({ ...r, share: chosen === 0 ? 0 : r.total / chosen }));
}

function outcomeCounts(runs: RunSummary[]): OutcomeCount[] {
  const counts = new Map<string, OutcomeCount>();
  const bump = (outcome: string, equilibrium: boolean, by: number) => {
    const entry = counts.get(outcome) ?? { outcome, runs: 0, equilibrium: false };
    entry.runs += by;
    entry.equilibrium ||= equilibrium;
    counts.set(outcome, entry);
  };
  for (const run of runs) {
    bump(run.outcome ?? UNFINISHED, run.reachedEquilibrium, 1);
    if (run.equilibriumOutcome) bump(run.equilibriumOutcome, true, 0);
  }
  return [...counts.values()].sort((a, b) => b.runs - a.runs || a.outcome.localeCompare(b.outcome));
}

function teamsOf(reviews: Review[]): TeamRef[] {
  const byId = new Map<string, TeamRef>();
  for (const review of reviews) for (const team of review.teams) byId.set(team.id, team);
  return [...byId.values()];
}

export function compareRuns(inputs: RunInput[], options: ReviewOptions = {}): RunsOverview {
  return compareReviews(inputs.map(({ game, record }) => ({ review: reviewPlay(game, record, options), record })));
}

/** The same from reviews already made. */
export function compareReviews(items: { review: Review; record: PlayRecord }[]): RunsOverview {
  const reviews = items.map((item) => item.review);
  const runs = items.map(({ review, record }) => summarise(review, record));
  return { teams: teamsOf(reviews), runs, rungs: rungFrequencies(reviews), outcomes: outcomeCounts(runs) };
}
