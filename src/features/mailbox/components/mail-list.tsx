import type { MailMessage } from '../../../../shared/schemas/api';
import { formatDateTime } from '../../../lib/format';

/** Captured mails, newest first, as a list of selectable rows (to, subject, time). */
export function MailList({
  messages,
  selectedId,
  onSelect,
}: {
  messages: readonly MailMessage[];
  selectedId: string | null;
  onSelect: (id: string) => void;
}) {
  const sorted = [...messages].sort((a, b) => b.at.localeCompare(a.at));
  return (
    <ul
      aria-label="Captured mail"
      className="flex flex-col divide-y divide-ink-100 rounded border border-ink-200 bg-white"
    >
      {sorted.map((message) => {
        const selected = message.id === selectedId;
        return (
          <li key={message.id}>
            <button
              type="button"
              aria-current={selected || undefined}
              onClick={() => onSelect(message.id)}
              className={`flex w-full flex-col gap-0.5 px-3 py-2 text-left ${selected ? 'bg-tealdeep-600 text-white' : 'hover:bg-ink-50'}`}
            >
              <span className="truncate text-sm font-medium">{message.subject || '(no subject)'}</span>
              <span className={`truncate font-mono text-xs ${selected ? 'text-ink-100' : 'text-ink-600'}`}>
                {message.to.join(', ')}
              </span>
              <span className={`text-xs ${selected ? 'text-ink-100' : 'text-ink-400'}`}>
                {formatDateTime(message.at)}
              </span>
            </button>
          </li>
        );
      })}
    </ul>
  );
}
