/** Console: the facilitator's screen during play. Teams, clock, the turn (reveal, adjudicate, chance), injects, analysis, undo, roster, settings, log. */
import { useState } from 'react';
import { FormMessage } from '../ui/Field';
import { useIntent, useLive, useServerNow, type Initial, type Send } from '../desk/live';
import { AfterPlayLinks, Analysis, Empty, Injects, MissedNotice, MoveList, Panel, Situation, StatusStrip, TeamName, teamName } from '../desk/parts';
import type { LiveState } from '../../lib/exercise/live-client';
import type { Snapshot } from '../../lib/exercise/view';
import { Roster, SettingsForm, AuditLog } from './Setup';
import { SubmitButton } from '../ui/SubmitButton';

type Props = { exerciseId: string; initial: Initial };
type Tab = 'run' | 'setup' | 'log';

export default function Console({ exerciseId, initial }: Props) {
  const { live, view, send } = useLive(exerciseId, initial);
  const now = useServerNow(live.clockOffset);
  const [tab, setTab] = useState<Tab>(view.exercise.state === 'draft' ? 'setup' : 'run');
  const tabs: [Tab, string][] = [
    ['run', 'Run the turn'],
    ['setup', 'Roster and settings'],
    ['log', 'Audit log'],
  ];
  return (
    <div data-surface="console">
      <StatusStrip view={view} live={live} now={now}>
        <AfterPlayLinks view={view} />
        <PhaseControls view={view} send={send} />
      </StatusStrip>
      <MissedNotice live={live} />
      <div role="tablist" aria-label="Console sections" className="mb-4 flex gap-1 border-b border-ink-200">
        {tabs.map(([id, label]) => (
          <button
            key={id}
            role="tab"
            type="button"
            aria-selected={tab === id}
            aria-controls={`console-${id}`}
            className={`-mb-px border-b-2 px-3 py-2 text-sm font-medium ${tab === id ? 'border-bronze-600 text-ink-950' : 'border-transparent text-ink-600 hover:text-ink-900'}`}
            onClick={() => setTab(id)}
          >
            {label}
          </button>
        ))}
      </div>
      <div id={`console-${tab}`} role="tabpanel">
        {tab === 'run' && <RunTab view={view} live={live} now={now} send={send} />}
        {tab === 'setup' && (
          <div className="grid gap-4 lg:grid-cols-2">
            <Roster exerciseId={exerciseId} view={view} send={send} />
            <SettingsForm view={view} send={send} />
          </div>
        )}
        {tab === 'log' && <AuditLog view={view} />}
      </div>
    </div>
  );
}

function PhaseControls({ view, send }: { view: Snapshot; send: Send }) {
  const phase = useIntent(send);
  const [ending, setEnding] = useState(false);
  const [reason, setReason] = useState('');
  const state = view.exercise.state;
  const go = (to: 'draft' | 'briefing' | 'live' | 'paused' | 'ended', why?: string) => void phase.run({ kind: 'phase', to, ...(why ? { reason: why } : {}) });
  return (
    <div className="flex flex-wrap items-center gap-2" data-testid="phase-controls">
      {state === 'draft' && (
        <button type="button" className="btn-quiet" onClick={() => go('briefing')} disabled={phase.busy}>
          Open the briefing
        </button>
      )}
      {state === 'briefing' && (
        <button type="button" className="btn-quiet" onClick={() => go('draft')} disabled={phase.busy}>
          Back to set-up
        </button>
      )}
      {(state === 'draft' || state === 'briefing') && (
        <button type="button" className="btn-accent" onClick={() => go('live')} disabled={phase.busy} data-testid="start-play">
          Start play
        </button>
      )}
      {state === 'live' && (
        <button type="button" className="btn-quiet" onClick={() => go('paused')} disabled={phase.busy}>
          Pause play
        </button>
      )}
      {state === 'paused' && (
        <button type="button" className="btn-accent" onClick={() => go('live')} disabled={phase.busy} data-testid="resume-play">
          Resume play
        </button>
      )}
      {(state === 'live' || state === 'paused') &&
        (ending ? (
          <form
            className="flex items-center gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              go('ended', reason.trim() || undefined);
              setEnding(false);
            }}
          >
            <input aria-label="Why end now (optional)" className="field-input w-56 py-1.5" placeholder="Why end now (optional)" value={reason} onChange={(e) => setReason(e.target.value)} autoFocus />
            <SubmitButton className="btn-danger">
              End now
            </SubmitButton>
            <button type="button" className="btn-quiet" onClick={() => setEnding(false)}>
              Cancel
            </button>
          </form>
        ) : (
          <button type="button" className="btn-danger" onClick={() => setEnding(true)}>
            End the exercise
          </button>
        ))}
      {phase.error && <span className="text-sm text-brick-700" role="alert">{phase.error}</span>}
    </div>
  );
}

function RunTab({ view, live, now, send }: { view: Snapshot; live: LiveState; now: number | null; send: Send }) {
  return (
    <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_26rem]">
      <div className="space-y-4">
        <div className="grid gap-4 md:grid-cols-[minmax(0,1fr)_18rem]">
          <Panel title="Teams" id="teams">
            <TeamBoard view={view} live={live} />
          </Panel>
          <Panel title="Clock" id="clock">
            <ClockControls view={view} now={now} send={send} />
          </Panel>
        </div>
        <Panel title={`Turn ${view.situation.turn}`} id="turn">
          <Situation view={view} />
          <div className="mt-3">
            <TurnControls view={view} send={send} />
          </div>
        </Panel>
        <Panel title="Record of play" id="record">
          <MoveList view={view} />
          <UndoControl view={view} send={send} />
        </Panel>
      </div>
      <div className="space-y-4">
        {view.analysis && (
          <Panel title="Analysis at this node" id="analysis">
            <Analysis analysis={view.analysis} teams={view.exercise.teams} />
          </Panel>
        )}
        <Panel title="Injects" id="injects">
          <InjectComposer view={view} send={send} />
          <div className="mt-4">
            <Injects view={view} />
          </div>
        </Panel>
      </div>
    </div>
  );
}

function clockWords(c: Snapshot['clock'], now: number | null): string {
  const minutes = (ms: number) => `${Math.max(0, Math.ceil(ms / 60_000))} min`;
  if (c.status === 'none') return 'No clock at this point of play.';
  if (c.status === 'expired') return 'Time is up for this turn.';
  if (c.status === 'held') return `Held, ${minutes(c.leftMs ?? 0)} left.`;
  return now === null ? 'Running.' : `Running, ${minutes((c.deadlineAt ?? now) - now)} left.`;
}

const STATUS_WORDS = { waiting: 'not started', drafting: 'drafting', proposed: 'proposal to adjudicate', submitted: 'submitted' } as const;

function TeamBoard({ view, live }: { view: Snapshot; live: LiveState }) {
  const online = new Set(live.presence.online.map((p) => p.userId));
  const onlineByTeam = (teamId: string) => live.presence.online.filter((p) => p.teamId === teamId && p.role === 'player').map((p) => p.name);
  return (
    <table className="data-table" data-testid="team-board">
      <thead>
        <tr>
          <th>Team</th>
          <th>Connected</th>
          <th>This turn</th>
        </tr>
      </thead>
      <tbody>
        {view.exercise.teams.map((team) => {
          const mover = view.situation.movers.find((m) => m.teamId === team.id);
          const here = onlineByTeam(team.id);
          return (
            <tr key={team.id} data-team={team.id}>
              <td>
                <TeamName teams={view.exercise.teams} teamId={team.id} />
                <div className="text-xs text-ink-500">{team.lead ? `lead ${team.lead}` : 'no lead yet'}</div>
              </td>
              <td className="text-xs">{here.length > 0 ? here.join(', ') : <span className="text-ink-500">nobody</span>}</td>
              <td className="text-xs" data-testid="team-status">
                {mover ? <span className={mover.status === 'submitted' ? 'font-semibold text-moss-700' : mover.status === 'proposed' ? 'font-semibold text-bronze-700' : ''}>{STATUS_WORDS[mover.status]}</span> : <span className="text-ink-500">does not move</span>}
              </td>
            </tr>
          );
        })}
      </tbody>
      <caption className="caption-bottom pt-2 text-left text-xs text-ink-500">{online.size === 1 ? '1 person' : `${online.size} people`} connected in all</caption>
    </table>
  );
}

function ClockControls({ view, now, send }: { view: Snapshot; now: number | null; send: Send }) {
  const clock = useIntent(send);
  const c = view.clock;
  const moving = view.situation.kind === 'decision' || view.situation.kind === 'simultaneous';
  return (
    <div>
      <p className="text-sm text-ink-800" data-testid="clock-status">{clockWords(c, now)}</p>
      <p className="mt-1 text-xs text-ink-600">
        {c.turnSeconds === null ? 'No turn length is set.' : `Turns last ${Math.round(c.turnSeconds / 60)} min. `}
        At the deadline: {c.rule === 'hold' ? 'a late team holds its position' : 'you decide the late team’s move'}.
      </p>
      {moving && c.status !== 'none' && (
        <div className="mt-3 flex flex-wrap gap-2">
          {c.status === 'held' && (
            <button type="button" className="btn-accent py-1.5" disabled={clock.busy || view.exercise.state !== 'live'} onClick={() => void clock.run({ kind: 'clock', action: 'start' })}>
              Start the clock
            </button>
          )}
          {c.status === 'running' && (
            <button type="button" className="btn-quiet py-1.5" disabled={clock.busy} onClick={() => void clock.run({ kind: 'clock', action: 'hold' })}>
              Hold the clock
            </button>
          )}
          <button type="button" className="btn-quiet py-1.5" disabled={clock.busy} onClick={() => void clock.run({ kind: 'clock', action: 'extend', seconds: 60 })}>
            +1 min
          </button>
          <button type="button" className="btn-quiet py-1.5" disabled={clock.busy} onClick={() => void clock.run({ kind: 'clock', action: 'extend', seconds: 300 })}>
            +5 min
          </button>
        </div>
      )}
      {clock.error && <p className="mt-2 text-sm text-brick-700" role="alert">{clock.error}</p>}
    </div>
  );
}

function TurnControls({ view, send }: { view: Snapshot; send: Send }) {
  const s = view.situation;
  const state = view.exercise.state;
  if (state === 'draft' || state === 'briefing') return <Empty testId="turn-controls">Play has not started. Use Start play when the teams are ready.</Empty>;
  if (s.kind === 'terminal' || state === 'ended') return <p className="text-sm text-ink-700">The game is over. Hold the hot wash while memories are fresh; the report draft is built from this record.</p>;
  if (s.kind === 'chance') return <ChanceControls view={view} send={send} />;
  const teams = view.exercise.teams;
  const allSealed = s.movers.every((m) => s.sealed.some((x) => x.teamId === m.teamId && x.status === 'sealed'));
  return (
    <div className="space-y-3">
      {s.movers.map((mover) => {
        const move = s.sealed.find((x) => x.teamId === mover.teamId);
        return (
          <div key={mover.teamId} className="rounded-md border border-ink-200 p-3" data-testid="mover" data-team={mover.teamId}>
            <div className="flex flex-wrap items-center justify-between gap-2">
              <TeamName teams={teams} teamId={mover.teamId} />
              <span className="text-xs text-ink-600">{STATUS_WORDS[mover.status]}</span>
            </div>
            {move?.status === 'sealed' && (
              <div className="mt-2 text-sm">
                <p>
                  {s.kind === 'simultaneous' ? 'Sealed: ' : 'Chose: '}
                  <strong data-testid="sealed-label">{move.label}</strong>
                  {move.submittedByName && <span className="text-ink-600"> (by {move.submittedByName})</span>}
                  {move.kind === 'adjudicated' && <span className="tag ml-2 bg-bronze-100 text-bronze-800">decided</span>}
                </p>
                {move.proposal && <p className="text-xs text-ink-600">Proposed: “{move.proposal}”</p>}
                {move.rationale && <p className="text-xs text-ink-600">Rationale: {move.rationale}</p>}
                {move.confidence !== null && <p className="text-xs text-ink-600">Confidence {move.confidence}%</p>}
                {move.reason && <p className="text-xs text-ink-600">Reason: {move.reason}</p>}
              </div>
            )}
            {move?.status === 'proposed' && (
              <div className="mt-2">
                <p className="text-sm">
                  Proposal off the ladder: <em data-testid="proposal">“{move.proposal}”</em>
                </p>
                {move.rationale && <p className="text-xs text-ink-600">Rationale: {move.rationale}</p>}
              </div>
            )}
            {move?.status !== 'sealed' && <Adjudicate view={view} send={send} teamId={mover.teamId} proposal={move?.status === 'proposed'} />}
          </div>
        );
      })}
      {s.kind === 'simultaneous' && <RevealButton view={view} send={send} ready={allSealed} />}
    </div>
  );
}

function RevealButton({ view, send, ready }: { view: Snapshot; send: Send; ready: boolean }) {
  const reveal = useIntent(send);
  return (
    <div className="flex flex-wrap items-center gap-3">
      <button type="button" className="btn-accent" disabled={!ready || reveal.busy} onClick={() => void reveal.run({ kind: 'reveal', turn: view.situation.turn })} data-testid="reveal">
        Reveal every team’s move
      </button>
      {!ready && <span className="text-sm text-ink-600">The reveal opens when every team’s move is decided.</span>}
      {reveal.error && <span className="text-sm text-brick-700" role="alert">{reveal.error}</span>}
    </div>
  );
}

function Adjudicate({ view, send, teamId, proposal }: { view: Snapshot; send: Send; teamId: string; proposal: boolean }) {
  const s = view.situation;
  const [open, setOpen] = useState(proposal);
  const [choice, setChoice] = useState('');
  const [reason, setReason] = useState('');
  const adjudicate = useIntent(send);
  const options = s.options[teamId] ?? [];
  const expired = view.clock.status === 'expired';
  if (!open) {
    return (
      <button type="button" className={`mt-2 py-1 text-sm ${expired ? 'btn-accent' : 'btn-quiet'}`} onClick={() => setOpen(true)}>
        {expired ? `Time is up: decide ${teamName(view.exercise.teams, teamId)}’s move` : `Decide for ${teamName(view.exercise.teams, teamId)}`}
      </button>
    );
  }
  const submit = async (event: { preventDefault(): void }) => {
    event.preventDefault();
    const decision = choice.startsWith('end:') ? { outcome: choice.slice(4) } : { action: choice };
    const done = await adjudicate.run({ kind: 'adjudicate', turn: s.turn, teamId, decision, reason: reason.trim() });
    if (done) setReason('');
  };
  return (
    <form className="mt-2 grid gap-2" onSubmit={(e) => void submit(e)} data-testid="adjudicate-form">
      <label className="text-sm">
        <span className="field-label">{proposal ? 'Map the proposal onto' : 'Decide the move'}</span>
        <select className="field-input" value={choice} onChange={(e) => setChoice(e.target.value)} required aria-label="Decision">
          <option value="">Choose…</option>
          <optgroup label="An action of the ladder">
            {options.map((o) => (
              <option key={o.label} value={o.label}>
                {o.label}
              </option>
            ))}
          </optgroup>
          {s.endings && s.endings.length > 0 && (
            <optgroup label="Or end the game at an outcome">
              {s.endings.map((e) => (
                <option key={e.nodeId} value={`end:${e.nodeId}`}>
                  End: {e.text}
                </option>
              ))}
            </optgroup>
          )}
        </select>
      </label>
      <label className="text-sm">
        <span className="field-label">Reason (goes into the record)</span>
        <textarea className="field-input" rows={2} value={reason} required minLength={3} maxLength={2000} onChange={(e) => setReason(e.target.value)} aria-label="Reason" />
      </label>
      <div className="flex gap-2">
        <SubmitButton className="btn-primary py-1.5" disabled={adjudicate.busy || !choice || reason.trim().length < 3}>
          Record the decision
        </SubmitButton>
        {!proposal && (
          <button type="button" className="btn-quiet py-1.5" onClick={() => setOpen(false)}>
            Cancel
          </button>
        )}
      </div>
      {adjudicate.error && <FormMessage tone="error">{adjudicate.error}</FormMessage>}
    </form>
  );
}

function ChanceControls({ view, send }: { view: Snapshot; send: Send }) {
  const s = view.situation;
  const chance = useIntent(send);
  const [outcome, setOutcome] = useState('');
  const [reason, setReason] = useState('');
  return (
    <div className="space-y-3" data-testid="chance-controls">
      <div className="flex flex-wrap items-center gap-3">
        <button type="button" className="btn-accent" disabled={chance.busy || view.exercise.state !== 'live'} onClick={() => void chance.run({ kind: 'chance', turn: s.turn })} data-testid="draw">
          Draw with the server’s seed
        </button>
        <span className="text-xs text-ink-600">The seed and the number drawn go into the record.</span>
      </div>
      <form
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          void chance.run({ kind: 'chance', turn: s.turn, outcome, reason: reason.trim() });
        }}
      >
        <label className="text-sm">
          <span className="field-label">Or choose the outcome</span>
          <select className="field-input" value={outcome} onChange={(e) => setOutcome(e.target.value)} required aria-label="Chance outcome">
            <option value="">Choose…</option>
            {(s.chance ?? []).map((c) => (
              <option key={c.label} value={c.label}>
                {c.label} ({c.p})
              </option>
            ))}
          </select>
        </label>
        <label className="min-w-48 flex-1 text-sm">
          <span className="field-label">Reason</span>
          <input className="field-input" value={reason} onChange={(e) => setReason(e.target.value)} required minLength={3} aria-label="Reason for the chosen outcome" />
        </label>
        <SubmitButton className="btn-quiet" disabled={chance.busy || !outcome || reason.trim().length < 3}>
          Use this outcome
        </SubmitButton>
      </form>
      {chance.error && <FormMessage tone="error">{chance.error}</FormMessage>}
    </div>
  );
}

function UndoControl({ view, send }: { view: Snapshot; send: Send }) {
  const undo = useIntent(send);
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState('');
  const last = view.moves.at(-1);
  if (!last) return null;
  return (
    <div className="mt-3 border-t border-ink-100 pt-3">
      {open ? (
        <form
          className="flex flex-wrap items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            void undo.run({ kind: 'undo', turn: view.situation.turn, reason: reason.trim() }).then((ok) => ok && (setOpen(false), setReason('')));
          }}
        >
          <label className="min-w-64 flex-1 text-sm">
            <span className="field-label">Why undo turn {last.turn}?</span>
            <input className="field-input" value={reason} onChange={(e) => setReason(e.target.value)} required minLength={3} autoFocus aria-label="Reason for the undo" />
          </label>
          <SubmitButton className="btn-danger" disabled={undo.busy || reason.trim().length < 3}>
            Undo turn {last.turn}
          </SubmitButton>
          <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>
            Cancel
          </button>
        </form>
      ) : (
        <button type="button" className="btn-quiet py-1 text-sm" onClick={() => setOpen(true)}>
          Undo the last turn…
        </button>
      )}
      {undo.error && <p className="mt-2 text-sm text-brick-700" role="alert">{undo.error}</p>}
    </div>
  );
}

function InjectComposer({ view, send }: { view: Snapshot; send: Send }) {
  const inject = useIntent(send);
  const [title, setTitle] = useState('');
  const [body, setBody] = useState('');
  const [to, setTo] = useState<string[]>([]);
  const [attached, setAttached] = useState<string[]>([]);
  const teams = view.exercise.teams;
  const documents = view.briefs.flatMap((b) => b.attachments.map((a) => ({ ...a, brief: b.teamId === null ? 'every team' : b.teamName })));
  const authored = (view.authored ?? []).filter((a) => !a.released);
  const sendable = view.exercise.state !== 'draft' && view.exercise.state !== 'ended';
  return (
    <div className="space-y-3">
      {authored.length > 0 && (
        <div>
          <p className="mb-1 text-xs font-semibold tracking-wide text-ink-500 uppercase">Written in the scenario</p>
          <ul className="space-y-2" data-testid="authored-injects">
            {authored
              .sort((a, b) => Number(b.due) - Number(a.due))
              .map((a) => (
                <li key={a.id} className={`rounded-md border p-2 text-sm ${a.due ? 'border-bronze-500 bg-bronze-100/50' : 'border-ink-200'}`}>
                  <div className="flex items-start justify-between gap-2">
                    <div>
                      <p className="font-medium">{a.title}</p>
                      <p className="text-xs text-ink-600">
                        {a.due ? 'Due at this node · ' : ''}to {a.to === 'all' ? 'all teams' : a.to.map((t) => teamName(teams, t)).join(', ')}
                      </p>
                    </div>
                    <button
                      type="button"
                      className="btn-quiet shrink-0 py-1 text-xs"
                      disabled={!sendable || inject.busy}
                      onClick={() => void inject.run({ kind: 'inject', title: a.title, body: a.body, to: a.to, attachmentIds: a.attachmentIds, authoredId: a.id })}
                    >
                      Send
                    </button>
                  </div>
                </li>
              ))}
          </ul>
        </div>
      )}
      <form
        className="space-y-2"
        onSubmit={(e) => {
          e.preventDefault();
          void inject
            .run({ kind: 'inject', title: title.trim(), body: body.trim(), to: to.length === 0 ? 'all' : to, attachmentIds: attached, authoredId: null }, 'Inject sent')
            .then((ok) => ok && (setTitle(''), setBody(''), setTo([]), setAttached([])));
        }}
        data-testid="inject-form"
      >
        <p className="text-xs font-semibold tracking-wide text-ink-500 uppercase">Write one now</p>
        <input className="field-input" placeholder="Title" aria-label="Inject title" value={title} maxLength={200} onChange={(e) => setTitle(e.target.value)} required />
        <textarea className="field-input" rows={3} placeholder="What happens (marked EXERCISE on every screen)" aria-label="Inject text" value={body} maxLength={8000} onChange={(e) => setBody(e.target.value)} required />
        <fieldset className="flex flex-wrap gap-3 text-sm">
          <legend className="sr-only">Send to</legend>
          <span className="text-ink-600">To:</span>
          {teams.map((t) => (
            <label key={t.id} className="flex items-center gap-1">
              <input type="checkbox" checked={to.includes(t.id)} onChange={(e) => setTo(e.target.checked ? [...to, t.id] : to.filter((x) => x !== t.id))} />
              {t.name}
            </label>
          ))}
          <span className="text-xs text-ink-500">{to.length === 0 ? '(none ticked: all teams)' : ''}</span>
        </fieldset>
        {documents.length > 0 && (
          <fieldset className="text-sm">
            <legend className="text-ink-600">Attach briefing documents</legend>
            {documents.map((d) => (
              <label key={d.id} className="flex items-center gap-1">
                <input type="checkbox" checked={attached.includes(d.id)} onChange={(e) => setAttached(e.target.checked ? [...attached, d.id] : attached.filter((x) => x !== d.id))} />
                {d.filename} <span className="text-xs text-ink-500">({d.brief})</span>
              </label>
            ))}
          </fieldset>
        )}
        <SubmitButton className="btn-primary py-1.5" disabled={!sendable || inject.busy || !title.trim() || !body.trim()}>
          Send the inject
        </SubmitButton>
        {!sendable && <p className="text-xs text-ink-600">Injects can be sent from the briefing until play ends.</p>}
        {inject.error && <FormMessage tone="error">{inject.error}</FormMessage>}
        {inject.done && <FormMessage tone="ok">{inject.done}</FormMessage>}
      </form>
    </div>
  );
}
