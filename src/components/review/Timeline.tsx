/** Moves, injects and observer notes in time order, grouped by turn. */
import type { Review, TimelineEntry } from '../../lib/review/types';
import { clock, fixed } from './format';

function Entry({ entry }: { entry: TimelineEntry }) {
  if (entry.kind === 'move') {
    const m = entry.move;
    return (
      <li className="relative pl-6" data-kind="move">
        <span aria-hidden="true" className={`absolute top-1.5 left-0 h-3 w-3 rounded-full border-2 ${m.deviated ? 'border-brick-600 bg-white' : 'border-bronze-600 bg-bronze-500'}`} />
        <div className="text-sm">
          <span className="font-semibold">{m.mover}</span> {m.kind === 'chance' ? 'drew' : 'chose'} <span className="font-medium">“{m.label}”</span>
          {m.deviated && (
            <span className="text-brick-700">
              {' '}
              (equilibrium: “{m.equilibriumAction}”, regret {fixed(m.regret)})
            </span>
          )}
          <span className="ml-2 text-xs text-ink-500">{clock(m.at)}</span>
        </div>
        {m.rationale && <p className="mt-0.5 text-sm text-ink-700">“{m.rationale}”{m.confidence !== null && <span className="text-ink-500"> · confidence {m.confidence}%</span>}</p>}
        {m.kind === 'adjudicated' && <p className="mt-0.5 text-sm text-haze-700">Adjudicated{m.proposal ? ` from “${m.proposal}”` : ''}{m.reason ? `: ${m.reason}` : ''}</p>}
      </li>
    );
  }
  if (entry.kind === 'inject') {
    return (
      <li className="relative pl-6" data-kind="inject">
        <span aria-hidden="true" className="absolute top-1.5 left-0 h-3 w-3 rotate-45 bg-haze-700" />
        <div className="text-sm">
          <span className="font-semibold">Inject</span> {entry.inject.title}
          <span className="ml-2 text-xs text-ink-500">{clock(entry.at)}</span>
        </div>
      </li>
    );
  }
  if (entry.kind === 'ending') {
    const e = entry.ending;
    return (
      <li className="relative pl-6" data-kind="ending">
        <span aria-hidden="true" className="absolute top-1.5 left-0 h-3 w-3 bg-ink-900" />
        <div className="text-sm">
          <span className="font-semibold">Facilitator ended play</span> at <span className="font-medium">“{e.outcome}”</span>
          {e.mover && <span> on {e.mover}’s proposal{e.proposal ? ` “${e.proposal}”` : ''}</span>}
          <span className="ml-2 text-xs text-ink-500">{clock(entry.at)}</span>
        </div>
        {e.reason && <p className="mt-0.5 text-sm text-haze-700">{e.reason}</p>}
        <p className="mt-0.5 text-sm text-ink-600">Equilibrium play from there would have ended at “{e.equilibriumFromThere.outcome ?? e.equilibriumFromThere.nodeId}”.</p>
      </li>
    );
  }
  return (
    <li className="relative pl-6" data-kind="note">
      <span aria-hidden="true" className="absolute top-1.5 left-0 h-3 w-3 rounded-sm bg-moss-600" />
      <div className="rounded-md bg-moss-100/60 px-3 py-1.5 text-sm">
        <span className="font-semibold">{entry.note.authorName}</span>
        {entry.note.tags.map((tag) => (
          <span key={tag} className="tag ml-1 bg-white text-moss-700">
            {tag}
          </span>
        ))}
        <span className="ml-2 text-xs text-ink-500">{clock(entry.at)}</span>
        <p className="text-ink-800">{entry.note.text}</p>
      </div>
    </li>
  );
}

export function Timeline({ review }: { review: Review }) {
  const turns = new Map<string, TimelineEntry[]>();
  for (const entry of review.timeline) {
    const key = entry.turn === null ? 'Between turns' : `Turn ${entry.turn}`;
    turns.set(key, [...(turns.get(key) ?? []), entry]);
  }
  return (
    <ol className="space-y-4" data-testid="timeline">
      {[...turns].map(([turn, entries]) => (
        <li key={turn} className="grid gap-2 sm:grid-cols-[7rem_1fr]">
          <h3 className="text-sm font-semibold text-ink-600">{turn}</h3>
          <ol className="space-y-2 border-l border-ink-200 pl-3">
            {entries.map((entry, i) => (
              <Entry key={i} entry={entry} />
            ))}
          </ol>
        </li>
      ))}
    </ol>
  );
}
