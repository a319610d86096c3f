/** Observer log: annotate any turn or move with the exercise's tags and a line of text, time-stamped; see play as it happens. */
import { useEffect, useRef, useState } from 'react';
import { FormMessage } from '../ui/Field';
import { useIntent, useLive, useServerNow, type Initial, type Send } from '../desk/live';
import { AfterPlayLinks, Analysis, Empty, Injects, Kbd, MissedNotice, MoveList, Panel, Situation, StatusStrip, TeamName } from '../desk/parts';
import type { MoveView, Snapshot } from '../../lib/exercise/view';
import { SubmitButton } from '../ui/SubmitButton';

type Props = { exerciseId: string; initial: Initial };
type About = { turn: number | null; moveId: string | null };

export default function ObserverLog({ exerciseId, initial }: Props) {
  const { live, view, send } = useLive(exerciseId, initial);
  const now = useServerNow(live.clockOffset);
  const [about, setAbout] = useState<About>({ turn: view.situation.turn, moveId: null });
  const composer = useRef<HTMLTextAreaElement>(null);

  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      const target = event.target as HTMLElement;
      if (event.key === 'n' && !['INPUT', 'TEXTAREA', 'SELECT'].includes(target.tagName) && !event.ctrlKey && !event.metaKey) {
        event.preventDefault();
        composer.current?.focus();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  const annotate = (move: MoveView) => {
    setAbout({ turn: move.turn, moveId: move.id });
    composer.current?.focus();
  };

  return (
    <div data-surface="observe">
      <StatusStrip view={view} live={live} now={now}>
        <AfterPlayLinks view={view} />
      </StatusStrip>
      <MissedNotice live={live} />
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
        <div className="space-y-4">
          <Panel title="New note" id="compose" actions={<span className="text-xs text-ink-500"><Kbd>n</Kbd> to write · <Kbd>Ctrl</Kbd>+<Kbd>Enter</Kbd> to save</span>}>
            <Composer view={view} send={send} about={about} setAbout={setAbout} textarea={composer} />
          </Panel>
          <Panel title="Notes" id="notes">
            <Notes view={view} />
          </Panel>
        </div>
        <div className="space-y-4">
          <Panel title="Play so far" id="situation">
            <Situation view={view} />
            <h3 className="mt-4 mb-1 text-sm font-semibold text-ink-800">Moves</h3>
            <MoveList
              view={view}
              actions={(move) => (
                <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => annotate(move)} aria-label={`Annotate turn ${move.turn}: ${move.label}`}>
                  Annotate
                </button>
              )}
            />
          </Panel>
          {view.analysis && (
            <Panel title="Analysis at this node" id="analysis">
              <Analysis analysis={view.analysis} teams={view.exercise.teams} />
            </Panel>
          )}
          <Panel title="Injects" id="injects">
            <Injects view={view} />
          </Panel>
        </div>
      </div>
    </div>
  );
}

function Composer({ view, send, about, setAbout, textarea }: { view: Snapshot; send: Send; about: About; setAbout: (a: About) => void; textarea: React.RefObject<HTMLTextAreaElement | null> }) {
  const save = useIntent(send);
  const [tags, setTags] = useState<string[]>([]);
  const [text, setText] = useState('');
  const allTags = view.exercise.settings.tags ?? [];
  const move = view.moves.find((m) => m.id === about.moveId);
  if (!view.me.may.note) return <Empty>Your seat does not write notes.</Empty>;
  const submit = async () => {
    if (!text.trim()) return;
    const done = await save.run({ kind: 'note', turn: about.turn, moveId: about.moveId, tags, text: text.trim() }, 'Note saved');
    if (done) {
      setText('');
      setTags([]);
    }
  };
  const turns = Array.from({ length: view.situation.turn }, (_, i) => i + 1);
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
      onKeyDown={(e) => {
        if ((e.ctrlKey || e.metaKey) && e.key === 'Enter') {
          e.preventDefault();
          void submit();
        }
      }}
      className="space-y-3"
      data-testid="note-form"
    >
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <label htmlFor="note-about" className="text-ink-700">
          About
        </label>
        <select
          id="note-about"
          className="field-input w-auto py-1.5"
          value={about.moveId ? `move:${about.moveId}` : about.turn === null ? 'general' : `turn:${about.turn}`}
          onChange={(e) => {
            const [kind, value] = e.target.value.split(':');
            if (kind === 'general') setAbout({ turn: null, moveId: null });
            else if (kind === 'turn') setAbout({ turn: Number(value), moveId: null });
            else setAbout({ turn: view.moves.find((m) => m.id === value)?.turn ?? null, moveId: value! });
          }}
        >
          <option value="general">The exercise in general</option>
          {turns.map((t) => (
            <option key={t} value={`turn:${t}`}>
              Turn {t}
              {t === view.situation.turn ? ' (now)' : ''}
            </option>
          ))}
          {view.moves.map((m) => (
            <option key={m.id} value={`move:${m.id}`}>
              Move: turn {m.turn}, {m.label}
            </option>
          ))}
        </select>
        {move && (
          <span className="text-xs text-ink-600">
            <TeamName teams={view.exercise.teams} teamId={move.teamId} /> → {move.label}
          </span>
        )}
      </div>
      <fieldset>
        <legend className="field-label">Tags</legend>
        <div className="flex flex-wrap gap-1.5">
          {allTags.map((tag) => {
            const on = tags.includes(tag);
            return (
              <button
                key={tag}
                type="button"
                aria-pressed={on}
                className={`rounded-full border px-2.5 py-0.5 text-xs ${on ? 'border-haze-700 bg-haze-700 text-white' : 'border-ink-300 bg-white text-ink-700 hover:border-ink-500'}`}
                onClick={() => setTags(on ? tags.filter((t) => t !== tag) : [...tags, tag])}
              >
                {tag}
              </button>
            );
          })}
          {allTags.length === 0 && <span className="text-xs text-ink-500">The facilitator has set no tags.</span>}
        </div>
      </fieldset>
      <textarea ref={textarea} aria-label="Note" className="field-input" rows={4} maxLength={4000} value={text} onChange={(e) => setText(e.target.value)} placeholder="What did you see? Signals, misreadings, turning points…" />
      <div className="flex items-center gap-3">
        <SubmitButton className="btn-primary" disabled={save.busy || !text.trim()} data-testid="save-note">
          Save the note
        </SubmitButton>
        <span className="text-xs text-ink-500">Facilitators and observers see notes; players never do.</span>
      </div>
      {save.error && <FormMessage tone="error">{save.error}</FormMessage>}
      {save.done && <FormMessage tone="ok">{save.done}</FormMessage>}
    </form>
  );
}

function Notes({ view }: { view: Snapshot }) {
  const [filter, setFilter] = useState<string | null>(null);
  const notes = view.notes ?? [];
  const shown = [...notes].reverse().filter((n) => filter === null || n.tags.includes(filter));
  const used = [...new Set(notes.flatMap((n) => n.tags))];
  if (notes.length === 0) return <Empty testId="notes">No notes yet. Write the first one above; each is time-stamped and kept for the review.</Empty>;
  return (
    <div>
      {used.length > 0 && (
        <div className="mb-3 flex flex-wrap items-center gap-1.5 text-xs" role="group" aria-label="Show notes with the tag">
          <button type="button" aria-pressed={filter === null} className={`rounded-full border px-2 py-0.5 ${filter === null ? 'border-ink-900 bg-ink-900 text-paper' : 'border-ink-300'}`} onClick={() => setFilter(null)}>
            all ({notes.length})
          </button>
          {used.map((tag) => (
            <button key={tag} type="button" aria-pressed={filter === tag} className={`rounded-full border px-2 py-0.5 ${filter === tag ? 'border-ink-900 bg-ink-900 text-paper' : 'border-ink-300'}`} onClick={() => setFilter(tag)}>
              {tag}
            </button>
          ))}
        </div>
      )}
      <ol className="space-y-3" data-testid="note-list">
        {shown.map((n) => {
          const move = view.moves.find((m) => m.id === n.moveId);
          return (
            <li key={n.id} className="rounded-md border border-ink-200 p-3" data-testid="note">
              <p className="text-xs text-ink-500">
                {new Date(n.at).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' })} · {n.authorName} ·{' '}
                {move ? `turn ${move.turn}, ${move.label}` : n.turn === null ? 'general' : `turn ${n.turn}`}
              </p>
              <p className="mt-1 text-sm whitespace-pre-wrap text-ink-900">{n.text}</p>
              {n.tags.length > 0 && (
                <p className="mt-1 flex flex-wrap gap-1">
                  {n.tags.map((t) => (
                    <span key={t} className="tag bg-haze-100 text-haze-700">
                      {t}
                    </span>
                  ))}
                </p>
              )}
            </li>
          );
        })}
      </ol>
    </div>
  );
}
