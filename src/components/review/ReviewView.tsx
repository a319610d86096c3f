/**
 * Review: the play actually made beside the subgame-perfect play. Outcome
 * cards, the path tree, the charts, the move and team tables, the
 * counterfactual endings and the timeline with observer notes. Every table
 * downloads as CSV. Refreshes while the exercise is still running.
 */
import { useQuery } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { api, describeError } from '../../lib/client/api';
import { escalationFigure, regretFigure } from '../../lib/report/figures';
import { equilibriumCountSentence } from '../../lib/review/count-sentence';
import { anyAtUpperBound, LAMBDA_BOUND_NOTE, lambdaText } from '../../lib/review/lambda-text';
import type { EndPoint, Review } from '../../lib/review/types';
import { FormMessage } from '../ui/Field';
import { withQueryClient } from '../ui/QueryRoot';
import { EscalationChart, RegretChart } from './charts';
import { fixed, percent } from './format';
import { PathTree } from './PathTree';
import { Timeline } from './Timeline';

type Props = { exerciseId: string };

const SECTIONS = [
  ['tree', 'Tree'],
  ['charts', 'Charts'],
  ['moves', 'Moves'],
  ['teams', 'Teams'],
  ['counterfactuals', 'What if'],
  ['timeline', 'Timeline'],
] as const;

function Section({ id, title, csv, children, intro }: { id: string; title: string; csv?: string; intro?: ReactNode; children: ReactNode }) {
  return (
    <section id={id} aria-labelledby={`${id}-heading`} className="panel scroll-mt-4 p-5">
      <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`${id}-heading`}>{title}</h2>
        {csv && (
          <a className="btn-quiet py-1 text-xs" href={csv} download>
            Download CSV
          </a>
        )}
      </div>
      {intro && <p className="mb-3 max-w-3xl text-sm text-ink-700">{intro}</p>}
      {children}
    </section>
  );
}

function Ending({ label, end, teams, tone }: { label: string; end: EndPoint; teams: Review['teams']; tone: string }) {
  return (
    <div className={`rounded-lg border p-4 ${tone}`} data-testid={`ending-${label.toLowerCase().replace(/\W+/g, '-')}`}>
      <div className="text-xs font-semibold tracking-wide text-ink-600 uppercase">{label}</div>
      <div className="mt-1 text-lg font-semibold text-ink-950">{end.terminal ? (end.outcome ?? end.nodeId) : 'Play is under way'}</div>
      <div className="mt-1 text-sm text-ink-700">{end.rung ? `Last rung: ${end.rung.name}` : 'No rung reached'}</div>
      {end.payoffs.length > 0 && (
        <dl className="mt-2 flex flex-wrap gap-x-4 text-sm">
          {teams.map((t, i) => (
            <div key={t.id} className="flex gap-1">
              <dt className="text-ink-600">{t.name}</dt>
              <dd className="font-medium">{fixed(end.payoffs[i])}</dd>
            </div>
          ))}
        </dl>
      )}
    </div>
  );
}

function MovesTable({ review }: { review: Review }) {
  return (
    <div className="overflow-x-auto">
      <table className="data-table" data-testid="moves-table">
        <thead>
          <tr>
            <th scope="col">Turn</th>
            <th scope="col">Mover</th>
            <th scope="col">Move made</th>
            <th scope="col">Equilibrium action</th>
            <th scope="col" className="text-right">Regret</th>
            <th scope="col" className="text-right">QRE probability</th>
            <th scope="col">Rung after</th>
          </tr>
        </thead>
        <tbody>
          {review.moves.map((m) => (
            <tr key={m.moveId} className={m.deviated ? 'bg-brick-100/50' : undefined}>
              <td>{m.turn}</td>
              <td>{m.mover}</td>
              <td>
                <span className="font-medium">{m.label}</span>
                {m.kind === 'adjudicated' && <span className="tag ml-1 bg-haze-100 text-haze-700">adjudicated</span>}
                {m.kind === 'chance' && <span className="tag ml-1 bg-ink-100 text-ink-700">drawn</span>}
              </td>
              <td>{m.equilibriumAction ?? '—'}{m.deviated && <span className="sr-only"> (deviation)</span>}</td>
              <td className="text-right tabular-nums">{fixed(m.regret)}</td>
              <td className="text-right tabular-nums">{percent(m.qreProbability)}</td>
              <td>{m.rung?.name ?? '—'}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function TeamsTable({ review }: { review: Review }) {
  return (
    <div className="overflow-x-auto">
      <table className="data-table" data-testid="teams-table">
        <thead>
          <tr>
            <th scope="col">Team</th>
            <th scope="col" className="text-right">Moves fitted</th>
            <th scope="col" className="text-right">Deviations</th>
            <th scope="col" className="text-right">Total regret</th>
            <th scope="col" className="text-right">Fitted lambda</th>
            <th scope="col" className="text-right">Log-lik. QRE</th>
            <th scope="col" className="text-right">Log-lik. uniform</th>
            <th scope="col" className="text-right">Log-lik. equilibrium ±{review.tremble}</th>
          </tr>
        </thead>
        <tbody>
          {review.fits.map((f) => (
            <tr key={f.teamId}>
              <td className="font-medium">{f.team}</td>
              <td className="text-right tabular-nums">{f.moves}</td>
              <td className="text-right tabular-nums">{f.deviations}</td>
              <td className="text-right tabular-nums">{fixed(f.totalRegret)}</td>
              <td className="text-right tabular-nums" title={f.lambdaBound === 'upper' ? 'At the top of the range searched: read as “at least”' : undefined}>
                {lambdaText(f)}
              </td>
              <td className="text-right tabular-nums">{fixed(f.logLikelihood.qre)}</td>
              <td className="text-right tabular-nums">{fixed(f.logLikelihood.uniform)}</td>
              <td className="text-right tabular-nums">{fixed(f.logLikelihood.trembles)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {anyAtUpperBound(review.fits) && <p className="mt-2 text-xs text-ink-600">{LAMBDA_BOUND_NOTE}</p>}
      {!review.lambdaFit.converged && <p className="mt-2 text-xs text-bronze-800">The lambda fit stopped at its sweep limit before meeting its tolerances: the lambdas are the best found, not certainly the best.</p>}
    </div>
  );
}

function Counterfactuals({ review }: { review: Review }) {
  if (review.counterfactuals.length === 0) return <p className="text-sm text-ink-600">Every move followed the equilibrium, so there is nothing to set beside it.</p>;
  return (
    <ol className="grid gap-3 md:grid-cols-2" data-testid="counterfactuals">
      {review.counterfactuals.map((c) => (
        <li key={c.moveId} className="rounded-md border border-ink-200 p-3 text-sm">
          <div className="font-semibold text-ink-900">
            Turn {c.turn} · {c.team} chose “{c.label}”, the equilibrium “{c.equilibriumAction}”
          </div>
          <p className="mt-1 text-ink-700">
            Following the equilibrium from there: <strong>{c.instead.outcome ?? c.instead.nodeId}</strong>.
          </p>
          <p className="text-ink-700">
            After the move, equilibrium play on: <strong>{c.after.outcome ?? c.after.nodeId}</strong>.
          </p>
        </li>
      ))}
    </ol>
  );
}

function ReviewBody({ review, csv }: { review: Review; csv: (table: string) => string }) {
  const deviations = review.moves.filter((m) => m.deviated).length;
  const countSentence = equilibriumCountSentence(review.equilibrium);
  return (
    <div className="space-y-5">
      <div className="grid gap-3 md:grid-cols-3">
        <Ending label="Played" end={review.actual} teams={review.teams} tone="border-bronze-200 bg-bronze-100/60" />
        <Ending label="Subgame-perfect path" end={review.equilibrium.end} teams={review.teams} tone="border-ink-200 bg-white" />
        <div className="rounded-lg border border-ink-200 bg-white p-4">
          <div className="text-xs font-semibold tracking-wide text-ink-600 uppercase">Departures</div>
          <div className="mt-1 text-lg font-semibold text-ink-950" data-testid="deviation-count">
            {deviations} of {review.moves.filter((m) => m.equilibriumAction !== null).length} moves
          </div>
          <ul className="mt-1 text-sm text-ink-700">
            {review.fits.map((f) => (
              <li key={f.teamId}>
                {f.team}: regret {fixed(f.totalRegret)}, lambda {lambdaText(f)}
              </li>
            ))}
          </ul>
          {countSentence && (
            <p className="mt-1 text-xs text-ink-600" data-testid="equilibrium-count">
              {countSentence}
            </p>
          )}
        </div>
      </div>

      <nav aria-label="Review sections" className="flex flex-wrap gap-1 text-sm">
        {SECTIONS.map(([id, label]) => (
          <a key={id} href={`#${id}`} className="rounded-md px-2.5 py-1 text-ink-700 no-underline hover:bg-ink-100 hover:no-underline">
            {label}
          </a>
        ))}
      </nav>

      <Section id="tree" title="Played and rational lines on the tree" intro="The line played, the subgame-perfect line from the start, and, dotted, where equilibrium play would have gone from each departure.">
        <PathTree tree={review.tree} teams={review.teams} />
      </Section>

      <Section id="charts" title="Escalation and regret by turn" csv={csv('escalation')}>
        <div className="grid gap-6 lg:grid-cols-2">
          <figure>
            <figcaption className="mb-1 text-sm font-semibold">Escalation level</figcaption>
            <EscalationChart spec={escalationFigure(review)} />
          </figure>
          <figure>
            <figcaption className="mb-1 text-sm font-semibold">Regret: continuation value given up</figcaption>
            <RegretChart spec={regretFigure(review)} />
          </figure>
        </div>
      </Section>

      <Section id="moves" title="Moves against the equilibrium" csv={csv('moves')} intro="Regret is the mover’s continuation value of the equilibrium action minus that of the move made, with equilibrium play afterwards. The QRE probability is the chance a logit quantal response model, at each team’s fitted lambda, gives the move made.">
        <MovesTable review={review} />
      </Section>

      <Section id="teams" title="How well each team’s play is explained" csv={csv('teams')} intro="A higher (less negative) log-likelihood explains the moves better. Lambda 0 is random play; a large lambda is close to payoff-maximising play. Adjudicated moves and chance draws are left out of the fit.">
        <TeamsTable review={review} />
      </Section>

      <Section id="counterfactuals" title="Where equilibrium play would have ended" csv={csv('counterfactuals')}>
        <Counterfactuals review={review} />
      </Section>

      <Section id="timeline" title="Timeline with observer notes" csv={csv('timeline')}>
        <Timeline review={review} />
      </Section>
    </div>
  );
}

function ReviewView({ exerciseId }: Props) {
  const query = useQuery({
    queryKey: ['review', exerciseId],
    queryFn: () => api<{ review: Review; scenarioTitle: string }>(`/api/exercises/${exerciseId}/review`),
    refetchInterval: (q) => (q.state.data && ['live', 'paused'].includes(q.state.data.review.state) ? 10_000 : false),
  });
  if (query.isPending) return <p className="text-sm text-ink-600">Computing the review…</p>;
  if (query.isError) return <FormMessage tone="error">{describeError(query.error)}</FormMessage>;
  const { review } = query.data;
  if (review.moves.length === 0) {
    return (
      <div className="rounded-md border border-dashed border-ink-300 p-8 text-center text-sm text-ink-600" data-empty="review">
        No moves yet. The review fills in as teams move; the subgame-perfect path ends at “{review.equilibrium.end.outcome ?? review.equilibrium.end.nodeId}”.
      </div>
    );
  }
  return <ReviewBody review={review} csv={(table) => `/api/exercises/${exerciseId}/review/${table}.csv`} />;
}

export default withQueryClient(ReviewView);
