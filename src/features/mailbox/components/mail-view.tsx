import { ErrorNotice, Loading } from '../../../components/ui/status';
import { formatDateTime } from '../../../lib/format';
import { useMailMessage } from '../api/get-mail-message';
import { linkify } from '../utils/linkify';

/** One captured mail's headers and plain text, with its links made clickable. */
export function MailView({ id }: { id: string }) {
  const mail = useMailMessage(id);
  if (mail.isPending) return <Loading what="Opening the mail" />;
  if (mail.isError) return <ErrorNotice error={mail.error} retry={() => void mail.refetch()} />;
  const message = mail.data;
  return (
    <article
      aria-label={message.subject}
      className="flex flex-col gap-3 rounded border border-ink-200 bg-white p-4"
    >
      <header className="flex flex-col gap-0.5 border-b border-ink-100 pb-2">
        <h2 className="text-base font-semibold text-ink-900">{message.subject || '(no subject)'}</h2>
        <p className="text-xs text-ink-600">
          From <span className="font-mono">{message.from}</span> to{' '}
          <span className="font-mono">{message.to.join(', ')}</span> · {formatDateTime(message.at)}
        </p>
      </header>
      <div className="font-mono text-xs leading-relaxed break-words whitespace-pre-wrap text-ink-900">
        {linkify(message.text).map((part, index) =>
          part.kind === 'link' ? (
            <a key={index} href={part.href} className="text-tealdeep-600 underline">
              {part.href}
            </a>
          ) : (
            <span key={index}>{part.text}</span>
          ),
        )}
      </div>
    </article>
  );
}
