/** Briefing documents: PDF, PNG or JPEG files for everyone, or for one team's private brief. */
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useRef, useState } from 'react';
import { api, describeError } from '../../../lib/client/api';
import type { AttachmentChange, AttachmentInfo } from '../../../lib/studio/attachments';
import { FormMessage } from '../../ui/Field';
import { useWorkbench } from './context';

const MAX_BYTES = 20 * 1024 * 1024;

const size = (bytes: number) => (bytes < 1024 * 1024 ? `${Math.max(1, Math.round(bytes / 1024))} KB` : `${(bytes / 1024 / 1024).toFixed(1)} MB`);

export function DocumentsTab({ versionId, onChanged }: { versionId: string; onChanged: (change: AttachmentChange) => void }) {
  const { scenarioId, document, readOnly } = useWorkbench();
  const queries = useQueryClient();
  const input = useRef<HTMLInputElement>(null);
  const [teamId, setTeamId] = useState('');
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const list = useQuery({
    queryKey: ['attachments', versionId, document.attachments.join(',')],
    queryFn: () => api<{ attachments: AttachmentInfo[] }>(`/api/scenarios/${scenarioId}/versions/${versionId}/attachments`),
  });
  const teamName = (id: string | null) => (id ? `${document.teams.find((t) => t.id === id)?.name ?? id} only` : 'everyone');

  const upload = async (file: File) => {
    setMessage(null);
    if (file.size > MAX_BYTES) {
      setMessage({ tone: 'error', text: `“${file.name}” is ${size(file.size)}; briefing documents may be at most 20 MB.` });
      return;
    }
    setBusy(true);
    try {
      const query = new URLSearchParams({ name: file.name, ...(teamId ? { teamId } : {}) });
      const done = await api<AttachmentChange & { attachment: AttachmentInfo }>(`/api/scenarios/${scenarioId}/versions/${versionId}/attachments?${query}`, {
        method: 'POST',
        body: file,
        // Never a form's type: the server reads the type from the content.
        headers: { 'content-type': 'application/octet-stream' },
      });
      onChanged(done);
      setMessage({ tone: 'ok', text: `Attached “${done.attachment.filename}” for ${teamName(done.attachment.teamId)}.` });
      void queries.invalidateQueries({ queryKey: ['attachments'] });
    } catch (error) {
      setMessage({ tone: 'error', text: describeError(error) });
    } finally {
      setBusy(false);
      if (input.current) input.current.value = '';
    }
  };

  const remove = async (attachment: AttachmentInfo) => {
    setMessage(null);
    try {
      onChanged(await api<AttachmentChange>(`/api/scenarios/${scenarioId}/versions/${versionId}/attachments/${attachment.id}`, { method: 'DELETE', json: {} }));
      void queries.invalidateQueries({ queryKey: ['attachments'] });
    } catch (error) {
      setMessage({ tone: 'error', text: describeError(error) });
    }
  };

  return (
    <section className="panel max-w-4xl space-y-3 p-4" aria-labelledby="documents-heading">
      <h2 id="documents-heading">Briefing documents</h2>
      <p className="text-sm text-ink-700">
        PDF, PNG or JPEG, up to 20 MB each. A document for one team is shown only to that team’s players and to the facilitators; the others to everyone in
        exercises run on this version. Handle sensitive material under your sponsor’s own rules.
      </p>
      {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
      {!readOnly && (
        <div className="flex flex-wrap items-end gap-3">
          <label className="block text-sm">
            <span className="field-label">For</span>
            <select className="field-input py-1" value={teamId} onChange={(e) => setTeamId(e.target.value)}>
              <option value="">everyone</option>
              {document.teams.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}’s private brief
                </option>
              ))}
            </select>
          </label>
          <label className="btn-accent cursor-pointer">
            {busy ? 'Uploading…' : 'Upload a document'}
            <input
              ref={input}
              type="file"
              className="sr-only"
              accept="application/pdf,image/png,image/jpeg"
              data-testid="upload-file"
              disabled={busy}
              onChange={(e) => {
                const file = e.target.files?.[0];
                if (file) void upload(file);
              }}
            />
          </label>
        </div>
      )}
      {list.isError && <FormMessage tone="error">{describeError(list.error)}</FormMessage>}
      {list.data?.attachments.length === 0 ? (
        <p className="rounded-md border border-dashed border-ink-300 p-6 text-center text-sm text-ink-600" data-empty="documents">
          No briefing documents yet. {readOnly ? '' : 'Upload maps, situation reports or background papers for the teams to read.'}
        </p>
      ) : (
        <table className="data-table" data-testid="documents-table">
          <thead>
            <tr>
              <th>Document</th>
              <th>For</th>
              <th>Size</th>
              <th>Added by</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {list.data?.attachments.map((a) => (
              <tr key={a.id}>
                <td>
                  <a href={`/api/attachments/${a.id}`} target="_blank" rel="noopener">
                    {a.filename}
                  </a>
                </td>
                <td>{teamName(a.teamId)}</td>
                <td>{size(a.size)}</td>
                <td>{a.uploadedByName}</td>
                <td>
                  {!readOnly && (
                    <button type="button" className="btn-quiet py-1" onClick={() => void remove(a)}>
                      Remove
                    </button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
