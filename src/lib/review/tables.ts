/** The review's tables as CSV downloads: one column set per table, shared by every export. */
import { toCsv, type Column } from './csv';
import type { RunsOverview, RunSummary, RungFrequency, OutcomeCount } from './runs';
import type { Counterfactual, LevelPoint, MoveReview, Review, TeamFit, TimelineEntry } from './types';

const round = (value: number | null, places = 4) => (value === null ? null : Number(value.toFixed(places)));

const MOVE_COLUMNS: Column<MoveReview>[] = [
  { header: 'step', value: (m) => m.step },
  { header: 'turn', value: (m) => m.turn },
  { header: 'mover', value: (m) => m.mover },
  { header: 'move', value: (m) => m.label },
  { header: 'kind', value: (m) => m.kind },
  { header: 'equilibrium action', value: (m) => m.equilibriumAction },
  { header: 'deviated', value: (m) => m.deviated },
  { header: 'regret', value: (m) => round(m.regret) },
  { header: 'QRE probability', value: (m) => round(m.qreProbability) },
  { header: 'rung after', value: (m) => m.rung?.name },
  { header: 'equilibrium rung', value: (m) => m.equilibriumRung?.name },
  { header: 'confidence', value: (m) => m.confidence },
  { header: 'rationale', value: (m) => m.rationale },
  { header: 'adjudication reason', value: (m) => m.reason },
  { header: 'node', value: (m) => m.nodeId },
  { header: 'at', value: (m) => m.at },
];

const TEAM_COLUMNS: Column<TeamFit>[] = [
  { header: 'team', value: (f) => f.team },
  { header: 'moves fitted', value: (f) => f.moves },
  { header: 'deviations', value: (f) => f.deviations },
  { header: 'total regret', value: (f) => round(f.totalRegret) },
  { header: 'lambda', value: (f) => round(f.lambda) },
  { header: 'lambda at bound', value: (f) => f.lambdaBound ?? '' },
  { header: 'log-likelihood QRE', value: (f) => round(f.logLikelihood.qre) },
  { header: 'log-likelihood uniform', value: (f) => round(f.logLikelihood.uniform) },
  { header: 'log-likelihood equilibrium with trembles', value: (f) => round(f.logLikelihood.trembles) },
];

const LEVEL_COLUMNS: Column<LevelPoint>[] = [
  { header: 'turn', value: (p) => p.turn },
  { header: 'actual intensity', value: (p) => p.actual },
  { header: 'actual rung', value: (p) => p.actualRung },
  { header: 'equilibrium intensity', value: (p) => p.equilibrium },
  { header: 'equilibrium rung', value: (p) => p.equilibriumRung },
];

const COUNTERFACTUAL_COLUMNS: Column<Counterfactual>[] = [
  { header: 'turn', value: (c) => c.turn },
  { header: 'team', value: (c) => c.team },
  { header: 'move made', value: (c) => c.label },
  { header: 'equilibrium action', value: (c) => c.equilibriumAction },
  { header: 'equilibrium from here would end', value: (c) => c.instead.outcome ?? c.instead.nodeId },
  { header: 'equilibrium after the move would end', value: (c) => c.after.outcome ?? c.after.nodeId },
];

function timelineText(e: TimelineEntry): string {
  switch (e.kind) {
    case 'move':
      return e.move.label;
    case 'note':
      return e.note.text;
    case 'inject':
      return `${e.inject.title}: ${e.inject.body}`;
    case 'ending':
      return `Ended at ${e.ending.outcome}${e.ending.reason ? `: ${e.ending.reason}` : ''}`;
  }
}

const TIMELINE_COLUMNS: Column<TimelineEntry>[] = [
  { header: 'at', value: (e) => e.at },
  { header: 'turn', value: (e) => e.turn },
  { header: 'kind', value: (e) => e.kind },
  { header: 'who', value: (e) => (e.kind === 'move' ? e.move.mover : e.kind === 'note' ? e.note.authorName : 'Facilitator') },
  { header: 'text', value: timelineText },
  { header: 'tags', value: (e) => (e.kind === 'note' ? e.note.tags.join('; ') : null) },
];

type Table<S> = { title: string; csv: (source: S) => string };

export const REVIEW_TABLES = {
  moves: { title: 'Moves against the equilibrium', csv: (r) => toCsv(r.moves, MOVE_COLUMNS) },
  teams: { title: 'Teams: fitted lambda and log-likelihoods', csv: (r) => toCsv(r.fits, TEAM_COLUMNS) },
  escalation: { title: 'Escalation by turn', csv: (r) => toCsv(r.escalation, LEVEL_COLUMNS) },
  counterfactuals: { title: 'Counterfactual endings', csv: (r) => toCsv(r.counterfactuals, COUNTERFACTUAL_COLUMNS) },
  timeline: { title: 'Timeline with observer notes', csv: (r) => toCsv(r.timeline, TIMELINE_COLUMNS) },
} satisfies Record<string, Table<Review>>;

export type ReviewTable = keyof typeof REVIEW_TABLES;

function runColumns(overview: RunsOverview): Column<RunSummary>[] {
  return [
    { header: 'exercise', value: (r) => r.title },
    { header: 'state', value: (r) => r.state },
    { header: 'ended', value: (r) => r.endedAt },
    { header: 'outcome', value: (r) => r.outcome },
    { header: 'equilibrium outcome', value: (r) => r.equilibriumOutcome },
    { header: 'reached equilibrium', value: (r) => r.reachedEquilibrium },
    { header: 'moves', value: (r) => r.moves },
    { header: 'deviations', value: (r) => r.deviations },
    { header: 'total regret', value: (r) => round(r.totalRegret) },
    ...overview.teams.flatMap((t): Column<RunSummary>[] => [
      { header: `lambda ${t.name}`, value: (r) => round(r.lambdas[t.id] ?? null) },
      { header: `lambda ${t.name} at upper bound`, value: (r) => r.lambdasAtBound.includes(t.id) },
    ]),
  ];
}

function rungColumns(overview: RunsOverview): Column<RungFrequency>[] {
  return [
    { header: 'rung', value: (r) => r.name },
    { header: 'intensity', value: (r) => r.intensity },
    { header: 'times chosen', value: (r) => r.total },
    { header: 'share', value: (r) => round(r.share) },
    ...overview.teams.map((t): Column<RungFrequency> => ({ header: `by ${t.name}`, value: (r) => r.byTeam[t.id] ?? 0 })),
  ];
}

const OUTCOME_COLUMNS: Column<OutcomeCount>[] = [
  { header: 'outcome', value: (o) => o.outcome },
  { header: 'runs', value: (o) => o.runs },
  { header: 'equilibrium outcome', value: (o) => o.equilibrium },
];

export const RUNS_TABLES = {
  runs: { title: 'Runs: outcome and lambda by team', csv: (o) => toCsv(o.runs, runColumns(o)) },
  rungs: { title: 'How often each rung was chosen', csv: (o) => toCsv(o.rungs, rungColumns(o)) },
  outcomes: { title: 'Outcomes reached', csv: (o) => toCsv(o.outcomes, OUTCOME_COLUMNS) },
} satisfies Record<string, Table<RunsOverview>>;

export type RunsTable = keyof typeof RUNS_TABLES;
