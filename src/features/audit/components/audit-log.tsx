import type { AuditEvent } from '../../../../shared/schemas/api';
import { Link } from 'react-router-dom';
import { appPaths } from '../../../../shared/app-paths';
import { Button } from '../../../components/ui/button';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatDateTime } from '../../../lib/format';
import { useAuditEvents } from '../api/get-audit-events';

/** The page an event is about, where the app has one (releases, invitations: none yet). */
function linkPath(studioId: string, link: AuditEvent['link']): string | null {
  if (!link) return null;
  switch (link.kind) {
    case 'run':
      return appPaths.run(studioId, link.id);
    case 'track':
      return appPaths.track(studioId, link.id);
    case 'venue':
      return `/s/${studioId}/venues/${link.id}`;
    case 'member':
      return `/s/${studioId}/members`;
    case 'profile':
      return `/s/${studioId}/profiles`;
    default:
      return null;
  }
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
            <Th>What happened</Th>
          </tr>
        </thead>
        <tbody>
          {events.map((event) => (
            <tr key={event.id}>
              <Td className="text-xs whitespace-nowrap text-ink-600">{formatDateTime(event.at)}</Td>
              <Td className="text-xs">{event.actorEmail ?? 'Legwork'}</Td>
              <Td className="text-sm">
                {(() => {
                  const to = linkPath(studioId, event.link);
                  return to ? (
                    <Link to={to} className="text-tealdeep-700 underline-offset-2 hover:underline">
                      {event.words}
                    </Link>
                  ) : (
                    event.words
                  );
                })()}
              </Td>
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
        <a
          href={`/api/studios/${studioId}/audit.csv`}
          download
          className="ml-auto text-xs text-tealdeep-700 underline-offset-2 hover:underline"
        >
          Export as CSV
        </a>
      </div>
    </div>
  );
}
