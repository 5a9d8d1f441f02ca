import { useState } from 'react';
import type { FormEvent } from 'react';
import { inviteBody } from '../../../../shared/schemas/api';
import type { Role } from '../../../../shared/schemas/roles';
import { Button } from '../../../components/ui/button';
import { TextField, issuesByField } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useCreateInvitation } from '../api/create-invitation';
import { RoleVenueFields } from './role-venue-fields';
import type { VenueChoice } from './role-venue-fields';

/** Invites someone by e-mail with roles (and venues for an operator); field problems show beside each field. */
export function InviteForm({ studioId, venues }: { studioId: string; venues: readonly VenueChoice[] }) {
  const [email, setEmail] = useState('');
  const [roles, setRoles] = useState<Role[]>([]);
  const [venueIds, setVenueIds] = useState<string[]>([]);
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [unmailed, setUnmailed] = useState<string | null>(null);
  const create = useCreateInvitation(studioId);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setSentTo(null);
    setUnmailed(null);
    // The same schema the server applies, so most mistakes show before a round trip.
    const parsed = inviteBody.safeParse({
      email,
      roles,
      venueIds: roles.includes('venue_operator') ? venueIds : [],
    });
    if (!parsed.success) {
      setClientErrors(
        issuesByField(
          parsed.error.issues.map((issue) => ({ path: issue.path.join('.'), message: issue.message })),
        ),
      );
      return;
    }
    setClientErrors({});
    create.mutate(
      { studioId, ...parsed.data },
      {
        onSuccess: (invitation) => {
          if (invitation.mailSent === false) setUnmailed(invitation.email);
          else setSentTo(invitation.email);
          setEmail('');
          setRoles([]);
          setVenueIds([]);
        },
      },
    );
  };

  const serverErrors = create.error instanceof ApiRequestError ? issuesByField(create.error.issues) : {};
  const errors = { ...serverErrors, ...clientErrors };

  return (
    <form onSubmit={submit} noValidate aria-label="Invite a member" className="flex flex-col gap-3">
      {sentTo ? <Notice>Invitation sent to {sentTo}.</Notice> : null}
      {unmailed ? (
        <Notice>
          The invitation for {unmailed} is saved, but its mail could not be sent now (the mail server did not
          take it). Revoke it and invite again once mail works.
        </Notice>
      ) : null}
      {create.error ? <ErrorNotice error={create.error} /> : null}
      <TextField
        label="E-mail"
        type="email"
        autoComplete="off"
        value={email}
        error={errors.email}
        onChange={(event) => setEmail(event.target.value)}
        className="max-w-sm"
      />
      <RoleVenueFields
        roles={roles}
        venueIds={venueIds}
        venues={venues}
        onRolesChange={setRoles}
        onVenueIdsChange={setVenueIds}
        errors={errors}
      />
      <div>
        <Button type="submit" variant="primary" busy={create.isPending}>
          Send invitation
        </Button>
      </div>
    </form>
  );
}
