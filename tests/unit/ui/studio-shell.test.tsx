// @vitest-environment jsdom
// The signed-in shell against the API contract: GET /api/auth/me lists memberships, the switcher
// navigates to /s/:studioId, a 401 sends the person to sign-in, and every screen carries the caution.
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Me } from '../../../shared/schemas/api';
import { RootRedirect, StudioLayout, useStudioContext } from '../../../src/app/routes/studio-layout';
import { empty, fakeApi, json, renderRoutes } from './harness';

const LANTERNFISH = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';
const QUARRY = 'b4d2f8c3-6e5a-4f9b-8c7d-2e3f4a5b6c7d';

const ME: Me = {
  user: {
    id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
    email: 'ada.admin@lanternfish.example',
    name: 'Ada Moreau',
  },
  memberships: [
    {
      studioId: QUARRY,
      studioName: 'Quarry Hill Pictures',
      studioSlug: 'quarry-hill',
      roles: ['producer'],
      venueIds: [],
    },
    {
      studioId: LANTERNFISH,
      studioName: 'Lanternfish Studios',
      studioSlug: 'lanternfish',
      roles: ['studio_admin'],
      venueIds: [],
    },
  ],
};

function StudioProbe() {
  const { membership } = useStudioContext();
  return <p>Inside {membership.studioName}</p>;
}

const routes = [
  { path: '/', element: <RootRedirect /> },
  { path: '/sign-in', element: <p>Sign-in page</p> },
  { path: '/s/:studioId', element: <StudioLayout />, children: [{ index: true, element: <StudioProbe /> }] },
];

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('studio shell', () => {
  it('lists every membership in the studio switcher, and switching navigates to that studio', async () => {
    fakeApi({ 'GET /api/auth/me': () => json(ME) });
    const { router } = renderRoutes(routes, `/s/${LANTERNFISH}`);
    expect(await screen.findByText('Inside Lanternfish Studios')).toBeInTheDocument();

    const switcher = screen.getByRole('combobox', { name: 'Studio' });
    const options = within(switcher)
      .getAllByRole('option')
      .map((option) => option.textContent);
    // API contract: one option per membership from GET /api/auth/me, sorted by name for people.
    expect(options).toEqual(['Lanternfish Studios', 'Quarry Hill Pictures']);
    expect(switcher).toHaveValue(LANTERNFISH);

    fireEvent.change(switcher, { target: { value: QUARRY } });
    expect(await screen.findByText('Inside Quarry Hill Pictures')).toBeInTheDocument();
    expect(router.state.location.pathname).toBe(`/s/${QUARRY}`);
  });

  it("shows the navigation of the member's roles only", async () => {
    fakeApi({ 'GET /api/auth/me': () => json(ME) });
    renderRoutes(routes, `/s/${QUARRY}`);
    const nav = await screen.findByRole('navigation', { name: 'Studio pages' });
    // Members and the audit log are a studio admin's; a producer does not see them, but works on
    // tracks, releases runs and may read the profiles the venues use.
    expect(
      within(nav)
        .getAllByRole('link')
        .map((link) => link.textContent),
    ).toEqual(['Home', 'Venues', 'Tracks', 'Releases', 'Profiles']);
  });

  it('gives a venue operator Releases in the navigation, and not the studio pages of other roles', async () => {
    const DOME = 'e7a5c1f6-9b8d-4c2e-8f0a-5b6c7d8e9f0a';
    const operator: Me = {
      user: { id: 'd6f4b0e5-8a7c-4b1d-8e9f-4a5b6c7d8e9f', email: 'otto@lanternfish.example', name: 'Otto' },
      memberships: [
        {
          studioId: LANTERNFISH,
          studioName: 'Lanternfish Studios',
          studioSlug: 'lanternfish',
          roles: ['venue_operator'],
          venueIds: [DOME],
        },
      ],
    };
    fakeApi({ 'GET /api/auth/me': () => json(operator) });
    renderRoutes(routes, `/s/${LANTERNFISH}`);
    const nav = await screen.findByRole('navigation', { name: 'Studio pages' });
    // shared/permissions.ts: releases.read is every role's; tracks, profiles, members are not an operator's.
    expect(
      within(nav)
        .getAllByRole('link')
        .map((link) => [link.textContent, link.getAttribute('href')]),
    ).toEqual([
      ['Home', `/s/${LANTERNFISH}`],
      ['Venues', `/s/${LANTERNFISH}/venues`],
      ['Releases', `/s/${LANTERNFISH}/releases`],
    ]);
  });

  it('sends a signed-out visitor to sign-in and remembers where they were going', async () => {
    fakeApi({ 'GET /api/auth/me': () => json({ error: 'Sign in first.' }, 401) });
    const { router } = renderRoutes(routes, `/s/${LANTERNFISH}`);
    expect(await screen.findByText('Sign-in page')).toBeInTheDocument();
    // API contract: a 401 from the API sends the router to sign-in.
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(new URLSearchParams(router.state.location.search).get('next')).toBe(`/s/${LANTERNFISH}`);
  });

  it('opens the first studio by name from /', async () => {
    fakeApi({ 'GET /api/auth/me': () => json(ME) });
    const { router } = renderRoutes(routes, '/');
    expect(await screen.findByText('Inside Lanternfish Studios')).toBeInTheDocument();
    expect(router.state.location.pathname).toBe(`/s/${LANTERNFISH}`);
  });

  it('says so when the studio in the address is not one of the memberships', async () => {
    fakeApi({ 'GET /api/auth/me': () => json(ME) });
    renderRoutes(routes, '/s/d6f4b0e5-8a7c-4b1d-8e9f-4a5b6c7d8e9f');
    expect(await screen.findByRole('alert')).toHaveTextContent('You are not a member of this studio');
  });

  it('carries the safety caution and signs out through POST /api/auth/logout with the CSRF header', async () => {
    const { calls, csrfIssued } = fakeApi({
      'GET /api/auth/me': () => json(ME),
      'POST /api/auth/logout': () => empty(204),
    });
    const { router } = renderRoutes(routes, `/s/${LANTERNFISH}`);
    await screen.findByText('Inside Lanternfish Studios');
    // Caution (docs/motion-conventions.md section 8): every screen says Legwork never replaces the people who answer for safety.
    expect(screen.getByRole('note', { name: 'Safety caution' })).toHaveTextContent(
      "Legwork supports the ride manufacturer's engineering, the applicable codes and a qualified person's sign-off; it never replaces them.",
    );

    fireEvent.click(screen.getByRole('button', { name: 'Sign out' }));
    expect(await screen.findByText('Sign-in page')).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    const logout = calls.find((call) => call.path === '/api/auth/logout');
    expect(logout?.headers['x-csrf-token']).toBe(csrfIssued[0]);
    // A new anonymous session needs its own token (API contract).
    await waitFor(() => expect(csrfIssued).toHaveLength(2));
  });
});
