import { useState } from 'react';
import type { Member } from '../../../../shared/schemas/api';
import { ROLE_LABELS } from '../../../../shared/schemas/roles';
import type { Role } from '../../../../shared/schemas/roles';
import { Button } from '../../../components/ui/button';
import { issuesByField } from '../../../components/ui/form';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { ApiRequestError } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format';
import { useMembers } from '../api/get-members';
import { useRemoveMember } from '../api/remove-member';
import { useUpdateMember } from '../api/update-member';
import { RoleVenueFields, describeVenueScope } from './role-venue-fields';
import type { VenueChoice } from './role-venue-fields';

/** The studio's members with their roles and venue scope; each row can be edited or removed. */
export function MembersTable({
  studioId,
  venues,
  currentUserId,
}: {
  studioId: string;
  venues: readonly VenueChoice[];
  currentUserId: string;
}) {
  const members = useMembers(studioId);
  const [editing, setEditing] = useState<string | null>(null);

  if (members.isPending) return <Loading what="Loading members" />;
  if (members.isError) return <ErrorNotice error={members.error} retry={() => void members.refetch()} />;
  if (members.data.length === 0) return <Empty>No members.</Empty>;

  return (
    <Table caption="Members">
      <thead>
        <tr>
          <Th>Name</Th>
          <Th>E-mail</Th>
          <Th>Roles</Th>
          <Th>Venue scope</Th>
          <Th>Joined</Th>
          <Th>
            <span className="sr-only">Actions</span>
          </Th>
        </tr>
      </thead>
      <tbody>
        {members.data.map((member) =>
          editing === member.userId ? (
            <MemberEditorRow
              key={member.userId}
              studioId={studioId}
              member={member}
              venues={venues}
              onDone={() => setEditing(null)}
            />
          ) : (
            <MemberRow
              key={member.userId}
              studioId={studioId}
              member={member}
              venues={venues}
              isSelf={member.userId === currentUserId}
              onEdit={() => setEditing(member.userId)}
            />
          ),
        )}
      </tbody>
    </Table>
  );
}

function MemberRow({
  studioId,
  member,
  venues,
  isSelf,
  onEdit,
}: {
  studioId: string;
  member: Member;
  venues: readonly VenueChoice[];
  isSelf: boolean;
  onEdit: () => void;
}) {
  const remove = useRemoveMember(studioId);
  const [confirming, setConfirming] = useState(false);
  return (
    <tr>
      <Td className="font-medium">
        {member.name}
        {isSelf ? <span className="ml-1 text-xs text-ink-400">(you)</span> : null}
      </Td>
      <Td className="font-mono text-xs">{member.email}</Td>
      <Td>{member.roles.map((role) => ROLE_LABELS[role]).join(', ')}</Td>
      <Td>{describeVenueScope(member.roles, member.venueIds, venues)}</Td>
      <Td className="text-xs whitespace-nowrap text-ink-600">{formatDateTime(member.joinedAt)}</Td>
      <Td className="text-right whitespace-nowrap">
        <div className="flex flex-col items-end gap-1">
          <div className="flex justify-end gap-1">
            <Button size="sm" onClick={onEdit} aria-label={`Edit ${member.name}`}>
              Edit
            </Button>
            {confirming ? (
              <>
                <Button
                  size="sm"
                  variant="danger"
                  busy={remove.isPending}
                  onClick={() => remove.mutate({ studioId, userId: member.userId })}
                >
                  Confirm removal
                </Button>
                <Button size="sm" variant="quiet" onClick={() => setConfirming(false)}>
                  Keep
                </Button>
              </>
            ) : (
              <Button
                size="sm"
                variant="danger"
                onClick={() => setConfirming(true)}
                aria-label={`Remove ${member.name}`}
              >
                Remove
              </Button>
            )}
          </div>
          {remove.error ? <ErrorNotice error={remove.error} /> : null}
        </div>
      </Td>
    </tr>
  );
}

function MemberEditorRow({
  studioId,
  member,
  venues,
  onDone,
}: {
  studioId: string;
  member: Member;
  venues: readonly VenueChoice[];
  onDone: () => void;
}) {
  const [roles, setRoles] = useState<Role[]>(member.roles);
  const [venueIds, setVenueIds] = useState<string[]>(member.venueIds);
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const update = useUpdateMember(studioId);

  const save = () => {
    if (roles.length === 0) {
      setClientErrors({ roles: 'choose at least one role' });
      return;
    }
    setClientErrors({});
    update.mutate(
      { studioId, userId: member.userId, roles, venueIds: roles.includes('venue_operator') ? venueIds : [] },
      { onSuccess: onDone },
    );
  };

  const serverErrors = update.error instanceof ApiRequestError ? issuesByField(update.error.issues) : {};
  return (
    <tr className="bg-ink-50">
      <Td className="font-medium">{member.name}</Td>
      <Td className="font-mono text-xs">{member.email}</Td>
      <Td colSpan={4}>
        <div role="group" aria-label={`Edit ${member.name}`} className="flex flex-col gap-3 py-1">
          {update.error ? <ErrorNotice error={update.error} /> : null}
          <RoleVenueFields
            roles={roles}
            venueIds={venueIds}
            venues={venues}
            onRolesChange={setRoles}
            onVenueIdsChange={setVenueIds}
            errors={{ ...serverErrors, ...clientErrors }}
            disabled={update.isPending}
          />
          <div className="flex gap-2">
            <Button size="sm" variant="primary" busy={update.isPending} onClick={save}>
              Save
            </Button>
            <Button size="sm" variant="quiet" onClick={onDone}>
              Cancel
            </Button>
          </div>
        </div>
      </Td>
    </tr>
  );
}
