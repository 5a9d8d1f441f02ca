// @vitest-environment jsdom
// The audit log's paging and the local mailbox against the API contract:
// GET /api/studios/:id/audit?before=<id>&limit=50 -> { events, nextBefore } and GET /api/dev/mailbox[/:id].
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { AuditEvent, MailMessage } from '../../../shared/schemas/api';
import { MailboxRoute } from '../../../src/app/routes/mailbox';
import { AuditLog } from '../../../src/features/audit/components/audit-log';
import { fakeApi, json, renderWithApp } from './harness';

const STUDIO = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';

function event(id: number): AuditEvent {
  return {
    id,
    at: `2026-03-01T10:${String(id % 60).padStart(2, '0')}:00.000Z`,
    actorEmail: 'ada.admin@lanternfish.example',
    action: `test.action_${id}`,
    kind: 'membership',
    words: `ada.admin@lanternfish.example: test action ${id}`,
    link: null,
    subjectType: 'member',
    subjectId: null,
    detail: { roles: ['producer'] },
  };
}

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('audit log', () => {
  it('asks for older events with before=<nextBefore> and limit=50, and appends them below', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/audit`]: (call) => {
        const before = new URLSearchParams(call.search).get('before');
        return before === null
          ? json({ events: [event(60), event(59)], nextBefore: 59 })
          : json({ events: [event(58)], nextBefore: null });
      },
    });
    renderWithApp(<AuditLog studioId={STUDIO} />);
    const table = await screen.findByRole('table', { name: 'Audit events, newest first' });
    expect(within(table).getAllByRole('row')).toHaveLength(3);

    fireEvent.click(screen.getByRole('button', { name: 'Older' }));
    expect(
      await within(table).findByText('ada.admin@lanternfish.example: test action 58'),
    ).toBeInTheDocument();
    const actions = within(table)
      .getAllByRole('row')
      .slice(1)
      .map((row) => row.children[2]?.textContent);
    // The events read in plain words; the action codes stay in the API and the CSV.
    expect(actions).toEqual([60, 59, 58].map((id) => `ada.admin@lanternfish.example: test action ${id}`));
    expect(within(table).queryByText('test.action_58')).toBeNull();

    const queries = calls.filter((call) => call.path.endsWith('/audit')).map((call) => call.search);
    // API contract: the first page has no `before`; the next one passes the server's nextBefore.
    expect(queries).toEqual(['?limit=50', '?before=59&limit=50']);
    // nextBefore null marks the start of the log.
    expect(screen.queryByRole('button', { name: 'Older' })).toBeNull();
    expect(screen.getByText('Start of the log.')).toBeInTheDocument();
  });
});

describe('local mailbox', () => {
  const mail: MailMessage = {
    id: 'm-1',
    at: '2026-03-01T10:00:00.000Z',
    from: 'Legwork <no-reply@legwork.local>',
    to: ['new.person@lanternfish.example'],
    subject: 'Legwork: you are invited to Lanternfish Studios',
    text: 'Accept within seven days:\nhttp://127.0.0.1:5480/invitations/tok123\n',
  };

  it('lists captured mail and shows the chosen one with its link as an anchor', async () => {
    fakeApi({
      'GET /api/dev/mailbox': () => json({ enabled: true, messages: [mail] }),
      'GET /api/dev/mailbox/m-1': () => json({ ...mail, html: '<p>ignored</p>' }),
    });
    renderWithApp(<MailboxRoute />, '/mailbox');
    const list = await screen.findByRole('list', { name: 'Captured mail' });
    fireEvent.click(within(list).getByRole('button', { name: /you are invited/ }));
    const article = await screen.findByRole('article', { name: mail.subject });
    const link = within(article).getByRole('link', { name: 'http://127.0.0.1:5480/invitations/tok123' });
    expect(link).toHaveAttribute('href', 'http://127.0.0.1:5480/invitations/tok123');
    // The HTML part is never rendered (only the text), so no mail markup runs inside the app.
    expect(within(article).queryByText('ignored')).toBeNull();
  });

  it('says the mailbox is off when the server has no local mail fake (404)', async () => {
    fakeApi({ 'GET /api/dev/mailbox': () => json({ error: 'Not found.' }, 404) });
    renderWithApp(<MailboxRoute />, '/mailbox');
    expect(await screen.findByText(/The local mailbox is off/)).toBeInTheDocument();
  });
});
