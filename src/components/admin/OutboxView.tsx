import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { api, describeError } from '../../lib/client/api';
import { FormMessage } from '../ui/Field';
import { withQueryClient } from '../ui/QueryRoot';

type Attachment = { filename: string; contentType: string; size: number };
type Summary = { id: string; from: string; to: string[]; subject: string; attachments: Attachment[]; receivedAt: string };
type Message = Summary & { text: string | null; html: string | null; messageId: string | null };

const when = (iso: string) => new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });
const kib = (bytes: number) => `${Math.max(1, Math.round(bytes / 1024))} KiB`;

function OutboxView() {
  const [selected, setSelected] = useState<string | null>(null);
  const list = useQuery({
    queryKey: ['outbox'],
    queryFn: () => api<{ messages: Summary[] }>('/api/outbox'),
    refetchInterval: 5000,
  });
  const message = useQuery({
    queryKey: ['outbox', selected],
    queryFn: () => api<{ message: Message }>(`/api/outbox/${selected}`),
    enabled: selected !== null,
  });
  const messages = list.data?.messages ?? [];

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.4fr)]">
      <section className="panel p-2" aria-label="Captured messages">
        {list.isError && <FormMessage tone="error">{describeError(list.error)}</FormMessage>}
        {list.isSuccess && messages.length === 0 && (
          <p className="p-4 text-sm text-ink-600">No mail yet. Invitations, password resets and reports sent to sponsors appear here.</p>
        )}
        <ul className="divide-y divide-ink-100" data-testid="outbox-list">
          {messages.map((m) => (
            <li key={m.id}>
              <button
                type="button"
                onClick={() => setSelected(m.id)}
                aria-current={selected === m.id}
                className={`w-full px-3 py-2 text-left text-sm hover:bg-ink-50 ${selected === m.id ? 'bg-bronze-100' : ''}`}
              >
                <span className="block font-medium text-ink-900">{m.subject}</span>
                <span className="block text-xs text-ink-600">
                  to {m.to.join(', ')} · {when(m.receivedAt)}
                  {m.attachments.length > 0 && ` · ${m.attachments.length} attachment${m.attachments.length > 1 ? 's' : ''}`}
                </span>
              </button>
            </li>
          ))}
        </ul>
      </section>
      <section className="panel p-4" aria-label="Message">
        {!selected && <p className="text-sm text-ink-600">Choose a message to read it.</p>}
        {message.data && <MessageDetail message={message.data.message} />}
      </section>
    </div>
  );
}

function MessageDetail({ message }: { message: Message }) {
  return (
    <article data-testid="outbox-message">
      <h2 className="mb-2">{message.subject}</h2>
      <dl className="mb-4 grid grid-cols-[auto_1fr] gap-x-3 text-sm">
        <dt className="text-ink-500">From</dt>
        <dd>{message.from}</dd>
        <dt className="text-ink-500">To</dt>
        <dd>{message.to.join(', ')}</dd>
        <dt className="text-ink-500">Received</dt>
        <dd>{when(message.receivedAt)}</dd>
      </dl>
      <pre className="mb-4 font-sans text-sm whitespace-pre-wrap text-ink-800">{message.text ?? '(no plain-text body)'}</pre>
      {message.attachments.length > 0 && (
        <ul className="space-y-1 text-sm">
          {message.attachments.map((a, i) => (
            <li key={i}>
              <a href={`/api/outbox/${message.id}/attachments/${i}`}>{a.filename}</a>{' '}
              <span className="text-ink-500">
                ({a.contentType}, {kib(a.size)})
              </span>
            </li>
          ))}
        </ul>
      )}
    </article>
  );
}

export default withQueryClient(OutboxView);
