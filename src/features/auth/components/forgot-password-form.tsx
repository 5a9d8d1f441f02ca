import { useState } from 'react';
import type { FormEvent } from 'react';
import { resetRequestBody } from '../../../../shared/schemas/api';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { useRequestPasswordReset } from '../api/request-password-reset';

/** Asks for a reset link; the answer never says whether the address has an account. */
export function ForgotPasswordForm() {
  const [email, setEmail] = useState('');
  const [fieldError, setFieldError] = useState<string | undefined>();
  const request = useRequestPasswordReset();

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = resetRequestBody.safeParse({ email });
    if (!parsed.success) {
      setFieldError(parsed.error.issues[0]?.message ?? 'must be an e-mail address');
      return;
    }
    setFieldError(undefined);
    request.mutate(parsed.data);
  };

  if (request.isSuccess) {
    return (
      <Notice>
        If an account exists for {email.trim()}, a link to set a new password is on its way. It works once and
        expires.
      </Notice>
    );
  }

  return (
    <form
      onSubmit={submit}
      noValidate
      className="flex flex-col gap-3 rounded border border-ink-200 bg-white p-4"
    >
      {request.error ? <ErrorNotice error={request.error} /> : null}
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        value={email}
        error={fieldError}
        onChange={(event) => setEmail(event.target.value)}
      />
      <div className="flex justify-end">
        <Button type="submit" variant="primary" busy={request.isPending}>
          Send reset link
        </Button>
      </div>
    </form>
  );
}
