import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { api, describeError } from '../../lib/client/api';
import { Field, FormMessage } from '../ui/Field';
import { NewPasswordFields, newPasswordSchema } from './NewPasswordFields';
import { SubmitButton } from '../ui/SubmitButton';

const schema = z.intersection(
  z.object({ name: z.string().trim().min(2, 'Enter your name (2 characters or more)').max(120) }),
  newPasswordSchema,
);
type Values = z.infer<typeof schema>;

export default function AcceptInvitationForm({ token, email }: { token: string; email: string }) {
  const [failure, setFailure] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(schema) });

  const onSubmit = async ({ name, password }: Values) => {
    setFailure(null);
    try {
      await api('/api/invitations/accept', { method: 'POST', json: { token, name, password } });
      window.location.assign('/');
    } catch (error) {
      setFailure(describeError(error));
    }
  };

  return (
    <form method="post" onSubmit={handleSubmit(onSubmit)} className="space-y-4" noValidate>
      {failure && <FormMessage tone="error">{failure}</FormMessage>}
      <Field id="email" label="E-mail address">
        <input id="email" className="field-input bg-ink-50" value={email} readOnly />
      </Field>
      <Field id="name" label="Your name" hint="As other participants will see it." error={formState.errors.name?.message}>
        <input id="name" autoComplete="name" className="field-input" {...register('name')} />
      </Field>
      <NewPasswordFields register={register} errors={formState.errors} />
      <SubmitButton className="btn-primary w-full" disabled={formState.isSubmitting}>
        Create my account
      </SubmitButton>
    </form>
  );
}
