import { useState } from 'react';
import type { FormEvent } from 'react';
import { Link } from 'react-router-dom';
import { passwordSchema } from '../../../../shared/schemas/api';
import { Button } from '../../../components/ui/button';
import { TextField, issuesByField } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useConfirmPasswordReset } from '../api/confirm-password-reset';

/** Sets a new password with the token from the reset link. */
export function ResetPasswordForm({ token }: { token: string }) {
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const confirm = useConfirmPasswordReset();

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const next: Record<string, string> = {};
    const parsed = passwordSchema.safeParse(password);
    if (!parsed.success) next.password = parsed.error.issues[0]?.message ?? 'not a valid password';
    if (repeat !== password) next.repeat = 'does not match the new password';
    setErrors(next);
    if (Object.keys(next).length === 0) confirm.mutate({ token, password });
  };

  if (confirm.isSuccess) {
    return (
      <Notice>
        Your password is changed.{' '}
        <Link to="/sign-in" className="underline">
          Sign in
        </Link>{' '}
        with it.
      </Notice>
    );
  }

  const serverIssues = confirm.error instanceof ApiRequestError ? issuesByField(confirm.error.issues) : {};
  return (
    <form
      onSubmit={submit}
      noValidate
      className="flex flex-col gap-3 rounded border border-ink-200 bg-white p-4"
    >
      {confirm.error ? <ErrorNotice error={confirm.error} /> : null}
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        value={password}
        hint="At least 10 characters."
        error={errors.password ?? serverIssues.password}
        onChange={(event) => setPassword(event.target.value)}
      />
      <TextField
        label="New password again"
        type="password"
        autoComplete="new-password"
        value={repeat}
        error={errors.repeat}
        onChange={(event) => setRepeat(event.target.value)}
      />
      <div className="flex justify-end">
        <Button type="submit" variant="primary" busy={confirm.isPending}>
          Set password
        </Button>
      </div>
    </form>
  );
}
