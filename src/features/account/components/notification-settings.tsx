import { useId } from 'react';
import { MAIL_KIND_LABELS } from '../../../../shared/schemas/notifications';
import type { MailKind } from '../../../../shared/schemas/notifications';
import { Section } from '../../../components/ui/section';
import { ErrorNotice, Loading } from '../../../components/ui/status';
import { useNotificationSettings } from '../api/get-notification-settings';
import { useUpdateNotificationSetting } from '../api/update-notification-settings';

function MailSwitch({
  kind,
  enabled,
  busy,
  onChange,
}: {
  kind: MailKind;
  enabled: boolean;
  busy: boolean;
  onChange: (enabled: boolean) => void;
}) {
  const id = useId();
  const { label, who } = MAIL_KIND_LABELS[kind];
  return (
    <li className="flex items-center justify-between gap-4 border-b border-ink-100 py-2 last:border-b-0">
      <div className="flex flex-col">
        <span id={`${id}-label`} className="text-sm text-ink-900">
          {label}
        </span>
        <span id={`${id}-who`} className="text-xs text-ink-600">
          Sent to {who}
        </span>
      </div>
      <button
        type="button"
        role="switch"
        aria-checked={enabled}
        aria-labelledby={`${id}-label`}
        aria-describedby={`${id}-who`}
        aria-busy={busy || undefined}
        disabled={busy}
        onClick={() => onChange(!enabled)}
        className={`inline-flex h-6 w-11 shrink-0 items-center rounded-full border transition-colors disabled:opacity-50 ${
          enabled ? 'border-tealdeep-700 bg-tealdeep-600' : 'border-ink-200 bg-ink-100'
        }`}
      >
        <span
          aria-hidden="true"
          className={`mx-0.5 h-4.5 w-4.5 rounded-full bg-white shadow transition-transform ${
            enabled ? 'translate-x-5' : 'translate-x-0'
          }`}
        />
        <span className="sr-only">{enabled ? 'On' : 'Off'}</span>
      </button>
    </li>
  );
}

/** One labelled switch per kind of mail, with who receives it; each change is saved at once. */
export function NotificationSettingsPanel() {
  const settings = useNotificationSettings();
  const update = useUpdateNotificationSetting();

  let body;
  if (settings.isPending) body = <Loading what="Loading your mail settings" />;
  else if (settings.isError)
    body = <ErrorNotice error={settings.error} retry={() => void settings.refetch()} />;
  else
    body = (
      <ul className="flex flex-col">
        {settings.data.kinds.map((k) => (
          <MailSwitch
            key={k.kind}
            kind={k.kind}
            enabled={k.enabled}
            busy={update.isPending && update.variables.kind === k.kind}
            onChange={(enabled) => update.mutate({ kind: k.kind, enabled })}
          />
        ))}
      </ul>
    );

  return (
    <Section title="E-mail" testId="mail-settings">
      <p className="text-sm text-ink-600">
        Mail about the work in your studios. A kind turned off is not sent to you; the work still waits on
        your home page. Mail only tells you what happened: every decision about motion stays with the ride
        engineer and the people who sign it off.
      </p>
      {update.isError ? <ErrorNotice error={update.error} /> : null}
      {body}
    </Section>
  );
}
