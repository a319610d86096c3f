/**
 * Panels for stages where two teams move without seeing each other's move:
 * the agreement lens (Eisert-Wilkens-Lewenstein) on a 2x2 reading of the
 * stage, and the quarter-law belief forecast beside the logit forecast.
 */
import { useEffect, useMemo, useState } from 'react';
import { CartesianGrid, Legend, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { actionValues, indexGame, simultaneousStage, type BeliefForecast, type Equilibrium, type EwlCurve, type EwlEquilibrium, type Game, type StageMover, type TwoByTwo } from '../../../lib/engine';
import { useWorkbench } from '../workbench/context';
import { formatNumber, formatPercent } from '../workbench/format';
import { INK, JobPanel, SERIES, useRunner } from './panels';

type Stage = { nodeId: string; label: string; movers: [StageMover, StageMover] };
type AgreementResult = { gamma: number[]; curves: EwlCurve[]; equilibria?: EwlEquilibrium[] };

const STAGE_LIMIT = 60;

/** Two-team stages, the shallowest first (the first ones play can reach), at most STAGE_LIMIT. */
function stagesOf(game: Game): Stage[] {
  const index = indexGame(game);
  const out: (Stage & { depth: number })[] = [];
  for (const node of index.nodes) {
    if (node.kind !== 'decision') continue;
    const first = node.actions[0]?.next;
    if (first?.kind !== 'decision' || first.infoset === undefined) continue;
    const stage = simultaneousStage(game, node.id);
    if (!stage || stage.movers.length !== 2) continue;
    const labels: string[] = [];
    for (let link = index.parentOf.get(node); link; link = index.parentOf.get(link.parent)) labels.unshift(link.label);
    out.push({ nodeId: node.id, label: labels.length ? labels.join(' › ') : 'at the start', movers: stage.movers as [StageMover, StageMover], depth: labels.length });
  }
  return out.sort((a, b) => a.depth - b.depth).slice(0, STAGE_LIMIT);
}

function useStages(): Stage[] {
  const { game } = useWorkbench();
  return useMemo(() => (game ? stagesOf(game) : []), [game]);
}

const RESTRAINED = ['hold', 'step-down', 'settle'];

/** A default restrained (C) and pressing (D) move for a mover. */
function defaultPair(mover: StageMover): [string, string] {
  const restrained = mover.options.find((o) => o.move && RESTRAINED.includes(o.move))?.label ?? mover.actions[0]!;
  const pressing = mover.options.find((o) => o.move === 'climb')?.label ?? mover.actions.find((a) => a !== restrained)!;
  return [restrained, pressing];
}

/** The 2x2 stage on the chosen moves, valued by continuing with the equilibrium afterwards. */
function twoByTwo(game: Game, eq: Equilibrium, stage: Stage, row: [string, string], col: [string, string]): TwoByTwo {
  const root = indexGame(game).byId.get(stage.nodeId);
  if (root?.kind !== 'decision') throw new Error('not a decision');
  const r = game.teams.findIndex((t) => t.id === stage.movers[0].team);
  const c = game.teams.findIndex((t) => t.id === stage.movers[1].team);
  const cell = (i: number, j: number): [number, number] => {
    const after = root.actions.find((a) => a.label === row[i])!.next;
    const values = actionValues(game, eq, after.id).actions.find((a) => a.label === col[j])!.values;
    return [values[r]!, values[c]!];
  };
  return { rowTeam: stage.movers[0].team, colTeam: stage.movers[1].team, payoffs: [[cell(0, 0), cell(0, 1)], [cell(1, 0), cell(1, 1)]] };
}

function StagePicker({ stages, value, onChange }: { stages: Stage[]; value: number; onChange: (i: number) => void }) {
  return (
    <label className="block text-sm">
      <span className="field-label">Stage</span>
      <select className="field-input py-1" value={value} onChange={(e) => onChange(Number(e.target.value))}>
        {stages.map((s, i) => (
          <option key={s.nodeId} value={i}>
            {s.label.slice(0, 120)}
          </option>
        ))}
      </select>
    </label>
  );
}

function MovePicker({ mover, teamName, value, onChange }: { mover: StageMover; teamName: string; value: [string, string]; onChange: (v: [string, string]) => void }) {
  return (
    <div className="grid grid-cols-2 gap-2">
      {(['Restrained move (C)', 'Pressing move (D)'] as const).map((title, k) => (
        <label key={title} className="block text-sm">
          <span className="field-label">
            {teamName}: {title}
          </span>
          <select className="field-input py-1" value={value[k]} onChange={(e) => onChange(k === 0 ? [e.target.value, value[1]] : [value[0], e.target.value])}>
            {mover.actions.map((a) => (
              <option key={a}>{a}</option>
            ))}
          </select>
        </label>
      ))}
    </div>
  );
}

/** Where along gamma a profile is an equilibrium, as ranges of degrees. */
function equilibriumRanges(gamma: number[], flags: boolean[]): string {
  const ranges: string[] = [];
  let from: number | null = null;
  flags.forEach((on, k) => {
    if (on && from === null) from = k;
    if ((!on || k === flags.length - 1) && from !== null) {
      const to = on ? k : k - 1;
      const deg = (g: number) => `${Math.round((g * 180) / Math.PI)}°`;
      ranges.push(from === to ? deg(gamma[from]!) : `${deg(gamma[from]!)}–${deg(gamma[to]!)}`);
      from = null;
    }
  });
  return ranges.length ? ranges.join(', ') : 'never';
}

export function AgreementPanel() {
  const { document, game, equilibrium } = useWorkbench();
  const stages = useStages();
  const runner = useRunner<AgreementResult>();
  const [pick, setPick] = useState(0);
  const stage = stages[Math.min(pick, stages.length - 1)];
  const [row, setRow] = useState<[string, string] | null>(null);
  const [col, setCol] = useState<[string, string] | null>(null);
  const [gamma, setGamma] = useState(0);
  const [side, setSide] = useState<0 | 1>(0);
  useEffect(() => {
    if (!stage) return;
    setRow(defaultPair(stage.movers[0]));
    setCol(defaultPair(stage.movers[1]));
  }, [stage?.nodeId]);
  const name = (id: string) => document.teams.find((t) => t.id === id)?.name ?? id;
  const matrix = useMemo(() => {
    if (!game || !equilibrium || !stage || !row || !col || row[0] === row[1] || col[0] === col[1]) return null;
    try {
      return twoByTwo(game, equilibrium, stage, row, col);
    } catch {
      return null;
    }
  }, [game, equilibrium, stage, row, col]);
  const disabled = stages.length === 0 ? 'This tree has no stage where two teams move without seeing each other’s move.' : !equilibrium ? 'Waiting for the equilibrium.' : !matrix ? 'Pick two different moves for each team.' : null;

  return (
    <JobPanel
      id="agreement"
      title="Agreement lens"
      intro={
        <div className="space-y-2">
          <p>
            Reads a stage as a 2x2 game (each team’s restrained and pressing move, valued by the equilibrium that follows) and applies the
            Eisert-Wilkens-Lewenstein scheme: γ from 0° (no agreement: the game as it is) to 90° is read as the strength of a binding agreement or norm.
            It is an analogy for discussion, not a model of any real negotiation.
          </p>
          {stage && row && col && (
            <>
              <StagePicker stages={stages} value={pick} onChange={setPick} />
              <MovePicker mover={stage.movers[0]} teamName={name(stage.movers[0].team)} value={row} onChange={setRow} />
              <MovePicker mover={stage.movers[1]} teamName={name(stage.movers[1].team)} value={col} onChange={setCol} />
              {matrix && (
                <table className="data-table w-auto" data-testid="stage-matrix">
                  <thead>
                    <tr>
                      <th>{name(matrix.rowTeam)} \ {name(matrix.colTeam)}</th>
                      <th>C: {col[0]}</th>
                      <th>D: {col[1]}</th>
                    </tr>
                  </thead>
                  <tbody>
                    {matrix.payoffs.map((cells, i) => (
                      <tr key={i}>
                        <th>{i === 0 ? `C: ${row[0]}` : `D: ${row[1]}`}</th>
                        {cells.map((p, j) => (
                          <td key={j} className="font-mono text-xs">
                            {formatNumber(p[0])}, {formatNumber(p[1])}
                          </td>
                        ))}
                      </tr>
                    ))}
                  </tbody>
                </table>
              )}
              <label className="flex items-center gap-2">
                γ
                <input type="range" min={0} max={90} step={1} value={Math.round((gamma * 180) / Math.PI)} onChange={(e) => setGamma((Number(e.target.value) * Math.PI) / 180)} aria-label="Agreement strength gamma in degrees" />
                <span className="w-10 font-mono text-xs">{Math.round((gamma * 180) / Math.PI)}°</span>
              </label>
            </>
          )}
        </div>
      }
      job={matrix ? { analysis: 'agreement', stage: matrix, gamma: Math.min(gamma, Math.PI / 2), steps: 30 } : null}
      disabled={disabled}
      {...runner}
    >
      {(result) => {
        const team = side === 0 ? matrix?.rowTeam : matrix?.colTeam;
        const data = result.gamma.map((g, k) => ({ gamma: Math.round((g * 180) / Math.PI), ...Object.fromEntries(result.curves.map((c) => [c.profile, Number(c.payoffs[k]![side].toFixed(3))])) }));
        return (
          <>
            <div className="flex items-center gap-3 text-sm">
              Payoffs of
              {[0, 1].map((s) => (
                <label key={s} className="flex items-center gap-1">
                  <input type="radio" name="agreement-side" checked={side === s} onChange={() => setSide(s as 0 | 1)} /> {name(s === 0 ? matrix!.rowTeam : matrix!.colTeam)}
                </label>
              ))}
            </div>
            <div className="h-72" data-testid="agreement-chart">
              <ResponsiveContainer width="100%" height="100%">
                <LineChart data={data} margin={{ right: 16, bottom: 8 }}>
                  <CartesianGrid strokeDasharray="3 3" stroke="#d6dce2" />
                  <XAxis dataKey="gamma" stroke={INK} fontSize={11} unit="°" />
                  <YAxis stroke={INK} fontSize={11} />
                  <Tooltip />
                  <Legend />
                  <ReferenceLine x={Math.round((gamma * 180) / Math.PI)} stroke="#b06f1e" strokeDasharray="4 2" />
                  {result.curves.map((c, i) => (
                    <Line key={c.profile} type="monotone" dataKey={c.profile} stroke={SERIES[i % SERIES.length]} dot={false} strokeWidth={2} isAnimationActive={false} />
                  ))}
                </LineChart>
              </ResponsiveContainer>
            </div>
            <p className="text-xs text-ink-600">Lines: payoffs of {team ? name(team) : ''} for each named profile (C restrained, D pressing, Q the scheme’s own move).</p>
            <table className="data-table" data-testid="agreement-table">
              <thead>
                <tr>
                  <th>Profile</th>
                  <th>An equilibrium when γ is</th>
                </tr>
              </thead>
              <tbody>
                {result.curves.map((c) => (
                  <tr key={c.profile}>
                    <td>{c.profile}</td>
                    <td>{equilibriumRanges(result.gamma, c.equilibrium)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            {result.equilibria && (
              <p className="text-sm">
                At γ = {Math.round((gamma * 180) / Math.PI)}°:{' '}
                {result.equilibria.length === 0
                  ? 'no pure equilibrium on the search grid.'
                  : result.equilibria
                      .slice(0, 6)
                      .map((e) => `${e.rowName ?? 'mixed'},${e.colName ?? 'mixed'} (${formatNumber(e.payoffs[0])}, ${formatNumber(e.payoffs[1])})`)
                      .join('; ')}
              </p>
            )}
          </>
        );
      }}
    </JobPanel>
  );
}

export function BeliefPanel() {
  const { document, equilibrium } = useWorkbench();
  const stages = useStages();
  const runner = useRunner<BeliefForecast>();
  const [pick, setPick] = useState(0);
  const [side, setSide] = useState<0 | 1>(0);
  const [lambda, setLambda] = useState(1);
  const stage = stages[Math.min(pick, stages.length - 1)];
  const mover = stage?.movers[side];
  const [restrained, setRestrained] = useState<string | null>(null);
  useEffect(() => {
    if (mover) setRestrained(defaultPair(mover)[0]);
  }, [stage?.nodeId, side]);
  const name = (id: string) => document.teams.find((t) => t.id === id)?.name ?? id;
  return (
    <JobPanel
      id="belief"
      title="Quarter-law forecast"
      intro={
        <div className="space-y-2">
          <p>
            When a team moves without knowing the other’s move, the quarter law of quantum decision theory (Yukalov and Sornette) adds about a quarter to
            the probability of the restrained move, compared with the rate when the other’s move is known. Shown beside the logit forecast at the same λ.
          </p>
          {stage && mover && (
            <>
              <StagePicker stages={stages} value={pick} onChange={setPick} />
              <div className="grid grid-cols-2 gap-2">
                <label className="block text-sm">
                  <span className="field-label">Team</span>
                  <select className="field-input py-1" value={side} onChange={(e) => setSide(Number(e.target.value) as 0 | 1)}>
                    {stage.movers.map((m, i) => (
                      <option key={m.team} value={i}>
                        {name(m.team)}
                      </option>
                    ))}
                  </select>
                </label>
                <label className="block text-sm">
                  <span className="field-label">Restrained move</span>
                  <select className="field-input py-1" value={restrained ?? ''} onChange={(e) => setRestrained(e.target.value)}>
                    {mover.actions.map((a) => (
                      <option key={a}>{a}</option>
                    ))}
                  </select>
                </label>
              </div>
              <label className="flex items-center gap-2">
                λ
                <input type="range" min={0} max={10} step={0.1} value={lambda} onChange={(e) => setLambda(Number(e.target.value))} aria-label="Rationality lambda of the belief forecast" />
                <span className="w-10 font-mono text-xs">{lambda.toFixed(1)}</span>
              </label>
            </>
          )}
        </div>
      }
      job={stage && mover && restrained ? { analysis: 'belief', nodeId: stage.nodeId, team: mover.team, restrained, lambda } : null}
      disabled={stages.length === 0 ? 'This tree has no stage where two teams move without seeing each other’s move.' : !equilibrium ? 'Waiting for the equilibrium.' : null}
      {...runner}
    >
      {(result) => (
        <table className="data-table w-auto" data-testid="belief-table">
          <tbody>
            <tr>
              <th>Restrained move when the other’s move is known (logit, averaged)</th>
              <td className="font-mono">{formatPercent(result.knownMove)}</td>
            </tr>
            <tr>
              <th>Quarter-law forecast when it is not known</th>
              <td className="font-mono">{formatPercent(result.quarterLaw.probability)}</td>
            </tr>
            <tr>
              <th>Logit QRE forecast at the same λ</th>
              <td className="font-mono">{formatPercent(result.qre)}</td>
            </tr>
          </tbody>
        </table>
      )}
    </JobPanel>
  );
}
