// @vitest-environment jsdom
// Sign-in against the API contract's /api/auth endpoints (shared/schemas/api.ts and the contract's
// error shape `{ error, issues? }`).
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { DEMO_PASSWORD, DEMO_USERS } from '../../../shared/demo';
import type { Me } from '../../../shared/schemas/api';
import { SignInForm } from '../../../src/features/auth/components/sign-in-form';
import { empty, fakeApi, json, renderWithApp } from './harness';

const ME: Me = {
  user: {
    id: '6f1d0d5e-1d7e-4c1b-9a56-0a4a7d5c2b11',
    email: 'pia.producer@lanternfish.example',
    name: 'Pia Okafor',
  },
  memberships: [],
};

function fillAndSubmit(email: string, password: string) {
  fireEvent.change(screen.getByLabelText('E-mail'), { target: { value: email } });
  fireEvent.change(screen.getByLabelText('Password'), { target: { value: password } });
  fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
}

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('sign-in form', () => {
  it("shows the server's own error text when the password is wrong", async () => {
    fakeApi({ 'POST /api/auth/login': () => json({ error: 'Wrong e-mail or password.' }, 401) });
    renderWithApp(<SignInForm showDemo={false} onSignedIn={() => undefined} />);
    fillAndSubmit('pia.producer@lanternfish.example', 'not-the-password');
    // API contract: 401 { error: 'Wrong e-mail or password.' } is shown as the server wrote it.
    expect(await screen.findByRole('alert')).toHaveTextContent('Wrong e-mail or password.');
  });

  it('sends the CSRF token it fetched, with same-origin credentials, and fetches a new one after sign-in', async () => {
    const { calls, csrfIssued } = fakeApi({ 'POST /api/auth/login': () => json(ME) });
    const onSignedIn = vi.fn();
    renderWithApp(<SignInForm showDemo={false} onSignedIn={onSignedIn} />);
    fillAndSubmit('  pia.producer@lanternfish.example ', DEMO_PASSWORD);
    await waitFor(() => expect(onSignedIn).toHaveBeenCalled());
    expect(onSignedIn.mock.calls[0]?.[0]).toEqual(ME);

    const login = calls.find((call) => call.path === '/api/auth/login');
    // API contract: the token from GET /api/auth/csrf goes in x-csrf-token on every POST.
    expect(login?.headers['x-csrf-token']).toBe(csrfIssued[0]);
    expect(login?.credentials).toBe('same-origin');
    expect(login?.body).toEqual({ email: 'pia.producer@lanternfish.example', password: DEMO_PASSWORD });
    // API contract: the session changes at sign-in, so the token is fetched again afterwards.
    const csrfCalls = calls.filter((call) => call.path === '/api/auth/csrf');
    expect(csrfIssued).toHaveLength(2);
    expect(calls.indexOf(csrfCalls[1]!)).toBeGreaterThan(calls.indexOf(login!));
  });

  it('says to wait when the server rate-limits with a plain-text answer', async () => {
    fakeApi({
      'POST /api/auth/login': () =>
        new Response('Too many requests', { status: 429, statusText: 'Too Many Requests' }),
    });
    renderWithApp(<SignInForm showDemo={false} onSignedIn={() => undefined} />);
    fillAndSubmit('pia.producer@lanternfish.example', 'x');
    // RFC 6585 section 4: 429 means too many requests in a given time; the person is told to wait.
    expect(await screen.findByRole('alert')).toHaveTextContent(/Wait a few minutes/);
  });

  it('lists the demo sign-ins only on a local demo, and "Use" fills the form', async () => {
    fakeApi({ 'POST /api/auth/logout': () => empty() });
    const { unmount } = renderWithApp(<SignInForm showDemo={false} onSignedIn={() => undefined} />);
    expect(screen.queryByRole('complementary', { name: 'Demo sign-ins' })).toBeNull();
    unmount();

    renderWithApp(<SignInForm showDemo onSignedIn={() => undefined} />);
    const panel = await screen.findByRole('complementary', { name: 'Demo sign-ins' });
    for (const user of DEMO_USERS) expect(panel).toHaveTextContent(user.email);
    const operator = DEMO_USERS.find((user) => user.roles.includes('venue_operator'))!;
    fireEvent.click(screen.getByRole('button', { name: `Use ${operator.email}` }));
    expect(screen.getByLabelText('E-mail')).toHaveValue(operator.email);
    expect(screen.getByLabelText('Password')).toHaveValue(DEMO_PASSWORD);
  });
});
