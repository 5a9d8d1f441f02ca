import { useState } from 'react';
import type { FormEvent } from 'react';
import { Link } from 'react-router-dom';
import type { Me } from '../../../../shared/schemas/api';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/form';
import { ErrorNotice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useLogin } from '../api/login';
import { DemoSignIns } from './demo-sign-ins';

/** E-mail and password sign-in; shows the server's own error, and the demo accounts on a local demo. */
export function SignInForm({ showDemo, onSignedIn }: { showDemo: boolean; onSignedIn: (me: Me) => void }) {
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const login = useLogin();

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    login.mutate({ email: email.trim(), password }, { onSuccess: onSignedIn });
  };

  const error = login.error;
  const rateLimited = error instanceof ApiRequestError && error.status === 429;

  return (
    <div className="flex flex-col gap-4">
      <form
        onSubmit={submit}
        className="flex flex-col gap-3 rounded border border-ink-200 bg-white p-4"
        noValidate
      >
        {error ? (
          <ErrorNotice
            error={
              rateLimited && error.message.startsWith('The server answered')
                ? new Error('Too many sign-in attempts from here. Wait a few minutes, then try again.')
                : error
            }
          />
        ) : null}
        <TextField
          label="E-mail"
          type="email"
          name="email"
          autoComplete="username"
          required
          value={email}
          onChange={(event) => setEmail(event.target.value)}
        />
        <TextField
          label="Password"
          type="password"
          name="password"
          autoComplete="current-password"
          required
          value={password}
          onChange={(event) => setPassword(event.target.value)}
        />
        <div className="flex items-center justify-between">
          <Link to="/forgot-password" className="text-xs text-tealdeep-600 underline">
            Forgot password?
          </Link>
          <Button type="submit" variant="primary" busy={login.isPending}>
            Sign in
          </Button>
        </div>
      </form>
      {showDemo ? (
        <DemoSignIns
          onPick={(pickedEmail, pickedPassword) => {
            setEmail(pickedEmail);
            setPassword(pickedPassword);
          }}
        />
      ) : null}
    </div>
  );
}
