/** Sending an issued version to sponsors by e-mail, and the record of who was sent which version when. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { api, ApiError, describeError } from '../../lib/client/api';
import { dateTime } from '../review/format';
import { Field, FormMessage } from '../ui/Field';
import type { ReportState } from './ReportWorkspace';
import { SubmitButton } from '../ui/SubmitButton';

const schema = z.object({
  version: z.number().int().min(1),
  to: z
    .string()
    .trim()
    .min(1, 'Add at least one address')
    .refine((text) => addresses(text).every((a) => z.email().safeParse(a).success), 'Separate addresses with commas; one of them is not an e-mail address'),
  note: z.string().trim().min(1, 'Write a covering note').max(5000, 'At most 5000 characters'),
});
type Values = z.infer<typeof schema>;

const addresses = (text: string) => text.split(/[,;\s]+/).map((a) => a.trim()).filter(Boolean);

export function SendPanel({ exerciseId, report, onSent }: { exerciseId: string; report: ReportState; onSent: () => void }) {
  const latest = report.versions[0];
  const { register, handleSubmit, setError, formState, reset, getValues } = useForm<Values>({
    resolver: zodResolver(schema),
    values: {
      version: latest?.number ?? 1,
      to: report.sponsors.map((s) => s.email).join(', '),
      note: `Please find attached the after-action report of the exercise ${report.exercise.title}.`,
    },
    resetOptions: { keepDirtyValues: true },
  });
  const send = useMutation({
    mutationFn: (values: Values) =>
      api<{ sent: { version: number; to: string[] } }>(`/api/exercises/${exerciseId}/report/versions/${values.version}/send`, {
        method: 'POST',
        json: { to: addresses(values.to), note: values.note },
      }),
    onSuccess: () => {
      reset({ ...getValues() });
      onSent();
    },
    onError: (error) => {
      if (error instanceof ApiError) for (const f of error.fields) if (f.field.startsWith('to') || f.field === 'note') setError(f.field.startsWith('to') ? 'to' : 'note', { message: f.reason });
    },
  });
  return (
    <section className="panel p-4" aria-labelledby="send-heading">
      <h2 id="send-heading" className="mb-2 text-base">Send to sponsors</h2>
      {!latest ? (
        <p className="text-sm text-ink-600">Issue a version first; only issued versions are sent.</p>
      ) : (
        <form onSubmit={handleSubmit((v) => send.mutate(v))} className="space-y-3" noValidate aria-label="Send the report">
          {send.isSuccess && <FormMessage tone="ok">Version {send.data.sent.version} sent to {send.data.sent.to.join(', ')}.</FormMessage>}
          {send.isError && <FormMessage tone="error">{describeError(send.error)}</FormMessage>}
          <Field id="send-version" label="Version">
            <select id="send-version" className="field-input" {...register('version', { valueAsNumber: true })}>
              {report.versions.map((v) => (
                <option key={v.id} value={v.number}>
                  Version {v.number} · {dateTime(v.issuedAt)}
                </option>
              ))}
            </select>
          </Field>
          <Field id="send-to" label="To" hint="E-mail addresses, separated by commas" error={formState.errors.to?.message}>
            <input id="send-to" className="field-input" {...register('to')} />
          </Field>
          <Field id="send-note" label="Covering note" error={formState.errors.note?.message}>
            <textarea id="send-note" rows={4} className="field-input" {...register('note')} />
          </Field>
          <SubmitButton className="btn-primary w-full" disabled={send.isPending}>
            {send.isPending ? 'Sending…' : 'Send with the PDF attached'}
          </SubmitButton>
        </form>
      )}
      {report.dispatches.length > 0 && (
        <div className="mt-4">
          <h3 className="mb-1 text-sm font-semibold">Sent</h3>
          <ul className="space-y-1.5 text-xs text-ink-700" data-testid="dispatches">
            {[...report.dispatches].reverse().map((d) => (
              <li key={d.id}>
                Version {d.versionNumber} to {d.recipients.join(', ')} · {dateTime(d.sentAt)} by {d.sentByName}
              </li>
            ))}
          </ul>
        </div>
      )}
    </section>
  );
}
