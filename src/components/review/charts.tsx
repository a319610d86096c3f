/**
 * The review's charts (recharts): escalation level by turn against the
 * subgame-perfect path, and regret by turn. The report's figures use them too.
 */
import { Bar, BarChart, CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { EscalationSpec, RegretSpec } from '../../lib/report/figures';
import { ACTUAL_COLOUR, EQUILIBRIUM_COLOUR, niceTicks, TEAM_COLOURS } from '../../lib/report/render/chart';

const AXIS = { fontSize: 12, fill: '#34414f' };
const GRID = '#d6dce2';

const short = (text: string, max = 22) => (text.length > max ? `${text.slice(0, max - 1)}…` : text);

export function EscalationChart({ spec, height = 280 }: { spec: Pick<EscalationSpec, 'rungs' | 'points'>; height?: number }) {
  const nameAt = new Map(spec.rungs.map((r) => [r.intensity, r.name]));
  const ticks = spec.rungs.length ? spec.rungs.map((r) => r.intensity) : undefined;
  const levels = [...spec.rungs.map((r) => r.intensity), ...spec.points.flatMap((p) => [p.actual ?? NaN, p.equilibrium ?? NaN])].filter(Number.isFinite);
  const domain: [number, number] = levels.length ? [Math.min(...levels), Math.max(...levels)] : [0, 1];
  return (
    <div role="img" aria-label="Escalation level by turn: actual play against the subgame-perfect path" data-chart="escalation">
      <ResponsiveContainer width="100%" height={height}>
        <LineChart data={spec.points} margin={{ top: 8, right: 16, bottom: 4, left: 8 }}>
          <CartesianGrid stroke={GRID} vertical={false} />
          <XAxis dataKey="turn" tick={AXIS} label={{ value: 'Turn', position: 'insideBottom', offset: -2, fontSize: 12 }} height={36} />
          <YAxis type="number" domain={domain} ticks={ticks} tick={AXIS} width={130} tickFormatter={(v: number) => short(nameAt.get(v) ?? String(v))} />
          <Tooltip
            formatter={(value, name) => [nameAt.get(Number(value)) ?? String(value), name === 'actual' ? 'Actual play' : 'Subgame-perfect path']}
            labelFormatter={(turn) => `Turn ${turn}`}
          />
          <Legend position="top" formatter={(name) => (name === 'actual' ? 'Actual play' : 'Subgame-perfect path')} wrapperStyle={{ fontSize: 13 }} />
          <Line type="linear" dataKey="equilibrium" stroke={EQUILIBRIUM_COLOUR} strokeWidth={2} strokeDasharray="6 4" dot={{ r: 3, fill: '#fff' }} isAnimationActive={false} />
          <Line type="linear" dataKey="actual" stroke={ACTUAL_COLOUR} strokeWidth={2.5} dot={{ r: 4, fill: ACTUAL_COLOUR }} isAnimationActive={false} />
        </LineChart>
      </ResponsiveContainer>
    </div>
  );
}

export function RegretChart({ spec, height = 260 }: { spec: Pick<RegretSpec, 'teams' | 'points'>; height?: number }) {
  const turns = spec.points.length ? Math.max(...spec.points.map((p) => p.turn)) : 0;
  const rows = Array.from({ length: turns }, (_, k) => {
    const here = spec.points.filter((p) => p.turn === k + 1);
    return { turn: k + 1, move: here.map((p) => p.label).join(', '), ...Object.fromEntries(here.map((p) => [p.teamId, p.regret])) };
  });
  const values = spec.points.map((p) => p.regret);
  const ticks = niceTicks(Math.min(0, ...values), Math.max(0, ...values, 1e-9));
  const teamIndex = (id: unknown) => spec.teams.findIndex((t) => t.id === id);
  return (
    <div role="img" aria-label="Regret by turn: the continuation value each move gave up" data-chart="regret">
      <ResponsiveContainer width="100%" height={height}>
        <BarChart data={rows} margin={{ top: 8, right: 16, bottom: 4, left: 8 }}>
          <CartesianGrid stroke={GRID} vertical={false} />
          <XAxis dataKey="turn" tick={AXIS} label={{ value: 'Turn', position: 'insideBottom', offset: -2, fontSize: 12 }} height={36} />
          <YAxis tick={AXIS} width={56} ticks={ticks} domain={[ticks[0]!, ticks.at(-1)!]} label={{ value: 'Regret', angle: -90, position: 'insideLeft', fontSize: 12 }} />
          <Tooltip
            formatter={(value, name) => [Number(value).toFixed(2), spec.teams.find((t) => t.id === name)?.name ?? String(name)]}
            labelFormatter={(turn) => `Turn ${turn}: ${rows[Number(turn) - 1]?.move ?? ''}`}
          />
          <Legend position="top" itemSorter={(item) => teamIndex(item.dataKey)} formatter={(id) => spec.teams.find((t) => t.id === id)?.name ?? String(id)} wrapperStyle={{ fontSize: 13 }} />
          {spec.teams.map((team, i) => (
            <Bar key={team.id} dataKey={team.id} fill={TEAM_COLOURS[i % TEAM_COLOURS.length]} isAnimationActive={false} maxBarSize={34} />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
