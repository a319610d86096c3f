/**
 * The analysis a report carries as data: figures (charts) and tables made from
 * a review when the draft is generated. They travel inside the document as one
 * JSON attribute each, so an issued version keeps exactly the numbers it was
 * issued with. Every reader parses them through these schemas.
 */
import { z } from 'zod';
import type { Review } from '../review';
import { anyAtUpperBound, LAMBDA_BOUND_NOTE, lambdaText } from '../review/lambda-text';

const finite = z.number().refine(Number.isFinite, 'must be a finite number');

export const escalationSpec = z.object({
  kind: z.literal('escalation'),
  title: z.string().max(300),
  rungs: z.array(z.object({ name: z.string().max(200), intensity: finite })).max(200),
  points: z
    .array(
      z.object({
        turn: z.number().int().min(1),
        actual: finite.nullable(),
        equilibrium: finite.nullable(),
      }),
    )
    .max(2000),
});

export const regretSpec = z.object({
  kind: z.literal('regret'),
  title: z.string().max(300),
  teams: z.array(z.object({ id: z.string().max(200), name: z.string().max(200) })).max(6),
  points: z.array(z.object({ turn: z.number().int().min(1), teamId: z.string().max(200), label: z.string().max(300), regret: finite })).max(2000),
});

export const figureSpec = z.discriminatedUnion('kind', [escalationSpec, regretSpec]);
export type FigureSpec = z.infer<typeof figureSpec>;
export type EscalationSpec = z.infer<typeof escalationSpec>;
export type RegretSpec = z.infer<typeof regretSpec>;

const cell = z.union([z.string().max(4000), finite, z.null()]);
export const tableSpec = z.object({
  title: z.string().max(300),
  columns: z.array(z.string().max(200)).min(1).max(20),
  /** Columns holding numbers, right-aligned. */
  numeric: z.array(z.number().int().min(0)).max(20).default([]),
  rows: z.array(z.array(cell).max(20)).max(5000),
  note: z.string().max(2000).optional(),
});
export type TableSpec = z.infer<typeof tableSpec>;
export type TableCell = z.infer<typeof cell>;

/** A spec from a document attribute; null when it is missing or malformed. */
export function readFigure(raw: unknown): FigureSpec | null {
  return parseJson(raw, figureSpec);
}

export function readTable(raw: unknown): TableSpec | null {
  return parseJson(raw, tableSpec);
}

function parseJson<T>(raw: unknown, schema: z.ZodType<T>): T | null {
  if (typeof raw !== 'string') return null;
  try {
    const parsed = schema.safeParse(JSON.parse(raw));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

const fixed = (value: number | null, places = 2) => (value === null ? null : Number(value.toFixed(places)));

export function escalationFigure(review: Review): EscalationSpec {
  return {
    kind: 'escalation',
    title: 'Escalation by turn: actual play and the subgame-perfect path',
    rungs: review.rungs.map((r) => ({ name: r.name, intensity: r.intensity })),
    points: review.escalation.map((p) => ({ turn: p.turn, actual: p.actual, equilibrium: p.equilibrium })),
  };
}

export function regretFigure(review: Review): RegretSpec {
  return {
    kind: 'regret',
    title: 'Regret by turn: continuation value given up under the authored payoffs',
    teams: review.teams,
    points: review.regret.map((p) => ({ turn: p.turn, teamId: p.teamId, label: p.label, regret: fixed(p.regret, 4)! })),
  };
}

export function movesTable(review: Review): TableSpec {
  return {
    title: 'Moves against the equilibrium',
    columns: ['Turn', 'Mover', 'Move made', 'Equilibrium action', 'Regret', 'QRE probability'],
    numeric: [0, 4, 5],
    rows: review.moves.map((m) => [m.turn, m.mover, m.kind === 'adjudicated' ? `${m.label} (adjudicated)` : m.label, m.equilibriumAction ?? '—', fixed(m.regret), fixed(m.qreProbability)]),
    note: `Regret is the mover’s continuation value of the equilibrium action minus that of the move made. QRE probabilities are at each team’s fitted lambda.`,
  };
}

export function teamsTable(review: Review): TableSpec {
  return {
    title: 'How well each team’s play is explained',
    columns: ['Team', 'Moves', 'Deviations', 'Fitted lambda', 'Log-lik. QRE', 'Log-lik. uniform', `Log-lik. equilibrium (tremble ${review.tremble})`],
    numeric: [1, 2, 3, 4, 5, 6],
    rows: review.fits.map((f) => [f.team, f.moves, f.deviations, lambdaText(f), fixed(f.logLikelihood.qre), fixed(f.logLikelihood.uniform), fixed(f.logLikelihood.trembles)]),
    note: `A higher (less negative) log-likelihood explains the moves better. Lambda 0 is random play; large lambda is close to payoff-maximising play.${anyAtUpperBound(review.fits) ? ` ${LAMBDA_BOUND_NOTE}` : ''}`,
  };
}

export function counterfactualTable(review: Review): TableSpec {
  const end = (e: Review['actual']) => e.outcome ?? e.nodeId;
  return {
    title: 'Where equilibrium play would have ended',
    columns: ['Turn', 'Team', 'Move made', 'Equilibrium action', 'Equilibrium from there', 'Equilibrium after the move'],
    numeric: [0],
    rows: review.counterfactuals.map((c) => [c.turn, c.team, c.label, c.equilibriumAction, end(c.instead), end(c.after)]),
  };
}
