import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { authClient, authErrorMessage } from '../../lib/client/auth-client';
import { Field, FormMessage } from '../ui/Field';
import { SubmitButton } from '../ui/SubmitButton';

const schema = z.object({ email: z.email('Enter your e-mail address') });
type Values = z.infer<typeof schema>;

export default function ForgotPasswordForm() {
  const [outcome, setOutcome] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(schema) });

  const onSubmit = async ({ email }: Values) => {
    const { error } = await authClient.requestPasswordReset({ email, redirectTo: '/reset-password' });
    setOutcome(
      error
        ? { tone: 'error', text: authErrorMessage(error) }
        : { tone: 'ok', text: 'If an account uses this address, a reset link is on its way. It is valid for one hour.' },
    );
  };

  return (
    <form method="post" onSubmit={handleSubmit(onSubmit)} className="space-y-4" noValidate>
      {outcome && <FormMessage tone={outcome.tone}>{outcome.text}</FormMessage>}
      <Field id="email" label="E-mail address" error={formState.errors.email?.message}>
        <input id="email" type="email" autoComplete="username" className="field-input" {...register('email')} />
      </Field>
      <SubmitButton className="btn-primary w-full" disabled={formState.isSubmitting}>
        Send the reset link
      </SubmitButton>
      <p className="text-center text-sm">
        <a href="/sign-in">Back to sign-in</a>
      </p>
    </form>
  );
}
