// @vitest-environment jsdom
// Members and invitations against the API contract: POST /api/studios/:id/invitations answers 400
// `{ error, issues: [{ path, message }] }` for field problems; mutations refresh the lists.
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { inviteBody } from '../../../shared/schemas/api';
import type { Invitation, Member } from '../../../shared/schemas/api';
import { InviteForm } from '../../../src/features/members/components/invite-form';
import { InvitationsTable } from '../../../src/features/members/components/invitations-table';
import { MembersTable } from '../../../src/features/members/components/members-table';
import { empty, fakeApi, json, renderWithApp } from './harness';

const STUDIO = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';
const DOME = { id: 'e7a5c1f6-9b8d-4c2e-8f0a-5b6c7d8e9f0a', name: 'Harbour Lights Dome' };
const ARCADE = { id: 'f8b6d2a7-0c9e-4d3f-9a1b-6c7d8e9f0a1b', name: 'Tidewater Arcade' };
const VENUES = [DOME, ARCADE];

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function fieldByLabel(label: string) {
  return screen.getByLabelText(label);
}

describe('invite form', () => {
  it("shows the server's field issues beside the fields they name", async () => {
    fakeApi({
      [`POST /api/studios/${STUDIO}/invitations`]: () =>
        json(
          {
            error: 'The invitation form has problems.',
            issues: [
              { path: 'email', message: 'this person is already a member of the studio' },
              { path: 'venueIds.0', message: 'venue not found in this studio' },
            ],
          },
          400,
        ),
    });
    renderWithApp(<InviteForm studioId={STUDIO} venues={VENUES} />);
    fireEvent.change(fieldByLabel('E-mail'), { target: { value: 'otto.operator@lanternfish.example' } });
    fireEvent.click(screen.getByRole('checkbox', { name: 'Venue operator' }));
    fireEvent.click(screen.getByRole('checkbox', { name: 'Tidewater Arcade' }));
    fireEvent.click(screen.getByRole('button', { name: 'Send invitation' }));

    // API contract: `error` is the form's message, `issues[].path` names the field it belongs to.
    expect(await screen.findByRole('alert')).toHaveTextContent('The invitation form has problems.');
    const email = fieldByLabel('E-mail');
    expect(email).toHaveAttribute('aria-invalid', 'true');
    expect(email).toHaveAccessibleDescription('this person is already a member of the studio');
    const venues = screen.getByRole('group', { name: 'Venues (for the venue operator role)' });
    expect(venues).toHaveAccessibleDescription('venue not found in this studio');
  });

  it('checks the form with the shared schema before sending, so a bad e-mail never reaches the server', async () => {
    const { calls } = fakeApi({});
    renderWithApp(<InviteForm studioId={STUDIO} venues={VENUES} />);
    fireEvent.change(fieldByLabel('E-mail'), { target: { value: 'not-an-address' } });
    fireEvent.click(screen.getByRole('button', { name: 'Send invitation' }));

    // The same zod schema as the server (shared/schemas/api.ts inviteBody) supplies the messages.
    const expected = inviteBody.safeParse({ email: 'not-an-address', roles: [], venueIds: [] });
    expect(expected.success).toBe(false);
    const messages = expected.error!.issues.map((issue) => [issue.path[0], issue.message]);
    expect(
      await screen.findByText(String(messages.find(([path]) => path === 'email')?.[1])),
    ).toBeInTheDocument();
    expect(screen.getByText(String(messages.find(([path]) => path === 'roles')?.[1]))).toBeInTheDocument();
    expect(calls.filter((call) => call.path.endsWith('/invitations'))).toHaveLength(0);
  });

  it('sends roles and venues, confirms, and refreshes the pending invitations', async () => {
    let pending: Invitation[] = [];
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/invitations`]: () => json(pending),
      [`POST /api/studios/${STUDIO}/invitations`]: (call) => {
        const body = call.body as { email: string; roles: Invitation['roles']; venueIds: string[] };
        const created: Invitation = {
          id: '0a1b2c3d-4e5f-4a6b-8c7d-8e9f0a1b2c3d',
          email: body.email,
          roles: body.roles,
          venueIds: body.venueIds,
          expiresAt: '2099-01-08T00:00:00.000Z',
          acceptedAt: null,
        };
        pending = [created];
        return json(created, 201);
      },
    });
    renderWithApp(
      <>
        <InviteForm studioId={STUDIO} venues={VENUES} />
        <InvitationsTable studioId={STUDIO} venues={VENUES} />
      </>,
    );
    expect(await screen.findByText('No pending invitations.')).toBeInTheDocument();

    fireEvent.change(fieldByLabel('E-mail'), { target: { value: 'New.Operator@Lanternfish.example' } });
    fireEvent.click(screen.getByRole('checkbox', { name: 'Venue operator' }));
    fireEvent.click(screen.getByRole('checkbox', { name: 'Harbour Lights Dome' }));
    fireEvent.click(screen.getByRole('button', { name: 'Send invitation' }));

    expect(
      await screen.findByText('Invitation sent to new.operator@lanternfish.example.'),
    ).toBeInTheDocument();
    const post = calls.find((call) => call.method === 'POST' && call.path.endsWith('/invitations'));
    // inviteBody lower-cases the e-mail, as the server does.
    expect(post?.body).toEqual({
      email: 'new.operator@lanternfish.example',
      roles: ['venue_operator'],
      venueIds: [DOME.id],
    });
    const table = await screen.findByRole('table', { name: 'Pending invitations' });
    expect(within(table).getByText('new.operator@lanternfish.example')).toBeInTheDocument();
    expect(within(table).getByText('Harbour Lights Dome')).toBeInTheDocument();
  });
});

describe('invite form with the mail server down', () => {
  it('says the invitation is saved but its mail did not go (mailSent false), not "sent"', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/invitations`]: () => json([]),
      [`POST /api/studios/${STUDIO}/invitations`]: (call) => {
        const body = call.body as { email: string; roles: Invitation['roles']; venueIds: string[] };
        return json(
          {
            id: '0a1b2c3d-4e5f-4a6b-8c7d-8e9f0a1b2c3e',
            email: body.email,
            roles: body.roles,
            venueIds: body.venueIds,
            expiresAt: '2099-01-08T00:00:00.000Z',
            acceptedAt: null,
            mailSent: false,
          },
          201,
        );
      },
    });
    renderWithApp(<InviteForm studioId={STUDIO} venues={VENUES} />);
    fireEvent.change(fieldByLabel('E-mail'), { target: { value: 'new.producer@lanternfish.example' } });
    fireEvent.click(screen.getByRole('checkbox', { name: 'Producer' }));
    fireEvent.click(screen.getByRole('button', { name: 'Send invitation' }));
    expect(await screen.findByText(/its mail could not be sent now/)).toBeInTheDocument();
    expect(screen.queryByText(/Invitation sent to/)).not.toBeInTheDocument();
  });
});

describe('members table', () => {
  const members: Member[] = [
    {
      userId: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
      email: 'ada.admin@lanternfish.example',
      name: 'Ada Moreau',
      roles: ['studio_admin'],
      venueIds: [],
      joinedAt: '2026-01-01T00:00:00.000Z',
    },
    {
      userId: 'd6f4b0e5-8a7c-4b1d-8e9f-4a5b6c7d8e9f',
      email: 'otto.operator@lanternfish.example',
      name: 'Otto Brenner',
      roles: ['venue_operator'],
      venueIds: [DOME.id],
      joinedAt: '2026-01-01T00:00:00.000Z',
    },
  ];

  it('shows roles and venue scope, and saves edited roles with PATCH', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/members`]: () => json(members),
      [`PATCH /api/studios/${STUDIO}/members/${members[1]!.userId}`]: (call) =>
        json({ ...members[1]!, ...(call.body as object) }),
    });
    renderWithApp(<MembersTable studioId={STUDIO} venues={VENUES} currentUserId={members[0]!.userId} />);
    const table = await screen.findByRole('table', { name: 'Members' });
    const ottoRow = within(table).getByText('Otto Brenner').closest('tr')!;
    expect(ottoRow).toHaveTextContent('Venue operator');
    expect(ottoRow).toHaveTextContent('Harbour Lights Dome');

    fireEvent.click(screen.getByRole('button', { name: 'Edit Otto Brenner' }));
    const editor = screen.getByRole('group', { name: 'Edit Otto Brenner' });
    fireEvent.click(within(editor).getByRole('checkbox', { name: 'Tidewater Arcade' }));
    fireEvent.click(within(editor).getByRole('checkbox', { name: 'Motion engineer' }));
    fireEvent.click(within(editor).getByRole('button', { name: 'Save' }));

    await waitFor(() => expect(calls.some((call) => call.method === 'PATCH')).toBe(true));
    const patch = calls.find((call) => call.method === 'PATCH');
    // Roles go out in the order of ROLES (shared/schemas/roles.ts), venues in the order offered.
    expect(patch?.body).toEqual({
      roles: ['motion_engineer', 'venue_operator'],
      venueIds: [DOME.id, ARCADE.id],
    });
    // API contract: a mutation refreshes the list it changed.
    await waitFor(() =>
      expect(calls.filter((call) => call.method === 'GET' && call.path.endsWith('/members'))).toHaveLength(2),
    );
  });

  it('removes a member only after a second, explicit confirmation', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/members`]: () => json(members),
      [`DELETE /api/studios/${STUDIO}/members/${members[1]!.userId}`]: () => empty(204),
    });
    renderWithApp(<MembersTable studioId={STUDIO} venues={VENUES} currentUserId={members[0]!.userId} />);
    fireEvent.click(await screen.findByRole('button', { name: 'Remove Otto Brenner' }));
    expect(calls.some((call) => call.method === 'DELETE')).toBe(false);
    fireEvent.click(screen.getByRole('button', { name: 'Confirm removal' }));
    await waitFor(() => expect(calls.some((call) => call.method === 'DELETE')).toBe(true));
  });

  it("shows the API's error when the caller is not a studio admin", async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/members`]: () => json({ error: 'Only a studio admin may do this.' }, 403),
    });
    renderWithApp(<MembersTable studioId={STUDIO} venues={VENUES} currentUserId="x" />);
    expect(await screen.findByRole('alert')).toHaveTextContent('Only a studio admin may do this.');
  });
});
