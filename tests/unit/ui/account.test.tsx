// @vitest-environment jsdom
// The account page against the API contract (GET/PUT /api/me/notifications): one labelled switch per
// kind of mail with who receives it, a change sent at once with the CSRF header and shown as stored,
// a refused change shown with the server's message and the switch left as it was; reachable from the
// studio shell's user menu. Switches follow the WAI-ARIA switch pattern (role "switch", aria-checked).
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Me } from '../../../shared/schemas/api';
import { MAIL_KINDS, MAIL_KIND_LABELS } from '../../../shared/schemas/notifications';
import type { NotificationSettings } from '../../../shared/schemas/notifications';
import { AccountRoute } from '../../../src/app/routes/account';
import { StudioLayout } from '../../../src/app/routes/studio-layout';
import { FAKE_IDS, fakeApi, json, renderRoutes } from './harness';

const ME: Me = {
  user: {
    id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
    email: 'eli.engineer@lanternfish.example',
    name: 'Eli Varga',
  },
  memberships: [
    {
      studioId: FAKE_IDS.studio,
      studioName: 'Lanternfish Studios',
      studioSlug: 'lanternfish',
      roles: ['motion_engineer'],
      venueIds: [],
    },
  ],
};

const allOn = (): NotificationSettings => ({ kinds: MAIL_KINDS.map((kind) => ({ kind, enabled: true })) });

const routes = [
  { path: '/account', element: <AccountRoute /> },
  { path: '/sign-in', element: <p>Sign-in page</p> },
  {
    path: '/s/:studioId',
    element: <StudioLayout />,
    children: [{ index: true, element: <p>Studio home</p> }],
  },
];

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('account page', () => {
  it('shows one labelled switch per kind of mail, with who receives it', async () => {
    fakeApi({ 'GET /api/auth/me': () => json(ME), 'GET /api/me/notifications': () => json(allOn()) });
    renderRoutes(routes, '/account');
    const panel = await screen.findByTestId('mail-settings');
    const switches = await within(panel).findAllByRole('switch');
    expect(switches).toHaveLength(MAIL_KINDS.length);
    for (const kind of MAIL_KINDS) {
      const s = within(panel).getByRole('switch', { name: MAIL_KIND_LABELS[kind].label });
      expect(s).toHaveAttribute('aria-checked', 'true');
      expect(s).toHaveAccessibleDescription(`Sent to ${MAIL_KIND_LABELS[kind].who}`);
    }
    expect(screen.getByText('Eli Varga')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Lanternfish Studios' })).toHaveAttribute(
      'href',
      `/s/${FAKE_IDS.studio}`,
    );
  });

  it('sends a change at once with the CSRF header and shows the stored setting', async () => {
    let stored = allOn();
    const api = fakeApi({
      'GET /api/auth/me': () => json(ME),
      'GET /api/me/notifications': () => json(stored),
      'PUT /api/me/notifications': (call) => {
        const body = call.body as NotificationSettings;
        stored = {
          kinds: stored.kinds.map((k) => body.kinds.find((b) => b.kind === k.kind) ?? k),
        };
        return json(stored);
      },
    });
    renderRoutes(routes, '/account');
    const held = await screen.findByRole('switch', { name: MAIL_KIND_LABELS.run_held.label });
    fireEvent.click(held);
    await waitFor(() => expect(held).toHaveAttribute('aria-checked', 'false'));
    const put = api.calls.find((c) => c.method === 'PUT');
    expect(put?.path).toBe('/api/me/notifications');
    expect(put?.body).toEqual({ kinds: [{ kind: 'run_held', enabled: false }] });
    expect(put?.headers['x-csrf-token']).toMatch(/^token-/);
    // The others are untouched.
    expect(screen.getByRole('switch', { name: MAIL_KIND_LABELS.release_ready.label })).toHaveAttribute(
      'aria-checked',
      'true',
    );
  });

  it('shows a refused change with the server message and leaves the switch as it was', async () => {
    fakeApi({
      'GET /api/auth/me': () => json(ME),
      'GET /api/me/notifications': () => json(allOn()),
      'PUT /api/me/notifications': () =>
        json({ error: 'The notification settings has a problem: kinds.0.kind: invalid', issues: [] }, 400),
    });
    renderRoutes(routes, '/account');
    const ready = await screen.findByRole('switch', { name: MAIL_KIND_LABELS.release_ready.label });
    fireEvent.click(ready);
    expect(await screen.findByText(/kinds\.0\.kind: invalid/)).toBeInTheDocument();
    expect(ready).toHaveAttribute('aria-checked', 'true');
  });

  it('sends a signed-out visitor to sign in', async () => {
    fakeApi({ 'GET /api/auth/me': () => json({ error: 'Sign in first.' }, 401) });
    const { router } = renderRoutes(routes, '/account');
    expect(await screen.findByText('Sign-in page')).toBeInTheDocument();
    expect(router.state.location.search).toBe('?next=%2Faccount');
  });

  it('is reachable from the user menu of the studio shell', async () => {
    fakeApi({ 'GET /api/auth/me': () => json(ME), 'GET /api/me/notifications': () => json(allOn()) });
    const { router } = renderRoutes(routes, `/s/${FAKE_IDS.studio}`);
    const link = await screen.findByRole('link', { name: 'Account' });
    fireEvent.click(link);
    await waitFor(() => expect(router.state.location.pathname).toBe('/account'));
    expect(await screen.findByTestId('mail-settings')).toBeInTheDocument();
  });
});
