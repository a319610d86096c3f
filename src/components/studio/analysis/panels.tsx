/**
 * The analysis panels of the Studio, each one job on the server. Every result
 * carries the caution that it follows from the assumed payoffs.
 */
import { useMemo, useState, type ReactNode } from 'react';
import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { choiceKey, nodeById, type CredibilityVerdict, type MonteCarloResult, type QreResult, type SensitivityResult } from '../../../lib/engine';
import type { StudioJob } from '../../../lib/studio/analysis-types';
import { useWorkbench } from '../workbench/context';
import { AnalysisCaution, NumField } from '../workbench/fields';
import { formatNumber, formatPercent } from '../workbench/format';
import { ProgressBar } from './ProgressBar';
import { useJob, type JobState } from './useJob';

const INK = '#34414f';
const BRONZE = '#b06f1e';
const SERIES = ['#2f4f73', '#a5362b', '#3a7150', '#935b17', '#647384'];

/** A panel that runs one job: its command, progress, failure and result. */
export function JobPanel<R>({ id, title, intro, job, state, run, cancel, disabled, children }: {
  id: string;
  title: string;
  intro: ReactNode;
  job: StudioJob | null;
  state: JobState<R>;
  run: (job: StudioJob) => void;
  cancel: () => void;
  disabled?: string | null;
  children: (result: R) => ReactNode;
}) {
  return (
    <section className="panel space-y-3 p-4" aria-labelledby={`${id}-heading`} data-testid={`panel-${id}`}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id={`${id}-heading`} className="text-base">
          {title}
        </h2>
        <button type="button" className="btn-primary py-1" disabled={Boolean(disabled) || !job || state.status === 'running'} onClick={() => job && run(job)}>
          {state.status === 'done' ? 'Run again' : 'Run'}
        </button>
      </div>
      <div className="text-sm text-ink-700">{intro}</div>
      {disabled && <p className="text-sm text-ink-600">{disabled}</p>}
      {state.status === 'running' && <ProgressBar fraction={state.fraction} phase={state.phase} onCancel={cancel} />}
      {state.status === 'cancelled' && <p className="text-sm text-ink-600">Cancelled. Run it again when you are ready.</p>}
      {state.status === 'failed' && (
        <div role="alert" className="text-sm text-brick-700">
          {state.message}
          {state.fields.length > 0 && (
            <ul className="list-disc pl-5">
              {state.fields.slice(0, 10).map((f, i) => (
                <li key={i}>
                  <code className="font-mono text-xs">{f.field}</code> {f.reason}
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
      {state.status === 'done' && (
        <div className="space-y-2">
          {children(state.result)}
          <p className="text-xs text-ink-500">Computed in {state.seconds.toFixed(2)} s.</p>
          <AnalysisCaution />
        </div>
      )}
    </section>
  );
}

function useRunner<R>() {
  const { scenarioId, document } = useWorkbench();
  const job = useJob<R>(scenarioId);
  return { state: job.state, run: (request: StudioJob) => void job.start(document, request), cancel: job.cancel };
}

function outcomeName(id: string, names: Map<string, string>): string {
  return names.get(id) ?? id;
}

function useOutcomeNames(): Map<string, string> {
  const { document, game } = useWorkbench();
  return useMemo(() => {
    const out = new Map<string, string>();
    if (!game) return out;
    const stack = [document.tree];
    while (stack.length > 0) {
      const node = stack.pop()!;
      if (node.kind === 'terminal') out.set(node.id, node.outcome ?? node.id);
      else for (const e of node.kind === 'decision' ? node.actions : node.outcomes) stack.push(e.next);
    }
    return out;
  }, [document.tree, game]);
}

// ---------------------------------------------------------------------------

export function MarksPanel() {
  const { document, change, readOnly } = useWorkbench();
  const runner = useRunner<CredibilityVerdict[]>();
  const teamName = (id: string) => document.teams.find((t) => t.id === id)?.name ?? id;
  return (
    <JobPanel
      id="marks"
      title="Threats and promises"
      intro={
        <>
          <p>
            Mark an action as a threat or a promise on the Tree tab (select its node). A mark is credible when the team would really choose that action if
            play reached it; the margin is what carrying it out would gain (or cost) the team.
          </p>
          {document.marks.length > 0 && (
            <ul className="mt-2 space-y-1" aria-label="Marked threats and promises">
              {document.marks.map((m, i) => (
                <li key={`${m.nodeId}:${m.action}`} className="flex items-center gap-2">
                  <span className="tag bg-paper-deep text-ink-800">{m.kind}</span>
                  <span className="min-w-0 flex-1 truncate">{m.action}</span>
                  <input
                    className="field-input w-64 py-1 text-xs"
                    aria-label={`Note on the ${m.kind} ${m.action}`}
                    placeholder="What the team said"
                    value={m.note ?? ''}
                    readOnly={readOnly}
                    maxLength={2000}
                    onChange={(e) => change('note on a mark', (d) => ({ ...d, marks: d.marks.map((x, k) => (k === i ? { ...x, note: e.target.value || undefined } : x)) }))}
                  />
                  {!readOnly && (
                    <button type="button" className="btn-quiet px-2 py-0.5" aria-label={`Remove the ${m.kind} ${m.action}`} onClick={() => change('remove a mark', (d) => ({ ...d, marks: d.marks.filter((_, k) => k !== i) }))}>
                      ✕
                    </button>
                  )}
                </li>
              ))}
            </ul>
          )}
        </>
      }
      job={{ analysis: 'credibility' }}
      disabled={document.marks.length === 0 ? 'Nothing is marked yet. Select a decision on the tree and mark one of its actions.' : null}
      {...runner}
    >
      {(verdicts) => (
        <table className="data-table" data-testid="verdicts">
          <thead>
            <tr>
              <th>Mark</th>
              <th>Team</th>
              <th>Verdict</th>
              <th>Margin</th>
              <th>What it would choose</th>
            </tr>
          </thead>
          <tbody>
            {verdicts.map((v) => (
              <tr key={`${v.nodeId}:${v.action}`}>
                <td>
                  <span className="tag bg-paper-deep text-ink-800">{v.kind}</span> {v.action}
                  {v.note && <p className="text-xs text-ink-600">{v.note}</p>}
                  <p className="text-xs text-ink-500">{v.explanation}</p>
                </td>
                <td>{teamName(v.team)}</td>
                <td>
                  <span className={`tag ${v.credible ? 'bg-moss-100 text-moss-700' : 'bg-brick-100 text-brick-700'}`}>{v.credible ? 'credible' : 'not credible'}</span>
                  {!v.onPath && <p className="text-xs text-ink-500">off the equilibrium path</p>}
                </td>
                <td className="font-mono text-xs">{formatNumber(v.margin)}</td>
                <td>{v.equilibriumAction}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </JobPanel>
  );
}

// ---------------------------------------------------------------------------

export function SensitivityPanel() {
  const { document } = useWorkbench();
  const names = useOutcomeNames();
  const runner = useRunner<SensitivityResult>();
  const teamName = (id: string) => document.teams.find((t) => t.id === id)?.name ?? id;
  return (
    <JobPanel
      id="sensitivity"
      title="Payoff tolerance"
      intro="For every payoff, how far it can move (all others held) before equilibrium play changes. The payoffs with the least room are the assumptions to argue about."
      job={{ analysis: 'sensitivity' }}
      {...runner}
    >
      {(result) => {
        const rows = result.intervals
          .map((iv) => {
            const room = Math.min(iv.low === null ? Infinity : iv.value - iv.low, iv.high === null ? Infinity : iv.high - iv.value);
            return { ...iv, room, name: `${outcomeName(iv.terminalId, names)} · ${teamName(iv.team)}` };
          })
          .sort((a, b) => a.room - b.room);
        const closest = rows.filter((r) => Number.isFinite(r.room)).slice(0, 10);
        return (
          <>
            <p className="text-xs text-ink-600">{result.method}</p>
            {closest.length > 0 && (
              <div className="h-72" data-testid="sensitivity-chart">
                <ResponsiveContainer width="100%" height="100%">
                  <BarChart data={closest.map((r) => ({ name: r.name.slice(0, 48), room: Number(r.room.toFixed(3)) }))} layout="vertical" margin={{ left: 16, right: 16 }}>
                    <CartesianGrid strokeDasharray="3 3" stroke="#d6dce2" />
                    <XAxis type="number" stroke={INK} fontSize={11} label={{ value: 'room before the path changes', position: 'insideBottom', offset: -2, fontSize: 11 }} />
                    <YAxis type="category" dataKey="name" width={260} stroke={INK} fontSize={10} />
                    <Tooltip />
                    <Bar dataKey="room" fill={BRONZE} name="Room" />
                  </BarChart>
                </ResponsiveContainer>
              </div>
            )}
            <div className="max-h-96 overflow-auto">
              <table className="data-table" data-testid="sensitivity-table">
                <thead>
                  <tr>
                    <th>Outcome · team</th>
                    <th>Payoff</th>
                    <th>Path holds from</th>
                    <th>to</th>
                  </tr>
                </thead>
                <tbody>
                  {rows.slice(0, 300).map((r) => (
                    <tr key={`${r.terminalId}:${r.team}`}>
                      <td>{r.name}</td>
                      <td className="font-mono text-xs">{formatNumber(r.value)}</td>
                      <td className="font-mono text-xs">{r.low === null ? '−∞' : formatNumber(r.low)}</td>
                      <td className="font-mono text-xs">
                        {r.high === null ? '+∞' : formatNumber(r.high)}
                        {r.approximate ? ' ≈' : ''}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {rows.length > 300 && <p className="text-xs text-ink-600">The 300 payoffs with the least room are shown, of {rows.length}.</p>}
            </div>
          </>
        );
      }}
    </JobPanel>
  );
}

// ---------------------------------------------------------------------------

export function MonteCarloPanel() {
  const { document, change, readOnly, selectedNodeId, payoffs } = useWorkbench();
  const names = useOutcomeNames();
  const runner = useRunner<MonteCarloResult>();
  const [samples, setSamples] = useState(2_000);
  const [seed, setSeed] = useState(7);
  const selected = selectedNodeId && names.has(selectedNodeId) ? selectedNodeId : null;
  const teamName = (id: string) => document.teams.find((t) => t.id === id)?.name ?? id;
  const addRanges = (nodeId: string) =>
    change('add payoff ranges', (d) => {
      const values = payoffs.get(nodeId) ?? [];
      const fresh = d.teams
        .map((t, i) => ({ nodeId, team: t.id, value: Number(values[i] ?? 0) }))
        .filter((r) => !d.payoffRanges.some((p) => p.nodeId === nodeId && p.team === r.team))
        .map((r) => ({ nodeId, team: r.team, distribution: { kind: 'uniform' as const, low: r.value - 2, high: r.value + 2 } }));
      return { ...d, payoffRanges: [...d.payoffRanges, ...fresh] };
    });
  const setRange = (index: number, patch: Partial<{ low: number | string; high: number | string }>) =>
    change('edit a payoff range', (d) => ({ ...d, payoffRanges: d.payoffRanges.map((r, i) => (i === index ? { ...r, distribution: { ...r.distribution, ...patch } } : r)) }));
  return (
    <div className="space-y-3">
      <section className="panel space-y-2 p-4" aria-labelledby="ranges-heading">
        <h2 id="ranges-heading" className="text-base">
          Payoff ranges
        </h2>
        {!readOnly && (
          <button type="button" className="btn-quiet py-1" disabled={!selected} onClick={() => selected && addRanges(selected)}>
            {selected ? `Give “${outcomeName(selected, names).slice(0, 40)}” ranges of ±2` : 'Select an outcome on the tree to give its payoffs ranges'}
          </button>
        )}
        {document.payoffRanges.length > 0 && (
          <table className="data-table" data-testid="ranges-table">
            <thead>
              <tr>
                <th>Outcome</th>
                <th>Team</th>
                <th>Low</th>
                <th>High</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {document.payoffRanges.map((r, i) => (
                <tr key={`${r.nodeId}:${r.team}`}>
                  <td>{outcomeName(r.nodeId, names)}</td>
                  <td>{teamName(r.team)}</td>
                  <td>
                    <NumField label={`Low payoff of ${teamName(r.team)}`} value={r.distribution.low} className="w-20" readOnly={readOnly} onChange={(low) => setRange(i, { low })} />
                  </td>
                  <td>
                    <NumField label={`High payoff of ${teamName(r.team)}`} value={r.distribution.high} className="w-20" readOnly={readOnly} onChange={(high) => setRange(i, { high })} />
                  </td>
                  <td>
                    {!readOnly && (
                      <button type="button" className="btn-quiet px-2 py-1" aria-label="Remove this range" onClick={() => change('remove a payoff range', (d) => ({ ...d, payoffRanges: d.payoffRanges.filter((_, k) => k !== i) }))}>
                        ✕
                      </button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <div className="flex gap-3">
          <NumField label="Samples" showLabel value={samples} integer min={10} max={200_000} onChange={(v) => setSamples(Number(v))} />
          <NumField label="Seed" showLabel value={seed} integer min={0} onChange={(v) => setSeed(Number(v))} />
        </div>
      </section>
      <JobPanel
        id="monte-carlo"
        title="Payoff uncertainty"
        intro="Each sample draws the payoffs that have a range, solves the game and records where equilibrium play ends. The chart shows how often each outcome is the equilibrium outcome."
        job={{ analysis: 'monte-carlo', samples, seed }}
        disabled={document.payoffRanges.length === 0 ? 'No payoff has a range yet.' : null}
        {...runner}
      >
        {(result) => (
          <>
            <div className="h-64" data-testid="monte-carlo-chart">
              <ResponsiveContainer width="100%" height="100%">
                <BarChart data={result.outcomes.slice(0, 10).map((o) => ({ name: (o.outcome ?? o.terminalId).slice(0, 40), share: Number((o.probability * 100).toFixed(1)) }))} margin={{ bottom: 8 }}>
                  <CartesianGrid strokeDasharray="3 3" stroke="#d6dce2" />
                  <XAxis dataKey="name" stroke={INK} fontSize={10} interval={0} angle={-12} textAnchor="end" height={60} />
                  <YAxis stroke={INK} fontSize={11} unit="%" />
                  <Tooltip />
                  <Bar dataKey="share" fill={SERIES[0]} name="Share of samples (%)" />
                </BarChart>
              </ResponsiveContainer>
            </div>
            <p className="text-xs text-ink-600">
              {result.samples.toLocaleString('en-GB')} samples, seed {result.seed} ({result.generator}); the same seed gives the same result.
            </p>
          </>
        )}
      </JobPanel>
    </div>
  );
}

// ---------------------------------------------------------------------------

export function ForecastPanel() {
  const { document, equilibrium, game } = useWorkbench();
  const runner = useRunner<QreResult>();
  const [lambda, setLambda] = useState(1);
  return (
    <JobPanel
      id="forecast"
      title="Behavioural forecast"
      intro={
        <>
          Logit quantal response equilibrium: teams choose better actions more often, not always. At λ = 0 every action is equally likely; as λ grows play
          approaches the equilibrium. Shown along the equilibrium path; turn it on in the Tree tab to see it on every edge.
          <label className="mt-2 flex items-center gap-2">
            λ
            <input type="range" min={0} max={10} step={0.1} value={lambda} onChange={(e) => setLambda(Number(e.target.value))} aria-label="Rationality lambda" />
            <span className="w-10 font-mono text-xs">{lambda.toFixed(1)}</span>
          </label>
        </>
      }
      job={{ analysis: 'qre', lambda }}
      {...runner}
    >
      {(result) => {
        const steps = (equilibrium?.pathNodes ?? []).slice(0, -1).map((id, i) => {
          const node = game ? nodeById(game, id) : undefined;
          const probability = node?.kind === 'decision' ? result.behaviour[choiceKey(node)]?.[equilibrium!.path[i]!] : undefined;
          return { id, label: equilibrium!.path[i]!, probability };
        });
        return (
          <>
            <p className="text-xs text-ink-600">
              At λ = {formatNumber(Object.values(result.lambda)[0] ?? 0)}: expected payoffs {document.teams.map((t, i) => `${t.name} ${formatNumber(result.payoffs[i] ?? NaN)}`).join(' · ')}
              {result.converged ? '' : ' (the trace did not fully converge)'}
            </p>
            <table className="data-table" data-testid="forecast-table">
              <thead>
                <tr>
                  <th>Equilibrium step</th>
                  <th>Forecast probability</th>
                </tr>
              </thead>
              <tbody>
                {steps.map((step) => (
                  <tr key={step.id}>
                    <td>{step.label}</td>
                    <td className="font-mono text-xs">{step.probability === undefined ? 'chance' : formatPercent(step.probability)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </>
        );
      }}
    </JobPanel>
  );
}

export { INK, SERIES, useRunner };
