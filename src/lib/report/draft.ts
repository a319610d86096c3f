/**
 * The first draft of an after-action report, generated from the review of the
 * exercise: summary, timeline, the equilibrium comparison (tables and charts),
 * the observer notes, and empty sections for people to write: hot wash,
 * findings, recommendations.
 */
import { equilibriumCountSentence, type MoveReview, type Review } from '../review';
import { lambdaText } from '../review/lambda-text';
import { counterfactualTable, escalationFigure, movesTable, regretFigure, teamsTable } from './figures';
import type { JSONContent } from './schema';

export type DraftContext = { review: Review; scenarioTitle: string; startedAt: string | null; endedAt: string | null };

export const SECTION_TITLES = {
  summary: 'Summary',
  hotWash: 'Hot wash',
  timeline: 'Timeline',
  comparison: 'Play against the equilibrium',
  notes: 'Observer notes',
  findings: 'Findings',
  recommendations: 'Recommendations',
} as const;

type Mark = 'bold' | 'italic';

const text = (value: string, ...marks: Mark[]): JSONContent => ({ type: 'text', text: value, ...(marks.length ? { marks: marks.map((type) => ({ type })) } : {}) });
const paragraph = (...content: JSONContent[]): JSONContent => ({ type: 'paragraph', ...(content.length ? { content } : {}) });
const heading = (level: 1 | 2 | 3, value: string): JSONContent => ({ type: 'heading', attrs: { level }, content: [text(value)] });
const bullets = (items: JSONContent[][]): JSONContent => ({ type: 'bulletList', content: items.map((content) => ({ type: 'listItem', content: [paragraph(...content)] })) });
const figure = (spec: object): JSONContent => ({ type: 'analysisFigure', attrs: { spec: JSON.stringify(spec) } });
const table = (spec: object): JSONContent => ({ type: 'analysisTable', attrs: { spec: JSON.stringify(spec) } });

export const formatNumber = (value: number) => (Number.isInteger(value) ? String(value) : value.toFixed(2));
const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString('en-GB', { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' }) + ' UTC' : 'not recorded');
const ending = (end: Review['actual']) => end.outcome ?? `the node ${end.nodeId}`;

function summary(ctx: DraftContext): JSONContent[] {
  const { review } = ctx;
  const deviations = review.moves.filter((m) => m.deviated);
  const worst = deviations.reduce<MoveReview | null>((top, m) => ((m.regret ?? 0) > (top?.regret ?? -Infinity) ? m : top), null);
  const lambdas = review.fits.filter((f) => f.lambda !== null).map((f) => `${f.team} ${lambdaText(f)}`);
  const played = review.actual.terminal ? `ended at “${ending(review.actual)}”` : 'is still under way';
  const countSentence = equilibriumCountSentence(review.equilibrium);
  const teams = review.teams.map((t) => t.name).join(', ');
  const ran = !ctx.startedAt
    ? `The exercise ${review.title} on the scenario ${ctx.scenarioTitle}, with ${teams}, has not started.`
    : ctx.endedAt
      ? `The exercise ${review.title} ran on the scenario ${ctx.scenarioTitle} from ${when(ctx.startedAt)} to ${when(ctx.endedAt)}, with ${teams}.`
      : `The exercise ${review.title} on the scenario ${ctx.scenarioTitle} started on ${when(ctx.startedAt)}, with ${teams}.`;
  const sentences = [
    ran,
    (review.moves.length === 0 ? 'No move has been played yet.' : `Play took ${review.moves.length} move${review.moves.length === 1 ? '' : 's'} and ${played}.`) +
      ` Under the authored payoffs, subgame-perfect play ends at “${ending(review.equilibrium.end)}”.`,
    ...(countSentence ? [countSentence] : []),
    deviations.length === 0
      ? 'Every move followed the equilibrium.'
      : `Teams left the equilibrium ${deviations.length} time${deviations.length === 1 ? '' : 's'}.` +
        (worst ? ` The largest departure by this measure was ${worst.mover} at turn ${worst.turn}: “${worst.label}” where the equilibrium action was “${worst.equilibriumAction}” (regret ${formatNumber(worst.regret ?? 0)}).` : ''),
  ];
  if (lambdas.length) sentences.push(`Fitted logit lambda (0 is random play; higher is closer to payoff-maximising; “≥” is the top of the range searched, read as “at least”): ${lambdas.join(', ')}.`);
  return [
    paragraph(text(sentences.join(' '))),
    paragraph(text('These comparisons follow from the payoffs the scenario assumed. They are an aid to discussion, not a prediction of what any government will do.', 'italic')),
  ];
}

function moveLine(m: MoveReview): JSONContent[] {
  const parts = [text(`Turn ${m.turn} · ${m.mover}: `, 'bold'), text(m.label)];
  if (m.kind === 'chance' && m.equilibriumAction === null) parts.push(text(' (chance outcome)'));
  if (m.deviated) parts.push(text(` — equilibrium: ${m.equilibriumAction} (regret ${formatNumber(m.regret ?? 0)})`, 'italic'));
  if (m.kind === 'adjudicated') parts.push(text(` — adjudicated${m.reason ? `: ${m.reason}` : ''}`));
  return parts;
}

function timeline(review: Review): JSONContent[] {
  const items = review.timeline.flatMap((entry): JSONContent[][] => {
    if (entry.kind === 'move') return [moveLine(entry.move)];
    if (entry.kind === 'ending') {
      const e = entry.ending;
      return [[text(`Turn ${e.turn} · Facilitator: `, 'bold'), text(`ended play at “${e.outcome}”${e.mover ? ` on ${e.mover}’s proposal` : ''}${e.reason ? `: ${e.reason}` : ''}`)]];
    }
    if (entry.kind === 'inject') {
      const to = entry.inject.to === 'all' ? 'all teams' : entry.inject.to.map((id) => review.teams.find((t) => t.id === id)?.name ?? id).join(', ');
      return [[text(`${entry.turn ? `Turn ${entry.turn} · ` : ''}Inject to ${to}: `, 'bold'), text(entry.inject.title)]];
    }
    return [];
  });
  return items.length ? [bullets(items)] : [paragraph(text('No moves were played.', 'italic'))];
}

function notes(review: Review): JSONContent[] {
  const items = review.timeline.flatMap((entry): JSONContent[][] =>
    entry.kind === 'note'
      ? [[text(`${entry.turn ? `Turn ${entry.turn} · ` : ''}${entry.note.authorName}${entry.note.tags.length ? ` [${entry.note.tags.join(', ')}]` : ''}: `, 'bold'), text(entry.note.text)]]
      : [],
  );
  return items.length ? [bullets(items)] : [paragraph(text('No observer notes were recorded.', 'italic'))];
}

function comparison(review: Review): JSONContent[] {
  const content = [
    paragraph(text('Each move beside the subgame-perfect action at the same point of the tree, with the continuation value given up and the probability a logit quantal response model gives the move.')),
    table(movesTable(review)),
    figure(escalationFigure(review)),
    figure(regretFigure(review)),
    table(teamsTable(review)),
  ];
  if (review.counterfactuals.length) content.push(table(counterfactualTable(review)));
  return content;
}

export function firstDraft(ctx: DraftContext): JSONContent {
  return {
    type: 'doc',
    content: [
      heading(1, `After-action report: ${ctx.review.title}`),
      heading(2, SECTION_TITLES.summary),
      ...summary(ctx),
      heading(2, SECTION_TITLES.hotWash),
      paragraph(text('First impressions right after play: what surprised the teams, what they would do differently.', 'italic')),
      paragraph(),
      heading(2, SECTION_TITLES.timeline),
      ...timeline(ctx.review),
      heading(2, SECTION_TITLES.comparison),
      ...comparison(ctx.review),
      heading(2, SECTION_TITLES.notes),
      ...notes(ctx.review),
      heading(2, SECTION_TITLES.findings),
      paragraph(),
      heading(2, SECTION_TITLES.recommendations),
      paragraph(),
    ],
  };
}
