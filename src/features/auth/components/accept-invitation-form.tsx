import { useState } from 'react';
import type { FormEvent } from 'react';
import type { Me } from '../../../../shared/schemas/api';
import { passwordSchema } from '../../../../shared/schemas/api';
import { ROLE_LABELS } from '../../../../shared/schemas/roles';
import { Button } from '../../../components/ui/button';
import { TextField, issuesByField } from '../../../components/ui/form';
import { ErrorNotice, Loading } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useAcceptInvitation } from '../api/accept-invitation';
import { useInvitation } from '../api/get-invitation';

/** Shows what an invitation offers and accepts it; a new person chooses a name and a password here. */
export function AcceptInvitationForm({
  token,
  onAccepted,
}: {
  token: string;
  onAccepted: (me: Me, studioName: string) => void;
}) {
  const invitation = useInvitation(token);
  const accept = useAcceptInvitation();
  const [name, setName] = useState('');
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});

  if (invitation.isPending) return <Loading what="Opening the invitation" />;
  if (invitation.isError) {
    const gone = invitation.error instanceof ApiRequestError && [404, 410].includes(invitation.error.status);
    return (
      <ErrorNotice
        error={
          gone
            ? new Error(
                `${invitation.error.message} Ask the studio admin for a new invitation if you still need one.`,
              )
            : invitation.error
        }
      />
    );
  }

  const { studioName, email, roles, existingUser } = invitation.data;

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    if (existingUser) {
      accept.mutate({ token }, { onSuccess: (me) => onAccepted(me, studioName) });
      return;
    }
    const next: Record<string, string> = {};
    if (!name.trim()) next.name = 'enter the name your colleagues know you by';
    const parsed = passwordSchema.safeParse(password);
    if (!parsed.success) next.password = parsed.error.issues[0]?.message ?? 'not a valid password';
    setErrors(next);
    if (Object.keys(next).length === 0) {
      accept.mutate(
        { token, name: name.trim(), password },
        { onSuccess: (me) => onAccepted(me, studioName) },
      );
    }
  };

  const serverIssues = accept.error instanceof ApiRequestError ? issuesByField(accept.error.issues) : {};
  return (
    <form
      onSubmit={submit}
      noValidate
      className="flex flex-col gap-3 rounded border border-ink-200 bg-white p-4"
    >
      <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-600">Studio</dt>
        <dd className="font-medium text-ink-900">{studioName}</dd>
        <dt className="text-ink-600">E-mail</dt>
        <dd className="font-mono break-all text-ink-900">{email}</dd>
        <dt className="text-ink-600">Roles</dt>
        <dd className="text-ink-900">{roles.map((role) => ROLE_LABELS[role]).join(', ')}</dd>
      </dl>
      {accept.error ? <ErrorNotice error={accept.error} /> : null}
      {existingUser ? (
        <p className="text-sm text-ink-600">
          You already have a Legwork account. Accept while signed in as {email}.
        </p>
      ) : (
        <>
          <TextField
            label="Your name"
            autoComplete="name"
            value={name}
            error={errors.name ?? serverIssues.name}
            onChange={(event) => setName(event.target.value)}
          />
          <TextField
            label="Choose a password"
            type="password"
            autoComplete="new-password"
            hint="At least 10 characters."
            value={password}
            error={errors.password ?? serverIssues.password}
            onChange={(event) => setPassword(event.target.value)}
          />
        </>
      )}
      <div className="flex justify-end">
        <Button type="submit" variant="primary" busy={accept.isPending}>
          Accept invitation
        </Button>
      </div>
    </form>
  );
}
