import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { api, ApiError, describeError } from '../../lib/client/api';
import { Field, FormMessage } from '../ui/Field';
import { withQueryClient } from '../ui/QueryRoot';
import { SubmitButton } from '../ui/SubmitButton';

const schema = z.object({ title: z.string().trim().min(1, 'Give the scenario a title').max(200, 'At most 200 characters') });
type Values = z.infer<typeof schema>;

function NewScenarioForm() {
  const { register, handleSubmit, setError, formState } = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { title: '' } });
  const create = useMutation({
    mutationFn: (values: Values) => api<{ scenarioId: string }>('/api/scenarios', { method: 'POST', json: values }),
    onSuccess: ({ scenarioId }) => window.location.assign(`/studio/${scenarioId}`),
    onError: (error) => {
      if (error instanceof ApiError) for (const f of error.fields) if (f.field === 'title') setError('title', { message: f.reason });
    },
  });
  return (
    <form onSubmit={handleSubmit((v) => create.mutate(v))} className="space-y-3" noValidate aria-label="New scenario">
      {create.isError && <FormMessage tone="error">{describeError(create.error)}</FormMessage>}
      <Field id="scenario-title" label="Title" error={formState.errors.title?.message}>
        <input id="scenario-title" className="field-input" autoFocus {...register('title')} />
      </Field>
      <div className="flex gap-2">
        <SubmitButton className="btn-accent" disabled={create.isPending}>
          {create.isPending ? 'Creating…' : 'Create scenario'}
        </SubmitButton>
        <a href="/studio" className="btn-quiet">
          Back to the library
        </a>
      </div>
    </form>
  );
}

export default withQueryClient(NewScenarioForm);
