import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { authClient, authErrorMessage } from '../../lib/client/auth-client';
import { Field, FormMessage } from '../ui/Field';
import { SubmitButton } from '../ui/SubmitButton';

const schema = z.object({
  email: z.email('Enter your e-mail address'),
  password: z.string().min(1, 'Enter your password'),
});
type Values = z.infer<typeof schema>;

export default function SignInForm({ next }: { next: string }) {
  const [failure, setFailure] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(schema) });
  const { errors, isSubmitting } = formState;

  const onSubmit = async (values: Values) => {
    setFailure(null);
    const { error } = await authClient.signIn.email(values);
    if (error) return setFailure(authErrorMessage(error));
    window.location.assign(next);
  };

  return (
    <form method="post" onSubmit={handleSubmit(onSubmit)} className="space-y-4" noValidate>
      {failure && <FormMessage tone="error">{failure}</FormMessage>}
      <Field id="email" label="E-mail address" error={errors.email?.message}>
        <input id="email" type="email" autoComplete="username" className="field-input" aria-invalid={!!errors.email} {...register('email')} />
      </Field>
      <Field id="password" label="Password" error={errors.password?.message}>
        <input id="password" type="password" autoComplete="current-password" className="field-input" aria-invalid={!!errors.password} {...register('password')} />
      </Field>
      <SubmitButton className="btn-primary w-full" disabled={isSubmitting}>
        {isSubmitting ? 'Signing in…' : 'Sign in'}
      </SubmitButton>
      <p className="text-center text-sm">
        <a href="/forgot-password">Forgot your password?</a>
      </p>
    </form>
  );
}
