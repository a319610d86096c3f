import type { UseFormRegister, FieldErrors } from 'react-hook-form';
import { z } from 'zod';
import { Field } from '../ui/Field';

/** Password and its repetition, shared by the reset and invitation forms. */
export const newPasswordSchema = z
  .object({
    password: z.string().min(10, 'Use at least 10 characters').max(128, 'Use at most 128 characters'),
    repeat: z.string(),
  })
  .refine((v) => v.password === v.repeat, { path: ['repeat'], message: 'The two passwords differ' });

type Values = { password: string; repeat: string };

export function NewPasswordFields<T extends Values>({ register, errors }: { register: UseFormRegister<T>; errors: FieldErrors<T> }) {
  const reg = register as unknown as UseFormRegister<Values>;
  const errs = errors as FieldErrors<Values>;
  return (
    <>
      <Field id="password" label="New password" hint="At least 10 characters." error={errs.password?.message}>
        <input id="password" type="password" autoComplete="new-password" className="field-input" {...reg('password')} />
      </Field>
      <Field id="repeat" label="Repeat the password" error={errs.repeat?.message}>
        <input id="repeat" type="password" autoComplete="new-password" className="field-input" {...reg('repeat')} />
      </Field>
    </>
  );
}
