/** Pieces every live screen shares: the status strip, the countdown, the connection, briefs, injects, moves, analysis. */
import type { ReactNode } from 'react';
import type { LiveState } from '../../lib/exercise/live-client';
import type { RichText as RichTextDoc, RichTextNode } from '../../lib/scenario';
import type { AnalysisView, ClockView, InjectView, MoveView, Snapshot, TeamView } from '../../lib/exercise/view';

const FALLBACK_COLOURS = ['#2f4f73', '#a5362b', '#3a7150', '#935b17', '#4a5868', '#7a4b13'];

export function teamColour(teams: TeamView[], teamId: string | null): string {
  const i = teams.findIndex((t) => t.id === teamId);
  return teams[i]?.colour ?? FALLBACK_COLOURS[Math.max(0, i) % FALLBACK_COLOURS.length]!;
}

export function teamName(teams: TeamView[], teamId: string | null): string {
  if (teamId === null) return 'Chance';
  return teams.find((t) => t.id === teamId)?.name ?? teamId;
}

export function TeamName({ teams, teamId }: { teams: TeamView[]; teamId: string | null }) {
  return (
    <span className="inline-flex items-center gap-1.5 font-medium">
      <span aria-hidden="true" className="inline-block h-2.5 w-2.5 rounded-sm" style={{ background: teamId === null ? '#8593a2' : teamColour(teams, teamId) }} />
      {teamName(teams, teamId)}
    </span>
  );
}

export function Kbd({ children }: { children: ReactNode }) {
  return <kbd className="rounded border border-ink-300 bg-ink-50 px-1 font-mono text-[0.7rem] text-ink-700">{children}</kbd>;
}

export function Empty({ children, testId }: { children: ReactNode; testId?: string }) {
  return (
    <div className="rounded-md border border-dashed border-ink-300 px-4 py-5 text-center text-sm text-ink-600" data-empty={testId}>
      {children}
    </div>
  );
}

export function Panel({ title, children, actions, id, className = '' }: { title: string; children: ReactNode; actions?: ReactNode; id?: string; className?: string }) {
  const headingId = id ? `${id}-heading` : undefined;
  return (
    <section className={`panel p-4 ${className}`} aria-labelledby={headingId} data-panel={id}>
      <div className="mb-3 flex items-center justify-between gap-2">
        <h2 id={headingId} className="text-base">
          {title}
        </h2>
        {actions}
      </div>
      {children}
    </section>
  );
}

// ---------------------------------------------------------------------------
// Time and connection.

function clockText(ms: number): string {
  // Rounded, not ceiled: the clock offset is an estimate, and a fresh ten-minute turn should read 10:00, not 10:01.
  const total = Math.max(0, Math.round(ms / 1000));
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = total % 60;
  const mm = String(m).padStart(2, '0');
  const ss = String(s).padStart(2, '0');
  return h > 0 ? `${h}:${mm}:${ss}` : `${mm}:${ss}`;
}

export function Countdown({ clock, now, large = false }: { clock: ClockView; now: number | null; large?: boolean }) {
  const size = large ? 'text-3xl' : 'text-lg';
  if (clock.status === 'none') return <span className="text-sm text-ink-600" data-testid="countdown" data-clock="none">No time limit</span>;
  if (clock.status === 'expired') {
    return (
      <span className={`font-mono font-semibold text-brick-700 ${size}`} data-testid="countdown" data-clock="expired" role="status">
        Time is up
      </span>
    );
  }
  const left = clock.status === 'running' ? (now === null ? null : (clock.deadlineAt ?? 0) - now) : clock.leftMs;
  const urgent = left !== null && left < 60_000 && clock.status === 'running';
  return (
    <span className="inline-flex items-baseline gap-2" data-testid="countdown" data-clock={clock.status}>
      <span className={`font-mono font-semibold tabular-nums ${size} ${urgent ? 'text-brick-700' : 'text-ink-950'}`} aria-label={left === null ? 'time left' : `${clockText(left)} left`}>
        {left === null ? '--:--' : clockText(left)}
      </span>
      {clock.status === 'held' && <span className="tag bg-ink-100 text-ink-700">clock held</span>}
    </span>
  );
}

export function ConnectionBadge({ live }: { live: LiveState }) {
  const styles: Record<LiveState['connection'], [string, string]> = {
    open: ['bg-moss-600', 'Connected'],
    connecting: ['bg-ink-400', 'Connecting…'],
    reconnecting: ['bg-bronze-500', 'Reconnecting…'],
    refused: ['bg-brick-600', 'Not connected'],
  };
  const [dot, words] = styles[live.connection];
  return (
    <span className="inline-flex items-center gap-2 text-sm text-ink-700" role="status" aria-live="polite" data-testid="connection" data-connection={live.connection}>
      <span aria-hidden="true" className={`inline-block h-2.5 w-2.5 rounded-full ${dot}`} />
      {words}
      {live.pending > 0 && <span className="text-xs text-bronze-700">({live.pending} waiting to send, kept if the page reloads)</span>}
      {live.connection === 'refused' && live.refusal && <span className="text-xs text-brick-700">{live.refusal}</span>}
      {live.refusedAfterReload.map((words, k) => (
        <span key={k} className="text-xs text-brick-700" data-testid="refused-after-reload">
          Not accepted after the page reloaded. {words}
        </span>
      ))}
    </span>
  );
}

const STATE_STYLE: Record<string, string> = {
  draft: 'bg-ink-100 text-ink-700',
  briefing: 'bg-haze-100 text-haze-700',
  live: 'bg-bronze-100 text-bronze-800',
  paused: 'bg-ink-200 text-ink-800',
  ended: 'bg-moss-100 text-moss-700',
};
const STATE_WORDS: Record<string, string> = { draft: 'set-up', briefing: 'briefing', live: 'live', paused: 'paused', ended: 'ended' };

export function StateTag({ state }: { state: string }) {
  return (
    <span className={`tag ${STATE_STYLE[state] ?? ''}`} data-testid="exercise-state">
      {STATE_WORDS[state] ?? state}
    </span>
  );
}

/** Who moves now, in words. */
export function stageWords(view: Snapshot): string {
  const s = view.situation;
  const teams = view.exercise.teams;
  if (view.exercise.state === 'ended' || s.kind === 'terminal') return 'Play has ended';
  if (s.kind === 'chance') return 'Chance decides what happens next';
  const names = s.movers.map((m) => teamName(teams, m.teamId));
  return s.kind === 'simultaneous' ? `${names.join(' and ')} move at the same time` : `${names[0]} to move`;
}

/** Links to the exercise's Review and Report, for the seats that work on them. */
export function AfterPlayLinks({ view }: { view: Snapshot }) {
  const base = `/exercises/${view.exercise.id}`;
  return (
    <nav aria-label="After play" className="flex gap-3 text-sm">
      <a href={`${base}/review`}>Review</a>
      <a href={`${base}/report`}>Report</a>
    </nav>
  );
}

export function StatusStrip({ view, live, now, children }: { view: Snapshot; live: LiveState; now: number | null; children?: ReactNode }) {
  return (
    <div className="panel mb-4 flex flex-wrap items-center gap-x-6 gap-y-3 px-4 py-3" data-testid="status-strip">
      <div className="min-w-64 flex-1">
        <div className="flex flex-wrap items-center gap-2">
          <h1 className="text-xl">{view.exercise.title}</h1>
          <StateTag state={view.exercise.state} />
        </div>
        <p className="text-sm text-ink-600">
          {view.exercise.scenarioTitle} · <span data-testid="turn">Turn {view.situation.turn}</span> · <span data-testid="stage-words">{stageWords(view)}</span>
        </p>
      </div>
      <Countdown clock={view.clock} now={now} large />
      <ConnectionBadge live={live} />
      {children}
    </div>
  );
}

// ---------------------------------------------------------------------------
// Material.

function marked(text: string, marks: RichTextNode['marks']): ReactNode {
  return (marks ?? []).reduce<ReactNode>((inner, mark) => {
    if (mark.type === 'bold') return <strong>{inner}</strong>;
    if (mark.type === 'italic') return <em>{inner}</em>;
    return inner;
  }, text);
}

function RichNode({ node }: { node: RichTextNode }): ReactNode {
  const children = (node.content ?? []).map((child, i) => <RichNode key={i} node={child} />);
  switch (node.type) {
    case 'text':
      return marked(node.text ?? '', node.marks);
    case 'paragraph':
      return <p className="mb-2 last:mb-0">{children}</p>;
    case 'heading':
      return <h3 className="mt-3 mb-1 text-sm font-semibold text-ink-900">{children}</h3>;
    case 'bulletList':
      return <ul className="mb-2 list-disc pl-5">{children}</ul>;
    case 'orderedList':
      return <ol className="mb-2 list-decimal pl-5">{children}</ol>;
    case 'listItem':
      return <li>{children}</li>;
    case 'hardBreak':
      return <br />;
    case 'blockquote':
      return <blockquote className="mb-2 border-l-2 border-ink-200 pl-3 text-ink-700">{children}</blockquote>;
    default:
      return <>{children}</>;
  }
}

export function RichText({ doc }: { doc: RichTextDoc | null }) {
  if (!doc || doc.content.length === 0) return null;
  return (
    <div className="text-sm leading-relaxed text-ink-800">
      {doc.content.map((node, i) => (
        <RichNode key={i} node={node} />
      ))}
    </div>
  );
}

export function ExerciseMark() {
  return <span className="tag bg-bronze-700 tracking-[0.2em] text-white">EXERCISE</span>;
}

function time(at: number | string): string {
  return new Date(at).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' });
}

export function InjectCard({ inject, teams }: { inject: InjectView; teams: TeamView[] }) {
  const to = inject.to === 'all' ? 'all teams' : inject.to.map((t) => teamName(teams, t)).join(', ');
  return (
    <article className="rounded-md border border-bronze-200 bg-bronze-100/40 p-3" data-testid="inject">
      <div className="mb-1 flex flex-wrap items-center gap-2">
        <ExerciseMark />
        <h3 className="text-sm font-semibold text-ink-950">{inject.title}</h3>
      </div>
      <p className="text-xs text-ink-600">
        Turn {inject.turn} · {time(inject.at)} · to {to}
      </p>
      <p className="mt-2 text-sm whitespace-pre-wrap text-ink-800">{inject.body}</p>
      {inject.attachments.length > 0 && (
        <ul className="mt-2 text-sm">
          {inject.attachments.map((a) => (
            <li key={a.id}>
              <a href={`/api/attachments/${a.id}`}>{a.filename}</a>
            </li>
          ))}
        </ul>
      )}
    </article>
  );
}

export function Injects({ view }: { view: Snapshot }) {
  if (view.injects.length === 0) return <Empty testId="injects">No injects yet. Events the facilitator sends appear here.</Empty>;
  return (
    <div className="space-y-3">
      {[...view.injects].reverse().map((i) => (
        <InjectCard key={i.id} inject={i} teams={view.exercise.teams} />
      ))}
    </div>
  );
}

const KIND_WORDS: Record<MoveView['kind'], string> = { ladder: 'on the ladder', adjudicated: 'adjudicated', chance: 'chance' };

export function MoveLine({ move, teams, actions }: { move: MoveView; teams: TeamView[]; actions?: ReactNode }) {
  return (
    <li className="py-2" data-testid="move" data-move-id={move.id}>
      <div className="flex flex-wrap items-center gap-x-2 gap-y-1 text-sm">
        <span className="w-14 shrink-0 text-xs text-ink-500">Turn {move.turn}</span>
        <TeamName teams={teams} teamId={move.teamId} />
        <span className="text-ink-400">→</span>
        <span className="font-semibold text-ink-950">{move.label}</span>
        {move.kind !== 'ladder' && <span className={`tag ${move.kind === 'chance' ? 'bg-haze-100 text-haze-700' : 'bg-bronze-100 text-bronze-800'}`}>{KIND_WORDS[move.kind]}</span>}
        <span className="ml-auto text-xs text-ink-500">{time(move.at)}</span>
        {actions}
      </div>
      <div className="pl-16 text-xs text-ink-600">
        {move.proposal && <p>Proposed: “{move.proposal}”</p>}
        {move.reason && <p>Reason: {move.reason}</p>}
        {move.draw && (
          <p>
            Seeded draw {move.draw.value.toFixed(4)} (seed {move.draw.seed})
          </p>
        )}
        {move.rationale && <p>Rationale: {move.rationale}</p>}
        {move.confidence !== null && <p>Confidence {move.confidence}%</p>}
      </div>
    </li>
  );
}

export function MoveList({ view, actions }: { view: Snapshot; actions?: (move: MoveView) => ReactNode }) {
  if (view.moves.length === 0) return <Empty testId="moves">No moves yet. Revealed moves are listed here in the order they took effect.</Empty>;
  return (
    <ol className="divide-y divide-ink-100" data-testid="move-list">
      {view.moves.map((m) => (
        <MoveLine key={m.id} move={m} teams={view.exercise.teams} actions={actions?.(m)} />
      ))}
    </ol>
  );
}

export function Situation({ view }: { view: Snapshot }) {
  const s = view.situation;
  return (
    <div data-testid="situation">
      {s.rung ? (
        <div className="mb-2">
          <p className="text-xs font-semibold tracking-wide text-ink-500 uppercase">The crisis stands at</p>
          <p className="text-lg font-semibold text-ink-950" data-testid="rung">
            {s.rung.name}
          </p>
          <p className="text-sm text-ink-700">{s.rung.description}</p>
        </div>
      ) : (
        <p className="mb-2 text-sm text-ink-700">{view.moves.length === 0 ? 'Play has not moved the crisis yet.' : 'Play continues.'}</p>
      )}
      {s.outcome && (
        <div className="rounded-md border border-moss-600 bg-moss-100 p-3 text-sm text-moss-700" data-testid="outcome">
          <p className="font-semibold">Outcome: {s.outcome.text}</p>
          {s.outcome.payoffs && (
            <p className="mt-1 text-xs">
              Authored payoffs:{' '}
              {Object.entries(s.outcome.payoffs)
                .map(([t, v]) => `${teamName(view.exercise.teams, t)} ${v}`)
                .join(' · ')}
            </p>
          )}
        </div>
      )}
      {s.chance && (
        <p className="text-sm text-ink-700">
          Chance node: {s.chance.map((c) => `${c.label} (${c.p})`).join(', ')}. The facilitator resolves it with the server’s seeded draw or by choice.
        </p>
      )}
    </div>
  );
}

export function Analysis({ analysis, teams }: { analysis: AnalysisView; teams: TeamView[] }) {
  return (
    <div data-testid="analysis">
      <p className="mb-2 rounded bg-paper-deep px-2 py-1.5 text-xs text-ink-700" data-caution>
        <strong>Caution:</strong> {analysis.caution}
      </p>
      {analysis.status !== 'ready' ? (
        <p className="text-sm text-ink-600">{analysis.message}</p>
      ) : !analysis.equilibrium && !analysis.forecast ? (
        <p className="text-sm text-ink-600">Nothing to recommend here: no team moves at this node.</p>
      ) : (
        <div className="space-y-3 text-sm">
          {analysis.equilibrium && (
            <div>
              <p className="text-xs font-semibold tracking-wide text-ink-500 uppercase">Subgame-perfect play from here</p>
              <ul className="mt-1">
                {analysis.equilibrium.actions.map((a) => (
                  <li key={a.teamId}>
                    <TeamName teams={teams} teamId={a.teamId} />: <strong>{a.label}</strong>
                    {a.margin !== null && <span className="text-ink-600"> (ahead of the next best by {a.margin})</span>}
                  </li>
                ))}
              </ul>
              {analysis.equilibrium.outcome && <p className="mt-1 text-ink-700">Leads to: {analysis.equilibrium.outcome}</p>}
              {analysis.equilibrium.note && (
                <p className="mt-1 text-xs text-ink-600" data-testid="equilibrium-note">
                  {analysis.equilibrium.note}
                </p>
              )}
            </div>
          )}
          {analysis.forecast && (
            <div>
              <p className="text-xs font-semibold tracking-wide text-ink-500">
                <span className="uppercase">Logit QRE forecast</span> (λ = {analysis.forecast.lambda})
              </p>
              {analysis.forecast.teams.map((t) => (
                <div key={t.teamId} className="mt-1">
                  <TeamName teams={teams} teamId={t.teamId} />
                  <ul className="mt-1 space-y-0.5">
                    {Object.entries(t.probabilities).map(([label, p]) => (
                      <li key={label} className="flex items-center gap-2 text-xs">
                        <span className="w-40 truncate">{label}</span>
                        <span className="h-2 flex-1 rounded bg-ink-100">
                          <span className="block h-2 rounded bg-haze-700" style={{ width: `${Math.round(p * 100)}%` }} />
                        </span>
                        <span className="w-10 text-right tabular-nums">{Math.round(p * 100)}%</span>
                      </li>
                    ))}
                  </ul>
                </div>
              ))}
            </div>
          )}
        </div>
      )}
    </div>
  );
}

export function Briefs({ view }: { view: Snapshot }) {
  return (
    <div className="space-y-4" data-testid="briefs">
      {view.briefs.map((b) => (
        <div key={b.teamId ?? 'all'}>
          <p className="mb-1 text-xs font-semibold tracking-wide text-ink-500 uppercase">{b.teamId === null ? 'For every team' : `${b.teamName} only`}</p>
          {b.setting && <p className="mb-2 text-sm text-ink-800">{b.setting}</p>}
          <RichText doc={b.brief} />
          {!b.setting && !b.brief && <p className="text-sm text-ink-600">No brief was written.</p>}
          {b.attachments.length > 0 && (
            <ul className="mt-2 text-sm">
              {b.attachments.map((a) => (
                <li key={a.id}>
                  <a href={`/api/attachments/${a.id}`}>{a.filename}</a> <span className="text-xs text-ink-500">({Math.ceil(a.size / 1024)} KB)</span>
                </li>
              ))}
            </ul>
          )}
        </div>
      ))}
    </div>
  );
}

export function MissedNotice({ live }: { live: LiveState }) {
  if (live.missed.length === 0) return null;
  return (
    <div className="mb-4 rounded-md border border-haze-700/30 bg-haze-100 px-3 py-2 text-sm text-haze-700" role="status" data-testid="missed">
      While you were away: {live.missed.map((e) => e.summary).join(' · ')}
    </div>
  );
}
