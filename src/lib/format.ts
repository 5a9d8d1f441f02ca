import { CHECK_LABELS, subjectLabel } from '../../shared/labels';

// Formatting for people. Times are shown in the browser's own time zone with the zone named, or,
// where a venue is the subject, in the venue's time zone with its name (IANA id) beside it.

const dateTime = new Intl.DateTimeFormat('en-GB', {
  year: 'numeric',
  month: 'short',
  day: '2-digit',
  hour: '2-digit',
  minute: '2-digit',
  timeZoneName: 'short',
});

/** An ISO 8601 instant as a short local date and time; text that is not a date is shown as it came. */
export function formatDateTime(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : dateTime.format(date);
}

/** An ISO 8601 instant as the venue's local date and time, labelled with the venue's zone. */
export function formatVenueTime(iso: string, timeZone: string | undefined): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  if (!timeZone) return dateTime.format(date);
  try {
    const local = new Intl.DateTimeFormat('en-GB', {
      year: 'numeric',
      month: 'short',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      timeZone,
    }).format(date);
    return `${local} ${timeZone}`;
  } catch {
    // A zone this browser does not know: the browser's own time, with its zone named.
    return dateTime.format(date);
  }
}

/** A check key, or "check subject" as run summaries carry it ("stroke leg4"), in people words. */
export function checkLabel(check: string): string {
  const [key = '', subject] = check.split(' ');
  const label = (CHECK_LABELS as Record<string, string>)[key] ?? key;
  return subject ? `${label}, ${subjectLabel(subject)}` : label;
}

/** A rate in hertz with its unit, e.g. "100 Hz". */
export function formatRate_hz(rate_hz: number): string {
  return Number.isFinite(rate_hz) ? `${Number(rate_hz.toFixed(1))} Hz` : '—';
}
