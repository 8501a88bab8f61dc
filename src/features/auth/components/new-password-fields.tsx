import type { UseFormRegisterReturn } from 'react-hook-form';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';

/** The check that a new password was typed the same twice, for `.refine` on a form schema. */
export const passwordsAgree: [
  (v: { password: string; confirm: string }) => boolean,
  { path: string[]; message: string },
] = [(v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ' }];

export const PASSWORD_HINT =
  'At least 8 characters. A few unrelated words make a strong one; very common passwords are refused.';

/** A new password typed twice. */
export function NewPasswordFields({
  password,
  confirm,
  passwordError,
  confirmError,
}: {
  password: UseFormRegisterReturn;
  confirm: UseFormRegisterReturn;
  passwordError?: string;
  confirmError?: string;
}) {
  return (
    <>
      <FormField label="New password" hint={PASSWORD_HINT} error={passwordError}>
        <Input type="password" autoComplete="new-password" {...password} />
      </FormField>
      <FormField label="New password again" error={confirmError}>
        <Input type="password" autoComplete="new-password" {...confirm} />
      </FormField>
    </>
  );
}
