import type { Touchup } from '../../../../shared/schemas/touchup';

const fmt = (v: number) => String(Number(v.toPrecision(6)));

/** The touch-up's settings in words, in the order they are applied (offset, trim, gain, smoothing, fades). */
export function touchupLines(t: Touchup): string[] {
  const lines: string[] = [];
  if (t.offset_s !== 0)
    lines.push(`Offset ${t.offset_s > 0 ? '+' : ''}${fmt(t.offset_s)} s (positive plays later)`);
  if (t.trimIn_s !== undefined || t.trimOut_s !== undefined) {
    lines.push(
      `Trim: kept from ${t.trimIn_s === undefined ? 'the start' : `${fmt(t.trimIn_s)} s`} to ${t.trimOut_s === undefined ? 'the end' : `${fmt(t.trimOut_s)} s`}`,
    );
  }
  const gains = Object.entries(t.gain).filter(([, g]) => g !== 1);
  if (gains.length) lines.push(`Gain: ${gains.map(([axis, g]) => `${axis} × ${fmt(g)}`).join(', ')}`);
  const smooth = Object.entries(t.smoothing_hz);
  if (smooth.length) {
    lines.push(
      `Smoothing (zero-phase low-pass): ${smooth.map(([axis, f]) => `${axis} ${fmt(f)} Hz`).join(', ')}`,
    );
  }
  if (t.fadeIn_s > 0) lines.push(`Fade in over ${fmt(t.fadeIn_s)} s`);
  if (t.fadeOut_s > 0) lines.push(`Fade out over ${fmt(t.fadeOut_s)} s`);
  return lines;
}

/** What the run changed in the take before cueing, recorded in the run's parameters. */
export function TouchupSummary({ touchup }: { touchup: Touchup }) {
  return (
    <div className="flex flex-col gap-1 text-sm text-ink-800" aria-label="Touch-up">
      <p>
        The take was touched up before cueing, for this run only; the charts show each column as uploaded and
        after the touch-up.
      </p>
      <ul className="list-disc pl-5">
        {touchupLines(touchup).map((line) => (
          <li key={line}>{line}</li>
        ))}
      </ul>
    </div>
  );
}
