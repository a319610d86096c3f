import { useRef, useState } from 'react';
import { api, ApiError, describeError, type FieldError } from '../../lib/client/api';
import { useHydrated } from '../ui/SubmitButton';
import { FaultList } from './FaultList';

type Created = { scenarioId: string; versionId: string };

/** Read a scenario JSON file in the browser and send it to the import endpoint; faults are listed by path. */
export function ImportButton({ onImported }: { onImported: (created: Created) => void }) {
  const input = useRef<HTMLInputElement>(null);
  const [faults, setFaults] = useState<FieldError[]>([]);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  // A file picked before the island is live would be dropped without a word.
  const live = useHydrated();

  const importFile = async (file: File) => {
    setFaults([]);
    setMessage(null);
    setBusy(true);
    try {
      let document: unknown;
      try {
        document = JSON.parse(await file.text());
      } catch (error) {
        setMessage(`“${file.name}” is not valid JSON: ${(error as Error).message}. Nothing was imported.`);
        return;
      }
      onImported(await api<Created>('/api/scenarios', { method: 'POST', json: { document } }));
    } catch (error) {
      if (error instanceof ApiError && error.fields.length > 0) {
        setMessage(error.message);
        setFaults(error.fields);
      } else setMessage(describeError(error));
    } finally {
      setBusy(false);
      if (input.current) input.current.value = '';
    }
  };

  return (
    <div className="space-y-2">
      <label className="btn-quiet cursor-pointer">
        {busy ? 'Importing…' : 'Import a scenario file'}
        <input
          ref={input}
          type="file"
          accept="application/json,.json"
          className="sr-only"
          data-testid="import-file"
          disabled={!live || busy}
          onChange={(e) => {
            const file = e.target.files?.[0];
            if (file) void importFile(file);
          }}
        />
      </label>
      {message && faults.length === 0 && (
        <p role="alert" className="text-sm text-brick-700">
          {message}
        </p>
      )}
      <FaultList title={message ?? 'The file has faults'} faults={faults} />
    </div>
  );
}
