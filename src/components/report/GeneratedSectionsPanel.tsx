/**
 * The sections of the draft written from the record of play (summary, timeline,
 * the equilibrium comparison, observer notes): whether each still says what the
 * record says now, and writing the chosen ones again. Sections people write are
 * never touched.
 */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { api, describeError } from '../../lib/client/api';
import type { GeneratedSection, SectionStatus } from '../../lib/report/refresh';
import { FormMessage } from '../ui/Field';

const STATE_WORDS: Record<SectionStatus['state'], { text: string; tone: string }> = {
  current: { text: 'matches the record', tone: 'bg-moss-100 text-moss-700' },
  outdated: { text: 'differs from the record', tone: 'bg-bronze-100 text-bronze-700' },
  missing: { text: 'heading not found', tone: 'bg-ink-100 text-ink-600' },
};

export function GeneratedSectionsPanel({ exerciseId }: { exerciseId: string }) {
  const queries = useQueryClient();
  const key = ['report', exerciseId, 'generated'];
  const status = useQuery({ queryKey: key, queryFn: () => api<{ sections: SectionStatus[] }>(`/api/exercises/${exerciseId}/report/generated`) });
  const [unticked, setUnticked] = useState<Set<GeneratedSection>>(new Set());
  const [confirming, setConfirming] = useState(false);
  const rewrite = useMutation({
    mutationFn: (sections: GeneratedSection[]) =>
      api<{ sections: SectionStatus[]; rewritten: GeneratedSection[] }>(`/api/exercises/${exerciseId}/report/generated`, { method: 'POST', json: { sections } }),
    onSuccess: (answer) => {
      setConfirming(false);
      queries.setQueryData(key, { sections: answer.sections });
    },
  });
  const sections = status.data?.sections ?? [];
  const outdated = sections.filter((s) => s.state === 'outdated');
  const chosen = outdated.filter((s) => !unticked.has(s.key));
  const toggle = (section: GeneratedSection) =>
    setUnticked((now) => {
      const next = new Set(now);
      if (!next.delete(section)) next.add(section);
      return next;
    });
  const titles = (keys: GeneratedSection[]) => keys.map((k) => sections.find((s) => s.key === k)?.title ?? k).join(', ');

  return (
    <section className="panel p-4" aria-labelledby="generated-heading" data-testid="generated-sections">
      <h2 id="generated-heading" className="mb-1 text-base">Written from the record</h2>
      <p className="mb-2 text-xs text-ink-600">These sections were generated from play. When play goes on or notes are added, write them again; the hot wash, findings, recommendations and any section you add are never touched.</p>
      {status.isPending && <p className="text-sm text-ink-600">Comparing with the record…</p>}
      {status.isError && <FormMessage tone="error">{describeError(status.error)}</FormMessage>}
      {status.isSuccess && (
        <>
          <ul className="space-y-1 text-sm">
            {sections.map((s) => (
              <li key={s.key} className="flex items-center justify-between gap-2" data-section={s.key} data-state={s.state}>
                <label className="flex items-center gap-2">
                  {s.state === 'outdated' && <input type="checkbox" checked={!unticked.has(s.key)} onChange={() => toggle(s.key)} />}
                  <span className={s.state === 'outdated' ? '' : 'pl-5'}>{s.title}</span>
                </label>
                <span className={`tag shrink-0 whitespace-nowrap ${STATE_WORDS[s.state].tone}`}>{STATE_WORDS[s.state].text}</span>
              </li>
            ))}
          </ul>
          {sections.some((s) => s.state === 'missing') && (
            <p className="mt-2 text-xs text-ink-600">A section whose heading was renamed or removed is left as it is.</p>
          )}
          {rewrite.isSuccess && (
            <FormMessage tone="ok">{rewrite.data.rewritten.length ? `Written again: ${titles(rewrite.data.rewritten)}.` : 'Nothing needed writing again.'}</FormMessage>
          )}
          {rewrite.isError && <FormMessage tone="error">{describeError(rewrite.error)}</FormMessage>}
          {outdated.length === 0 ? (
            <p className="mt-2 text-sm text-ink-600" data-empty="generated">Every generated section says what the record says now.</p>
          ) : confirming ? (
            <div className="mt-3 space-y-2 rounded-md border border-bronze-200 bg-bronze-100 px-3 py-2 text-sm" role="group" aria-label="Confirm writing again">
              <p>Replace the text under {titles(chosen.map((s) => s.key))}, edits made there included? Issue a version first if you want to keep the present wording.</p>
              <div className="flex gap-2">
                <button type="button" className="btn-accent py-1" autoFocus disabled={rewrite.isPending} onClick={() => rewrite.mutate(chosen.map((s) => s.key))}>
                  {rewrite.isPending ? 'Writing…' : 'Replace'}
                </button>
                <button type="button" className="btn-quiet py-1" onClick={() => setConfirming(false)}>
                  Cancel
                </button>
              </div>
            </div>
          ) : (
            <button type="button" className="btn-quiet mt-3" disabled={chosen.length === 0} onClick={() => setConfirming(true)}>
              Write the ticked sections again
            </button>
          )}
        </>
      )}
    </section>
  );
}
