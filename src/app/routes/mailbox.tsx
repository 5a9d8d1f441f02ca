import { Link, useSearchParams } from 'react-router-dom';
import { PublicLayout } from '../../components/layout/public-layout';
import { Empty, ErrorNotice, Loading } from '../../components/ui/status';
import { useMailbox } from '../../features/mailbox/api/get-mailbox';
import { MailList } from '../../features/mailbox/components/mail-list';
import { MailView } from '../../features/mailbox/components/mail-view';

// New mail (an invitation, a reset link) should appear without reloading the page.
const MAILBOX_POLL_MS = 4000;

export function MailboxRoute() {
  const mailbox = useMailbox({ refetchInterval_ms: MAILBOX_POLL_MS });
  const [params, setParams] = useSearchParams();
  const selectedId = params.get('id');

  let body;
  if (mailbox.isPending) body = <Loading what="Loading the mailbox" />;
  else if (mailbox.isError) body = <ErrorNotice error={mailbox.error} retry={() => void mailbox.refetch()} />;
  else if (!mailbox.data.enabled)
    body = (
      <Empty>
        The local mailbox is off: this install sends mail through its configured mail server, so look in the
        real inbox.
      </Empty>
    );
  else if (mailbox.data.messages.length === 0)
    body = (
      <Empty>
        No mail captured yet. Invitations, password resets and the mails about runs and releases sent by this
        install appear here.
      </Empty>
    );
  else
    body = (
      <div className="grid grid-cols-1 items-start gap-4 md:grid-cols-[20rem_1fr]">
        <MailList
          messages={mailbox.data.messages}
          selectedId={selectedId}
          onSelect={(id) => setParams({ id }, { replace: true })}
        />
        {selectedId ? <MailView id={selectedId} /> : <Empty>Choose a mail to read it.</Empty>}
      </div>
    );

  return (
    <PublicLayout title="Local mailbox" wide>
      <p className="text-sm text-ink-600">
        Mail captured by this local install instead of being delivered.{' '}
        <Link to="/sign-in" className="text-tealdeep-600 underline">
          Sign in
        </Link>
      </p>
      {body}
    </PublicLayout>
  );
}
