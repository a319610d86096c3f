import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { PLATFORM_ROLES, type PlatformRole } from '../../lib/roles';
import { api, ApiError, describeError } from '../../lib/client/api';
import { Field, FormMessage } from '../ui/Field';
import { SubmitButton } from '../ui/SubmitButton';

const schema = z.object({ email: z.email('Enter a valid e-mail address'), role: z.enum(PLATFORM_ROLES) });
type Values = z.infer<typeof schema>;

/** Invite one address. Facilitators may invite members only; the server enforces it too. */
export function InviteForm({ roles }: { roles: PlatformRole[] }) {
  const queries = useQueryClient();
  const { register, handleSubmit, reset, setError, formState } = useForm<Values>({
    resolver: zodResolver(schema),
    defaultValues: { email: '', role: 'member' },
  });
  const send = useMutation({
    mutationFn: (values: Values) => api<{ email: string }>('/api/invitations', { method: 'POST', json: values }),
    onSuccess: () => {
      reset({ email: '', role: 'member' });
      void queries.invalidateQueries({ queryKey: ['invitations'] });
    },
    onError: (error) => {
      if (error instanceof ApiError) {
        for (const f of error.fields) if (f.field === 'email' || f.field === 'role') setError(f.field, { message: f.reason });
      }
    },
  });

  return (
    <form onSubmit={handleSubmit((v) => send.mutate(v))} className="space-y-3" noValidate aria-label="Invite someone">
      {send.isSuccess && <FormMessage tone="ok">Invitation sent to {send.data.email}.</FormMessage>}
      {send.isError && <FormMessage tone="error">{describeError(send.error)}</FormMessage>}
      <div className="grid gap-3 sm:grid-cols-[1fr_auto]">
        <Field id="invite-email" label="E-mail address" error={formState.errors.email?.message}>
          <input id="invite-email" type="email" className="field-input" {...register('email')} />
        </Field>
        <Field id="invite-role" label="Role">
          <select id="invite-role" className="field-input" {...register('role')} disabled={roles.length === 1}>
            {roles.map((r) => (
              <option key={r} value={r}>
                {r}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <SubmitButton className="btn-primary" disabled={send.isPending}>
        {send.isPending ? 'Sending…' : 'Send invitation'}
      </SubmitButton>
    </form>
  );
}
