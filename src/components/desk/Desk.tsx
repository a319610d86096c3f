/** Desk: a team's screen. The situation, the team's brief and injects, revealed moves, and the team's move when it is its turn. */
import { useEffect, useRef, useState } from 'react';
import { FormMessage } from '../ui/Field';
import { useIntent, useLive, useServerNow, type Initial, type Send } from './live';
import { Analysis, Briefs, Empty, Injects, Kbd, MissedNotice, MoveList, Panel, Situation, StatusStrip, TeamName, teamName } from './parts';
import type { DraftView, OptionView, Snapshot } from '../../lib/exercise/view';

type Props = { exerciseId: string; initial: Initial };

export default function Desk({ exerciseId, initial }: Props) {
  const { live, view, send } = useLive(exerciseId, initial);
  const now = useServerNow(live.clockOffset);
  const teamId = view.me.teamId;
  const myTeam = view.exercise.teams.find((t) => t.id === teamId);
  const beforePlay = view.exercise.state === 'draft' || view.exercise.state === 'briefing';
  const brief = (
    <Panel title="Brief" id="brief">
      <Briefs view={view} />
    </Panel>
  );
  return (
    <div data-surface="desk">
      <StatusStrip view={view} live={live} now={now}>
        {myTeam && (
          <span className="text-sm text-ink-700">
            You play for <TeamName teams={view.exercise.teams} teamId={teamId} />
            {view.me.isLead && ' (lead)'}
          </span>
        )}
      </StatusStrip>
      <MissedNotice live={live} />
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="space-y-4">
          <TurnPanel view={view} send={send} />
          {beforePlay && brief}
          <Panel title="Where the crisis stands" id="situation">
            <Situation view={view} />
            <h3 className="mt-4 mb-1 text-sm font-semibold text-ink-800">Moves revealed so far</h3>
            <MoveList view={view} />
          </Panel>
          {view.analysis && (
            <Panel title="Analysis at this node" id="analysis">
              <Analysis analysis={view.analysis} teams={view.exercise.teams} />
            </Panel>
          )}
        </div>
        <div className="space-y-4">
          <Panel title="Injects" id="injects">
            <Injects view={view} />
          </Panel>
          {!beforePlay && brief}
          <Panel title="Your team" id="team">
            <TeamList view={view} online={new Set(live.presence.online.map((p) => p.name))} />
          </Panel>
        </div>
      </div>
    </div>
  );
}

function TeamList({ view, online }: { view: Snapshot; online: Set<string> }) {
  const team = view.exercise.teams.find((t) => t.id === view.me.teamId);
  if (!team || team.members.length === 0) return <Empty>You are not on a team.</Empty>;
  return (
    <ul className="space-y-1 text-sm">
      {[...team.members].sort((a, b) => Number(b === team.lead) - Number(a === team.lead)).map((name) => (
        <li key={name} className="flex items-center gap-2">
          <span aria-hidden="true" className={`inline-block h-2 w-2 rounded-full ${online.has(name) ? 'bg-moss-600' : 'bg-ink-300'}`} />
          {name}
          {team.lead === name && <span className="tag bg-ink-100 text-ink-700">lead</span>}
          <span className="sr-only">{online.has(name) ? 'online' : 'offline'}</span>
        </li>
      ))}
    </ul>
  );
}

// ---------------------------------------------------------------------------

function TurnPanel({ view, send }: { view: Snapshot; send: Send }) {
  const s = view.situation;
  const teamId = view.me.teamId;
  const state = view.exercise.state;
  const moving = s.movers.some((m) => m.teamId === teamId);
  const mine = s.sealed.find((m) => m.teamId === teamId);
  if (state === 'draft' || state === 'briefing') {
    return (
      <Panel title="Your move" id="turn">
        <Empty testId="turn">The exercise is {state === 'draft' ? 'being set up' : 'in its briefing'}. Read your brief; moves open when the facilitator starts play.</Empty>
      </Panel>
    );
  }
  if (state === 'ended' || s.kind === 'terminal') {
    return (
      <Panel title="Play has ended" id="turn">
        <p className="text-sm text-ink-700">The exercise is over. The facilitator leads the hot wash; the after-action report follows.</p>
      </Panel>
    );
  }
  if (!moving) {
    const movers = s.movers.map((m) => teamName(view.exercise.teams, m.teamId)).join(' and ');
    return (
      <Panel title="Waiting" id="turn">
        <p className="text-sm text-ink-700" data-testid="waiting">
          {s.kind === 'chance' ? 'Chance decides what happens next; the facilitator resolves it.' : `${movers} ${s.movers.length > 1 ? 'are' : 'is'} deciding. Your team moves later.`}
        </p>
        {s.movers.length > 0 && (
          <ul className="mt-2 text-sm">
            {s.movers.map((m) => (
              <li key={m.teamId}>
                <TeamName teams={view.exercise.teams} teamId={m.teamId} />: {m.status === 'submitted' ? 'has submitted' : 'deciding'}
              </li>
            ))}
          </ul>
        )}
      </Panel>
    );
  }
  if (mine) {
    return (
      <Panel title="Your move" id="turn">
        <OtherMovers view={view} />
        <div className="rounded-md border border-haze-700/30 bg-haze-100 p-3 text-sm text-haze-700" data-testid="submitted">
          {mine.status === 'proposed' ? (
            <p>Your proposal went to the facilitator, who will map it onto the ladder (or end the game at an outcome) with a reason: “{mine.proposal}”</p>
          ) : (
            <p>
              Submitted: <strong>{mine.label}</strong>
              {mine.kind === 'adjudicated' && ' (decided by the facilitator)'}.{' '}
              {s.kind === 'simultaneous' ? 'Sealed until the facilitator reveals every team’s move.' : 'It takes effect now.'}
            </p>
          )}
        </div>
      </Panel>
    );
  }
  return <MoveForm key={s.turn} view={view} send={send} />;
}

/** In a simultaneous turn: whether the other moving teams have submitted (never what). */
function OtherMovers({ view }: { view: Snapshot }) {
  const others = view.situation.movers.filter((m) => m.teamId !== view.me.teamId);
  if (others.length === 0) return null;
  return (
    <ul className="mb-3 flex flex-wrap gap-x-4 gap-y-1 text-sm" data-testid="other-movers">
      {others.map((m) => (
        <li key={m.teamId}>
          <TeamName teams={view.exercise.teams} teamId={m.teamId} />: {m.status === 'submitted' ? 'has submitted (sealed)' : 'still deciding'}
        </li>
      ))}
    </ul>
  );
}

type Form = { label: string | null; proposing: boolean; proposal: string; rationale: string; confidence: number | null };

const fromDraft = (draft: DraftView | undefined): Form => ({
  label: draft?.label ?? null,
  proposing: Boolean(draft?.proposal),
  proposal: draft?.proposal ?? '',
  rationale: draft?.rationale ?? '',
  confidence: draft?.confidence ?? null,
});

const DRAFT_DELAY_MS = 600;
/** After typing, someone else's draft edit waits this long before it replaces the form. */
const TYPING_GRACE_MS = 2000;

function MoveForm({ view, send }: { view: Snapshot; send: Send }) {
  const s = view.situation;
  const teamId = view.me.teamId!;
  const options = s.options[teamId] ?? [];
  const draft = view.drafts.find((d) => d.teamId === teamId);
  const [form, setForm] = useState<Form>(() => fromDraft(draft));
  const [confirming, setConfirming] = useState(false);
  const confirmButton = useRef<HTMLButtonElement>(null);
  const lastTyped = useRef(0);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const submit = useIntent(send);
  const drafting = useIntent(send);

  useEffect(() => {
    if (confirming) confirmButton.current?.focus();
  }, [confirming]);

  // Someone else on the team edited the draft: show it, unless this person is typing.
  useEffect(() => {
    if (!draft || draft.updatedByName === view.me.name) return;
    if (Date.now() - lastTyped.current < TYPING_GRACE_MS) return;
    setForm(fromDraft(draft));
  }, [draft?.updatedAt]);

  const change = (patch: Partial<Form>) => {
    const next = { ...form, ...patch };
    setForm(next);
    setConfirming(false);
    lastTyped.current = Date.now();
    if (!view.me.may.draft) return;
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => {
      void drafting.run({
        kind: 'draft',
        turn: s.turn,
        label: next.proposing ? null : next.label,
        proposal: next.proposing ? next.proposal.slice(0, 2000) : null,
        rationale: next.rationale.slice(0, 4000),
        confidence: next.confidence,
      });
    }, DRAFT_DELAY_MS);
  };

  const ready = form.proposing ? form.proposal.trim().length > 0 : form.label !== null;
  const doSubmit = async () => {
    if (timer.current) clearTimeout(timer.current);
    await submit.run({
      kind: 'submit',
      turn: s.turn,
      choice: form.proposing ? { proposal: form.proposal.trim() } : { action: form.label! },
      rationale: form.rationale.trim(),
      confidence: form.confidence,
    });
    setConfirming(false);
  };

  const onKey = (event: React.KeyboardEvent) => {
    const typing = (event.target as HTMLElement).tagName === 'TEXTAREA' || (event.target as HTMLElement).tagName === 'INPUT' && (event.target as HTMLInputElement).type !== 'radio';
    if ((event.ctrlKey || event.metaKey) && event.key === 'Enter' && ready && view.me.may.submit) {
      event.preventDefault();
      setConfirming(true);
      return;
    }
    if (!typing && /^[1-9]$/.test(event.key)) {
      const option = options[Number(event.key) - 1];
      if (option) change({ label: option.label, proposing: false });
    }
  };

  const lead = view.exercise.teams.find((t) => t.id === teamId)?.lead;
  return (
    <Panel title="Your move" id="turn" actions={<span className="text-xs text-ink-500">{draftStatus(draft, drafting.busy, view.me.name)}</span>}>
      <div onKeyDown={onKey}>
        {s.kind === 'simultaneous' && (
          <p className="mb-3 rounded bg-haze-100 px-3 py-2 text-sm text-haze-700">
            The teams choose at the same time. No team sees another’s choice until the facilitator reveals them all.
          </p>
        )}
        <OtherMovers view={view} />
        <fieldset>
          <legend className="field-label">
            Options open to your team <span className="font-normal text-ink-500">(keys <Kbd>1</Kbd>–<Kbd>{Math.min(9, options.length)}</Kbd>)</span>
          </legend>
          <div className="grid gap-2 sm:grid-cols-2" role="radiogroup">
            {options.map((option, i) => (
              <OptionCard key={option.label} option={option} index={i} checked={!form.proposing && form.label === option.label} onChoose={() => change({ label: option.label, proposing: false })} />
            ))}
          </div>
          <label className="mt-3 flex items-center gap-2 text-sm">
            <input type="checkbox" checked={form.proposing} onChange={(e) => change({ proposing: e.target.checked })} />
            Propose a move that is not on the ladder (the facilitator adjudicates it)
          </label>
          {form.proposing && (
            <textarea
              aria-label="Your proposal"
              className="field-input mt-2"
              rows={3}
              maxLength={2000}
              value={form.proposal}
              placeholder="Describe the move in a sentence or two"
              onChange={(e) => change({ proposal: e.target.value })}
            />
          )}
        </fieldset>
        <div className="mt-4 grid gap-3 sm:grid-cols-[1fr_12rem]">
          <div>
            <label htmlFor="rationale" className="field-label">
              Rationale
            </label>
            <textarea id="rationale" className="field-input" rows={3} maxLength={4000} value={form.rationale} placeholder="Why this move? (kept for the review)" onChange={(e) => change({ rationale: e.target.value })} />
          </div>
          <div>
            <label htmlFor="confidence" className="field-label">
              Confidence {form.confidence === null ? <span className="font-normal text-ink-500">(not given)</span> : `${form.confidence}%`}
            </label>
            <input id="confidence" type="range" min={0} max={100} step={5} className="w-full accent-bronze-600" value={form.confidence ?? 50} onChange={(e) => change({ confidence: Number(e.target.value) })} />
          </div>
        </div>
        <div className="mt-4 flex flex-wrap items-center gap-3">
          {view.me.may.submit ? (
            confirming ? (
              <>
                <button type="button" ref={confirmButton} className="btn-accent" disabled={submit.busy} onClick={() => void doSubmit()} data-testid="confirm-submit">
                  {submit.busy ? 'Submitting…' : `Confirm: ${form.proposing ? 'send the proposal' : `“${form.label}”`}`}
                </button>
                <button type="button" className="btn-quiet" onClick={() => setConfirming(false)}>
                  Keep editing
                </button>
              </>
            ) : (
              <button type="button" className="btn-primary" disabled={!ready} onClick={() => setConfirming(true)} data-testid="submit-move">
                Submit for your team <Kbd>Ctrl</Kbd>+<Kbd>Enter</Kbd>
              </button>
            )
          ) : (
            <p className="text-sm text-ink-600" data-testid="submit-refusal">
              {view.me.submitRefusal}
              {lead && view.exercise.settings.submitter === 'lead' ? ` (${lead} submits for your team; the draft you edit here is shared with them).` : '.'}
            </p>
          )}
        </div>
        {submit.error && (
          <div className="mt-3">
            <FormMessage tone="error">{submit.error}</FormMessage>
          </div>
        )}
        {drafting.error && <p className="mt-2 text-xs text-brick-700">The draft was not saved: {drafting.error}</p>}
      </div>
    </Panel>
  );
}

function draftStatus(draft: DraftView | undefined, saving: boolean, me: string): string {
  if (saving) return 'Saving the team draft…';
  if (!draft) return 'The draft is shared with your team';
  const who = draft.updatedByName === me ? 'you' : draft.updatedByName;
  return `Team draft, last edited by ${who} at ${new Date(draft.updatedAt).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit', second: '2-digit' })}`;
}

/** Where an option takes the crisis, in words that fit the kind of move. */
function whereItLeads(option: OptionView): string {
  const rung = `${option.rungName}${option.intensity !== null ? ` (intensity ${option.intensity})` : ''}`;
  switch (option.move) {
    case 'climb':
      return `Up to ${rung}`;
    case 'step-down':
      return `Down to ${rung}`;
    case 'hold':
      return `The crisis stays at ${rung}`;
    case 'settle':
      return `Ends the crisis by a settlement at ${rung}`;
    default:
      return `The crisis stands at ${rung} afterwards`;
  }
}

function OptionCard({ option, index, checked, onChoose }: { option: OptionView; index: number; checked: boolean; onChoose: () => void }) {
  return (
    <label
      className={`flex cursor-pointer gap-3 rounded-md border p-3 text-sm transition-colors ${checked ? 'border-bronze-500 bg-bronze-100/60' : 'border-ink-200 bg-white hover:border-ink-400'}`}
      data-testid="option"
    >
      <input type="radio" name="option" className="mt-1 accent-bronze-600" checked={checked} onChange={onChoose} />
      <span className="min-w-0">
        <span className="flex flex-wrap items-center gap-2">
          <span className="font-mono text-xs text-ink-500">{index + 1}</span>
          <span className="font-semibold text-ink-950">{option.label}</span>
          {option.move && <span className="tag bg-ink-100 text-ink-700">{option.move}</span>}
        </span>
        {option.rungName && <span className="mt-0.5 block text-xs text-ink-600">{whereItLeads(option)}</span>}
        {option.description && (option.move === 'climb' || option.move === 'step-down') && <span className="mt-1 block text-xs text-ink-700">{option.description}</span>}
      </span>
    </label>
  );
}
