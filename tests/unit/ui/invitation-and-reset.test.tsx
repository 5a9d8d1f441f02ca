// @vitest-environment jsdom
// Invitation acceptance and password reset against the API contract: GET /api/invitations/:token
// (404/410 when gone), POST .../accept with name and password for a new person, and
// POST /api/auth/password-reset[/confirm]. The password rule is the shared passwordSchema.
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { passwordSchema } from '../../../shared/schemas/api';
import type { Me } from '../../../shared/schemas/api';
import {
  AcceptInvitationRoute,
  ForgotPasswordRoute,
  ResetPasswordRoute,
} from '../../../src/app/routes/public-routes';
import { empty, fakeApi, json, renderRoutes } from './harness';

const STUDIO = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';
const TOKEN = 'tok-abcdefghijklmnop';
const ME: Me = {
  user: {
    id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
    email: 'noor@lanternfish.example',
    name: 'Noor Haddad',
  },
  memberships: [
    {
      studioId: STUDIO,
      studioName: 'Lanternfish Studios',
      studioSlug: 'lanternfish',
      roles: ['safety_reviewer'],
      venueIds: [],
    },
  ],
};

const routes = [
  { path: '/invitations/:token', element: <AcceptInvitationRoute /> },
  { path: '/forgot-password', element: <ForgotPasswordRoute /> },
  { path: '/reset-password', element: <ResetPasswordRoute /> },
  { path: '/sign-in', element: <p>Sign-in page</p> },
  { path: '/s/:studioId', element: <p>Studio home</p> },
];

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('invitation page', () => {
  it('asks a new person for name and password, checks the password rule, then opens the studio', async () => {
    const { calls } = fakeApi({
      [`GET /api/invitations/${TOKEN}`]: () =>
        json({
          studioName: 'Lanternfish Studios',
          email: 'noor@lanternfish.example',
          roles: ['safety_reviewer'],
          existingUser: false,
        }),
      [`POST /api/invitations/${TOKEN}/accept`]: () => json(ME),
    });
    const { router } = renderRoutes(routes, `/invitations/${TOKEN}`);
    expect(await screen.findByText('Lanternfish Studios')).toBeInTheDocument();
    expect(screen.getByText('Safety reviewer')).toBeInTheDocument();

    fireEvent.change(screen.getByLabelText('Your name'), { target: { value: 'Noor Haddad' } });
    fireEvent.change(screen.getByLabelText('Choose a password'), { target: { value: 'short' } });
    fireEvent.click(screen.getByRole('button', { name: 'Accept invitation' }));
    // shared/schemas/api.ts passwordSchema: the same rule and message the server applies.
    const rule = passwordSchema.safeParse('short');
    expect(await screen.findByText(rule.error!.issues[0]!.message)).toBeInTheDocument();
    expect(calls.some((call) => call.method === 'POST' && call.path.endsWith('/accept'))).toBe(false);

    fireEvent.change(screen.getByLabelText('Choose a password'), { target: { value: 'long-enough-secret' } });
    fireEvent.click(screen.getByRole('button', { name: 'Accept invitation' }));
    expect(await screen.findByText('Studio home')).toBeInTheDocument();
    expect(router.state.location.pathname).toBe(`/s/${STUDIO}`);
    const accept = calls.find((call) => call.path.endsWith('/accept'));
    expect(accept?.body).toEqual({ name: 'Noor Haddad', password: 'long-enough-secret' });
  });

  it('asks an existing user for nothing but the click, and shows the server error as written', async () => {
    const { calls } = fakeApi({
      [`GET /api/invitations/${TOKEN}`]: () =>
        json({
          studioName: 'Lanternfish Studios',
          email: 'eli.engineer@lanternfish.example',
          roles: ['producer'],
          existingUser: true,
        }),
      [`POST /api/invitations/${TOKEN}/accept`]: () =>
        json({ error: 'Sign in as eli.engineer@lanternfish.example to accept.' }, 403),
    });
    renderRoutes(routes, `/invitations/${TOKEN}`);
    await screen.findByText('Lanternfish Studios');
    expect(screen.queryByLabelText('Choose a password')).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Accept invitation' }));
    expect(await screen.findByRole('alert')).toHaveTextContent(
      'Sign in as eli.engineer@lanternfish.example to accept.',
    );
    expect(calls.find((call) => call.path.endsWith('/accept'))?.body).toEqual({});
  });

  it('explains a revoked or expired invitation (410 Gone)', async () => {
    fakeApi({
      [`GET /api/invitations/${TOKEN}`]: () => json({ error: 'This invitation has expired.' }, 410),
    });
    renderRoutes(routes, `/invitations/${TOKEN}`);
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('This invitation has expired.');
    expect(alert).toHaveTextContent('Ask the studio admin for a new invitation');
  });
});

describe('password reset', () => {
  it('requests a link and answers the same whatever the address (202)', async () => {
    const { calls } = fakeApi({ 'POST /api/auth/password-reset': () => empty(202) });
    renderRoutes(routes, '/forgot-password');
    fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: 'Nobody@Lanternfish.example' } });
    fireEvent.click(screen.getByRole('button', { name: 'Send reset link' }));
    expect(await screen.findByText(/a link to set a new password is on its way/)).toBeInTheDocument();
    expect(calls.find((call) => call.method === 'POST')?.body).toEqual({
      email: 'nobody@lanternfish.example',
    });
  });

  it('sets the new password with the token from the address', async () => {
    const { calls } = fakeApi({ 'POST /api/auth/password-reset/confirm': () => empty(204) });
    renderRoutes(routes, `/reset-password?token=${TOKEN}`);
    fireEvent.change(screen.getByLabelText('New password'), { target: { value: 'a-new-long-secret' } });
    fireEvent.change(screen.getByLabelText('New password again'), {
      target: { value: 'a-new-long-secret-x' },
    });
    fireEvent.click(screen.getByRole('button', { name: 'Set password' }));
    expect(await screen.findByText('does not match the new password')).toBeInTheDocument();

    fireEvent.change(screen.getByLabelText('New password again'), { target: { value: 'a-new-long-secret' } });
    fireEvent.click(screen.getByRole('button', { name: 'Set password' }));
    await waitFor(() => expect(screen.getByRole('status')).toHaveTextContent('Your password is changed.'));
    expect(calls.find((call) => call.method === 'POST')?.body).toEqual({
      token: TOKEN,
      password: 'a-new-long-secret',
    });
  });

  it('shows the server error for a used or expired token (400)', async () => {
    fakeApi({
      'POST /api/auth/password-reset/confirm': () =>
        json({ error: 'This reset link is not valid any more.' }, 400),
    });
    renderRoutes(routes, `/reset-password?token=${TOKEN}`);
    fireEvent.change(screen.getByLabelText('New password'), { target: { value: 'a-new-long-secret' } });
    fireEvent.change(screen.getByLabelText('New password again'), { target: { value: 'a-new-long-secret' } });
    fireEvent.click(screen.getByRole('button', { name: 'Set password' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('This reset link is not valid any more.');
  });

  it('says what is missing when the page is opened without a token', async () => {
    fakeApi({});
    renderRoutes(routes, '/reset-password');
    expect(await screen.findByRole('alert')).toHaveTextContent(
      'This page needs the token from the reset link',
    );
  });
});
