/** Start an exercise on a scenario version. A draft version is frozen when the exercise is created. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { api, ApiError, describeError } from '../../lib/client/api';
import { Field, FormMessage } from '../ui/Field';
import { useState } from 'react';
import { SubmitButton } from '../ui/SubmitButton';

export type VersionChoice = { id: string; label: string; scenarioTitle: string; frozen: boolean };

const schema = z.object({
  scenarioVersionId: z.string().min(1, 'Choose a scenario version'),
  title: z.string().trim().min(3, 'Give the exercise a title of 3 characters or more').max(200),
});
type Values = z.infer<typeof schema>;

export default function CreateExercise({ versions }: { versions: VersionChoice[] }) {
  const [failure, setFailure] = useState<string | null>(null);
  const { register, handleSubmit, setError, watch, formState } = useForm<Values>({
    resolver: zodResolver(schema),
    defaultValues: { scenarioVersionId: versions[0]?.id ?? '', title: '' },
  });
  const chosen = versions.find((v) => v.id === watch('scenarioVersionId'));
  const create = async (values: Values) => {
    setFailure(null);
    try {
      const { id } = await api<{ id: string }>('/api/exercises', { method: 'POST', json: values });
      window.location.assign(`/exercises/${id}`);
    } catch (error) {
      if (error instanceof ApiError) for (const f of error.fields) if (f.field === 'title' || f.field === 'scenarioVersionId') setError(f.field, { message: f.reason });
      setFailure(describeError(error));
    }
  };
  return (
    <form onSubmit={handleSubmit(create)} className="space-y-3" noValidate aria-label="Start an exercise">
      {failure && <FormMessage tone="error">{failure}</FormMessage>}
      <Field id="new-version" label="Scenario version" error={formState.errors.scenarioVersionId?.message} hint={chosen && !chosen.frozen ? 'This draft will be frozen: later edits in the Studio start a new version.' : undefined}>
        <select id="new-version" className="field-input" {...register('scenarioVersionId')}>
          {versions.map((v) => (
            <option key={v.id} value={v.id}>
              {v.scenarioTitle} · {v.label}
            </option>
          ))}
        </select>
      </Field>
      <Field id="new-title" label="Exercise title" error={formState.errors.title?.message}>
        <input id="new-title" className="field-input" placeholder="e.g. Serrin Strait, staff course run 3" {...register('title')} />
      </Field>
      <SubmitButton className="btn-accent" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? 'Creating…' : 'Create the exercise'}
      </SubmitButton>
    </form>
  );
}
