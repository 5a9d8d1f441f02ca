import type { Invitation } from '../../../../shared/schemas/api';
import { ROLE_LABELS } from '../../../../shared/schemas/roles';
import { Button } from '../../../components/ui/button';
import { Stat } from '../../../components/ui/section';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatDateTime } from '../../../lib/format';
import { useInvitations } from '../api/get-invitations';
import { useRevokeInvitation } from '../api/revoke-invitation';
import { describeVenueScope } from './role-venue-fields';
import type { VenueChoice } from './role-venue-fields';

/** Invitations not yet accepted (expired ones included, so an admin can see and revoke them). */
export function pendingInvitations(invitations: readonly Invitation[]): Invitation[] {
  return invitations.filter((invitation) => invitation.acceptedAt === null);
}

// Judged against when the list was fetched, not the render time, so rendering stays pure.
function isExpired(invitation: Invitation, asOf_ms: number): boolean {
  const expires_ms = Date.parse(invitation.expiresAt);
  return Number.isFinite(expires_ms) && expires_ms <= asOf_ms;
}

/** Invitations still waiting for an answer, each with a revoke button. */
export function InvitationsTable({ studioId, venues }: { studioId: string; venues: readonly VenueChoice[] }) {
  const invitations = useInvitations(studioId);
  const revoke = useRevokeInvitation(studioId);

  if (invitations.isPending) return <Loading what="Loading invitations" />;
  if (invitations.isError)
    return <ErrorNotice error={invitations.error} retry={() => void invitations.refetch()} />;
  const pending = pendingInvitations(invitations.data);
  if (pending.length === 0) return <Empty>No pending invitations.</Empty>;

  return (
    <div className="flex flex-col gap-2">
      {revoke.error ? <ErrorNotice error={revoke.error} /> : null}
      <Table caption="Pending invitations">
        <thead>
          <tr>
            <Th>E-mail</Th>
            <Th>Roles</Th>
            <Th>Venue scope</Th>
            <Th>Expires</Th>
            <Th>
              <span className="sr-only">Actions</span>
            </Th>
          </tr>
        </thead>
        <tbody>
          {pending.map((invitation) => (
            <tr key={invitation.id}>
              <Td className="font-mono text-xs">{invitation.email}</Td>
              <Td>{invitation.roles.map((role) => ROLE_LABELS[role]).join(', ')}</Td>
              <Td>{describeVenueScope(invitation.roles, invitation.venueIds, venues)}</Td>
              <Td className="text-xs whitespace-nowrap">
                {isExpired(invitation, invitations.dataUpdatedAt) ? (
                  <span className="font-medium text-signal-600">Expired </span>
                ) : null}
                <span className="text-ink-600">{formatDateTime(invitation.expiresAt)}</span>
              </Td>
              <Td className="text-right">
                <Button
                  size="sm"
                  variant="danger"
                  busy={revoke.isPending && revoke.variables?.invitationId === invitation.id}
                  onClick={() => revoke.mutate({ studioId, invitationId: invitation.id })}
                  aria-label={`Revoke the invitation for ${invitation.email}`}
                >
                  Revoke
                </Button>
              </Td>
            </tr>
          ))}
        </tbody>
      </Table>
    </div>
  );
}

/** The number of pending invitations, for the studio administration home. */
export function PendingInvitationsCount({ studioId }: { studioId: string }) {
  const invitations = useInvitations(studioId);
  if (invitations.isPending) return <Loading what="Counting invitations" />;
  if (invitations.isError) return <ErrorNotice error={invitations.error} />;
  const count = pendingInvitations(invitations.data).length;
  return <Stat label="Pending invitations" value={count} />;
}
