import type { AuditEvent } from '../../../../shared/schemas/api';
import { Button } from '../../../components/ui/button';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatDateTime } from '../../../lib/format';
import { useAuditEvents } from '../api/get-audit-events';

function detailText(detail: AuditEvent['detail']): string {
  const entries = Object.entries(detail);
  if (entries.length === 0) return '';
  return entries
    .map(([key, value]) => `${key}: ${typeof value === 'string' ? value : JSON.stringify(value)}`)
    .join(' · ');
}

/** The studio's audit events, newest first, fifty at a time with an "Older" button. */
export function AuditLog({ studioId }: { studioId: string }) {
  const audit = useAuditEvents(studioId);

  if (audit.isPending) return <Loading what="Loading the audit log" />;
  // A failed "Older" page also sets the error state; keep the pages already shown in that case.
  if (!audit.data) return <ErrorNotice error={audit.error} retry={() => void audit.refetch()} />;
  const events = audit.data.pages.flatMap((page) => page.events);
  if (events.length === 0) return <Empty>Nothing recorded yet.</Empty>;

  return (
    <div className="flex flex-col gap-3">
      <Table caption="Audit events, newest first">
        <thead>
          <tr>
            <Th>When</Th>
            <Th>Who</Th>
            <Th>Action</Th>
            <Th>Subject</Th>
            <Th>Detail</Th>
          </tr>
        </thead>
        <tbody>
          {events.map((event) => (
            <tr key={event.id}>
              <Td className="text-xs whitespace-nowrap text-ink-600">{formatDateTime(event.at)}</Td>
              <Td className="font-mono text-xs">{event.actorEmail ?? 'system'}</Td>
              <Td className="font-mono text-xs font-medium">{event.action}</Td>
              <Td className="text-xs">
                {event.subjectType}
                {event.subjectId ? (
                  // The first eight characters tell rows apart; the whole id is one hover away.
                  <span title={event.subjectId} className="ml-1 font-mono text-ink-400">
                    {event.subjectId.slice(0, 8)}
                  </span>
                ) : null}
              </Td>
              <Td className="text-xs break-all text-ink-600">{detailText(event.detail)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      {audit.isError ? <ErrorNotice error={audit.error} /> : null}
      <div className="flex items-center gap-3">
        {audit.hasNextPage ? (
          <Button onClick={() => void audit.fetchNextPage()} busy={audit.isFetchingNextPage}>
            Older
          </Button>
        ) : (
          <span className="text-xs text-ink-400">Start of the log.</span>
        )}
        <span className="text-xs text-ink-400">{events.length} events shown</span>
      </div>
    </div>
  );
}
