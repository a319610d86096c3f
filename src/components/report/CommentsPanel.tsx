/** Comments on the draft: anyone who may comment writes one, quoting the passage selected; editors resolve them. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { api, describeError } from '../../lib/client/api';
import type { ReportPermissions } from '../../lib/report/permissions';
import { dateTime } from '../review/format';
import { Field, FormMessage } from '../ui/Field';
import { SubmitButton } from '../ui/SubmitButton';

type Comment = { id: string; authorName: string; quote: string | null; body: string; createdAt: string; resolvedAt: string | null };

const schema = z.object({ body: z.string().trim().min(1, 'Write the comment').max(4000, 'At most 4000 characters') });

/** The passage last selected in the draft, kept while the reader types the comment. */
function useDraftSelection(): [string | null, () => void] {
  const [quote, setQuote] = useState<string | null>(null);
  useEffect(() => {
    const onChange = () => {
      const selection = window.getSelection();
      const inDraft = selection?.anchorNode?.parentElement?.closest('.report-doc');
      const text = selection?.toString().trim();
      if (inDraft && text) setQuote(text.slice(0, 1000));
    };
    document.addEventListener('selectionchange', onChange);
    return () => document.removeEventListener('selectionchange', onChange);
  }, []);
  return [quote, () => setQuote(null)];
}

export function CommentsPanel({ exerciseId, may }: { exerciseId: string; may: ReportPermissions }) {
  const queries = useQueryClient();
  const key = ['report-comments', exerciseId];
  const list = useQuery({ queryKey: key, queryFn: () => api<{ comments: Comment[] }>(`/api/exercises/${exerciseId}/report/comments`), refetchInterval: 15_000 });
  const [quote, clearQuote] = useDraftSelection();
  const { register, handleSubmit, reset, formState } = useForm<z.infer<typeof schema>>({ resolver: zodResolver(schema), defaultValues: { body: '' } });
  const add = useMutation({
    mutationFn: (body: string) => api(`/api/exercises/${exerciseId}/report/comments`, { method: 'POST', json: { body, ...(quote ? { quote } : {}) } }),
    onSuccess: () => {
      reset({ body: '' });
      clearQuote();
      void queries.invalidateQueries({ queryKey: key });
    },
  });
  const resolve = useMutation({
    mutationFn: (id: string) => api(`/api/exercises/${exerciseId}/report/comments/${id}/resolve`, { method: 'POST', json: {} }),
    onSuccess: () => queries.invalidateQueries({ queryKey: key }),
  });
  const open = (list.data?.comments ?? []).filter((c) => !c.resolvedAt);
  return (
    <section className="panel p-4" aria-labelledby="comments-heading">
      <h2 id="comments-heading" className="mb-2 text-base">Comments</h2>
      {list.isError && <FormMessage tone="error">{describeError(list.error)}</FormMessage>}
      {list.isSuccess && open.length === 0 && <p className="text-sm text-ink-600">No open comments.</p>}
      <ul className="space-y-2" data-testid="comments">
        {open.map((c) => (
          <li key={c.id} className="rounded-md bg-paper-deep px-3 py-2 text-sm">
            {c.quote && <blockquote className="mb-1 border-l-2 border-ink-300 pl-2 text-xs text-ink-600">{c.quote}</blockquote>}
            <p>{c.body}</p>
            <div className="mt-1 flex items-center justify-between text-xs text-ink-500">
              <span>
                {c.authorName} · {dateTime(c.createdAt)}
              </span>
              {may.edit && (
                <button type="button" className="text-haze-700 hover:underline" onClick={() => resolve.mutate(c.id)}>
                  Resolve
                </button>
              )}
            </div>
          </li>
        ))}
      </ul>
      {may.comment && (
        <form onSubmit={handleSubmit((v) => add.mutate(v.body))} className="mt-3 space-y-2" noValidate aria-label="Add a comment">
          {add.isError && <FormMessage tone="error">{describeError(add.error)}</FormMessage>}
          {quote && (
            <div className="flex items-start gap-2 text-xs text-ink-600">
              <blockquote className="flex-1 border-l-2 border-bronze-500 pl-2">{quote}</blockquote>
              <button type="button" className="text-haze-700 hover:underline" onClick={clearQuote}>
                Don’t quote
              </button>
            </div>
          )}
          <Field id="comment-body" label="Your comment" hint="Select a passage in the draft first to quote it." error={formState.errors.body?.message}>
            <textarea id="comment-body" rows={3} className="field-input" {...register('body')} />
          </Field>
          <SubmitButton className="btn-quiet" disabled={add.isPending}>
            Add comment
          </SubmitButton>
        </form>
      )}
    </section>
  );
}
