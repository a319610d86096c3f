/**
 * Every run of one scenario side by side: how often each rung was chosen, the
 * lambda each team's play fits in each run, and the outcomes reached beside
 * the equilibrium outcome. Each table downloads as CSV.
 */
import { useQuery } from '@tanstack/react-query';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { api, describeError } from '../../lib/client/api';
import type { ScenarioRuns } from '../../lib/report/runs';
import { ACTUAL_COLOUR, TEAM_COLOURS } from '../../lib/report/render/chart';
import { FormMessage } from '../ui/Field';
import { withQueryClient } from '../ui/QueryRoot';
import { fixed, percent } from './format';
import { lambdaText } from '../../lib/review/lambda-text';

const AXIS = { fontSize: 12, fill: '#34414f' };
/** Outcomes that are some run's subgame-perfect outcome. */
const EQUILIBRIUM_OUTCOME = '#3a7150';

function Panel({ title, csv, children }: { title: string; csv: string; children: React.ReactNode }) {
  return (
    <section className="panel p-5" aria-label={title}>
      <div className="mb-3 flex items-baseline justify-between gap-2">
        <h2>{title}</h2>
        <a className="btn-quiet py-1 text-xs" href={csv} download>
          Download CSV
        </a>
      </div>
      {children}
    </section>
  );
}

function RunsView({ scenarioId }: { scenarioId: string }) {
  const query = useQuery({ queryKey: ['runs', scenarioId], queryFn: () => api<ScenarioRuns>(`/api/runs/${scenarioId}`) });
  if (query.isPending) return <p className="text-sm text-ink-600">Reviewing every run…</p>;
  if (query.isError) return <FormMessage tone="error">{describeError(query.error)}</FormMessage>;
  const { overview, skipped } = query.data;
  const csv = (table: string) => `/api/runs/${scenarioId}/${table}.csv`;
  if (overview.runs.length === 0) {
    return (
      <div className="rounded-md border border-dashed border-ink-300 p-8 text-center text-sm text-ink-600" data-empty="runs">
        No run of this scenario has been played yet (or none you may review). Runs appear here once play starts.
      </div>
    );
  }
  const teamName = (id: unknown) => overview.teams.find((t) => t.id === id)?.name ?? String(id);
  const teamOrder = (item: { dataKey?: unknown }) => overview.teams.findIndex((t) => t.id === item.dataKey);
  const lambdaRows = overview.runs.map((r) => ({ title: r.title, ...Object.fromEntries(overview.teams.map((t) => [t.id, r.lambdas[t.id] ?? null])) }));
  return (
    <div className="space-y-5">
      {skipped.length > 0 && <FormMessage tone="error">Left out: {skipped.map((s) => `${s.title} (${s.reason})`).join('; ')}</FormMessage>}
      <div className="grid gap-5 lg:grid-cols-2">
        <Panel title="How often each rung was chosen" csv={csv('rungs')}>
          <div role="img" aria-label="Times each rung was chosen, by team">
            <ResponsiveContainer width="100%" height={Math.max(220, overview.rungs.length * 34 + 60)}>
              <BarChart data={overview.rungs.map((r) => ({ name: r.name, ...r.byTeam }))} layout="vertical" margin={{ left: 8, right: 16 }}>
                <CartesianGrid horizontal={false} stroke="#d6dce2" />
                <XAxis type="number" allowDecimals={false} tick={AXIS} />
                <YAxis type="category" dataKey="name" width={150} tick={AXIS} />
                <Tooltip formatter={(v, id) => [String(v), overview.teams.find((t) => t.id === id)?.name ?? String(id)]} />
                <Legend itemSorter={teamOrder} formatter={teamName} wrapperStyle={{ fontSize: 13 }} />
                {overview.teams.map((t, i) => (
                  <Bar key={t.id} dataKey={t.id} stackId="rung" fill={TEAM_COLOURS[i % TEAM_COLOURS.length]} isAnimationActive={false} />
                ))}
              </BarChart>
            </ResponsiveContainer>
          </div>
        </Panel>
        <Panel title="Outcomes reached" csv={csv('outcomes')}>
          <div role="img" aria-label="Runs ending at each outcome">
            <ResponsiveContainer width="100%" height={Math.max(220, overview.outcomes.length * 34 + 60)}>
              <BarChart
                data={overview.outcomes.map((o) => ({ name: o.equilibrium ? `${o.outcome} (equilibrium)` : o.outcome, [o.equilibrium ? 'equilibrium' : 'other']: o.runs }))}
                layout="vertical"
                margin={{ left: 8, right: 16 }}
              >
                <CartesianGrid horizontal={false} stroke="#d6dce2" />
                <XAxis type="number" allowDecimals={false} tick={AXIS} />
                <YAxis type="category" dataKey="name" width={190} tick={AXIS} />
                <Tooltip />
                {/* One bar per row; its colour says whether the outcome is a run's subgame-perfect outcome. */}
                <Bar dataKey="other" name="Runs" stackId="outcome" fill={ACTUAL_COLOUR} isAnimationActive={false} />
                <Bar dataKey="equilibrium" name="Runs (equilibrium outcome)" stackId="outcome" fill={EQUILIBRIUM_OUTCOME} isAnimationActive={false} />
              </BarChart>
            </ResponsiveContainer>
          </div>
        </Panel>
      </div>
      <Panel title="Lambda by run" csv={csv('runs')}>
        <div role="img" aria-label="Fitted logit lambda of each team in each run">
          <ResponsiveContainer width="100%" height={260}>
            <BarChart data={lambdaRows} margin={{ left: 8, right: 16 }}>
              <CartesianGrid vertical={false} stroke="#d6dce2" />
              <XAxis dataKey="title" tick={AXIS} />
              <YAxis tick={AXIS} scale="sqrt" domain={[0, 'auto']} label={{ value: 'lambda (square-root scale)', angle: -90, position: 'insideLeft', fontSize: 12, dy: 70 }} />
              <Tooltip formatter={(v, id) => [fixed(Number(v)), teamName(id)]} />
              <Legend itemSorter={teamOrder} formatter={teamName} wrapperStyle={{ fontSize: 13 }} />
              {overview.teams.map((t, i) => (
                <Bar key={t.id} dataKey={t.id} fill={TEAM_COLOURS[i % TEAM_COLOURS.length]} isAnimationActive={false} maxBarSize={40} />
              ))}
            </BarChart>
          </ResponsiveContainer>
        </div>
        <div className="mt-4 overflow-x-auto">
          <table className="data-table" data-testid="runs-table">
            <thead>
              <tr>
                <th scope="col">Run</th>
                <th scope="col">Outcome</th>
                <th scope="col" className="text-right">Moves</th>
                <th scope="col" className="text-right">Deviations</th>
                <th scope="col" className="text-right">Regret</th>
                {overview.teams.map((t) => (
                  <th key={t.id} scope="col" className="text-right">
                    Lambda, {t.name}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {overview.runs.map((r) => (
                <tr key={r.exerciseId}>
                  <td>
                    <a href={`/exercises/${r.exerciseId}/review`}>{r.title}</a>
                  </td>
                  <td>
                    {r.outcome ?? 'Not finished'}
                    {r.reachedEquilibrium && <span className="tag ml-1 bg-moss-100 text-moss-700">equilibrium</span>}
                  </td>
                  <td className="text-right tabular-nums">{r.moves}</td>
                  <td className="text-right tabular-nums">{r.deviations}</td>
                  <td className="text-right tabular-nums">{fixed(r.totalRegret)}</td>
                  {overview.teams.map((t) => (
                    <td key={t.id} className="text-right tabular-nums">
                      {lambdaText({ lambda: r.lambdas[t.id] ?? null, lambdaBound: r.lambdasAtBound.includes(t.id) ? 'upper' : null })}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <p className="mt-2 text-xs text-ink-600">Rung shares: {overview.rungs.map((r) => `${r.name} ${percent(r.share)}`).join(' · ')}.</p>
      </Panel>
    </div>
  );
}

export default withQueryClient(RunsView);
