// Formatting for people; times are shown in the browser's own time zone with the zone named.

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

/** A rate in hertz with its unit, e.g. "100 Hz". */
export function formatRate_hz(rate_hz: number): string {
  return Number.isFinite(rate_hz) ? `${Number(rate_hz.toFixed(1))} Hz` : '—';
}
