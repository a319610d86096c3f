import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { authClient, authErrorMessage } from '../../lib/client/auth-client';
import { FormMessage } from '../ui/Field';
import { NewPasswordFields, newPasswordSchema } from './NewPasswordFields';
import { SubmitButton } from '../ui/SubmitButton';

type Values = z.infer<typeof newPasswordSchema>;

export default function ResetPasswordForm({ token }: { token: string }) {
  const [outcome, setOutcome] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(newPasswordSchema) });

  const onSubmit = async ({ password }: Values) => {
    const { error } = await authClient.resetPassword({ newPassword: password, token });
    setOutcome(error ? { tone: 'error', text: authErrorMessage(error) } : { tone: 'ok', text: 'Your password is changed. Sign in with it now.' });
  };

  if (outcome?.tone === 'ok') {
    return (
      <div className="space-y-4">
        <FormMessage tone="ok">{outcome.text}</FormMessage>
        <a className="btn-primary w-full" href="/sign-in">Go to sign-in</a>
      </div>
    );
  }
  return (
    <form method="post" onSubmit={handleSubmit(onSubmit)} className="space-y-4" noValidate>
      {outcome && <FormMessage tone="error">{outcome.text}</FormMessage>}
      <NewPasswordFields register={register} errors={formState.errors} />
      <SubmitButton className="btn-primary w-full" disabled={formState.isSubmitting}>
        Set the new password
      </SubmitButton>
    </form>
  );
}
