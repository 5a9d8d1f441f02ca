// The optional touch-up of a run request: text fields, turned into a touch-up and checked with the
// shared schema (the server checks it again, and against the take's axes).
import type { Take } from '../../../../shared/schemas/pipeline';
import { touchupAxesOf } from '../../../../shared/motion/touchup';
import { touchupSchema } from '../../../../shared/schemas/touchup';
import type { Touchup, TouchupAxis } from '../../../../shared/schemas/touchup';

export interface TouchupDraft {
  offset_s: string;
  trimIn_s: string;
  trimOut_s: string;
  fadeIn_s: string;
  fadeOut_s: string;
  gain: Partial<Record<TouchupAxis, string>>;
  smoothing_hz: Partial<Record<TouchupAxis, string>>;
}

export const EMPTY_TOUCHUP: TouchupDraft = {
  offset_s: '',
  trimIn_s: '',
  trimOut_s: '',
  fadeIn_s: '',
  fadeOut_s: '',
  gain: {},
  smoothing_hz: {},
};

const filled = (v: string | undefined): v is string => v !== undefined && v.trim() !== '';

/**
 * The touch-up a draft describes: undefined when every field is empty, the parsed touch-up, or the
 * problems by field path (e.g. "gain.fx", "trimOut_s").
 */
export function touchupOfDraft(d: TouchupDraft): {
  touchup: Touchup | undefined;
  problems: Record<string, string>;
} {
  const raw: Record<string, unknown> = {};
  for (const key of ['offset_s', 'trimIn_s', 'trimOut_s', 'fadeIn_s', 'fadeOut_s'] as const) {
    if (filled(d[key])) raw[key] = Number(d[key]);
  }
  for (const setting of ['gain', 'smoothing_hz'] as const) {
    const entries = Object.entries(d[setting]).filter(([, v]) => filled(v));
    if (entries.length) raw[setting] = Object.fromEntries(entries.map(([k, v]) => [k, Number(v)]));
  }
  if (Object.keys(raw).length === 0) return { touchup: undefined, problems: {} };
  const r = touchupSchema.safeParse(raw);
  if (r.success) return { touchup: r.data, problems: {} };
  const problems: Record<string, string> = {};
  for (const issue of r.error.issues) problems[issue.path.join('.')] ??= issue.message;
  return { touchup: undefined, problems };
}

function Field({
  label,
  value,
  onChange,
  error,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  error: string | undefined;
}) {
  return (
    <label className="flex flex-col gap-0.5 text-xs text-ink-600">
      {label}
      <input
        value={value}
        inputMode="decimal"
        onChange={(event) => onChange(event.target.value)}
        aria-invalid={error ? true : undefined}
        title={error}
        className={`w-20 rounded border bg-white px-1.5 py-0.5 font-mono text-xs text-ink-900 ${error ? 'border-stop-500' : 'border-ink-200'}`}
      />
    </label>
  );
}

/** Offset, trim, fades and, per axis of the take, gain and smoothing; empty fields change nothing. */
export function TouchupFields({
  take,
  draft,
  onChange,
  problems,
}: {
  take: Take;
  draft: TouchupDraft;
  onChange: (next: TouchupDraft) => void;
  problems: Record<string, string>;
}) {
  const axes = touchupAxesOf(take.kind, take.layout);
  const set = (key: keyof Omit<TouchupDraft, 'gain' | 'smoothing_hz'>) => (v: string) =>
    onChange({ ...draft, [key]: v });
  const setAxis = (setting: 'gain' | 'smoothing_hz', axis: TouchupAxis) => (v: string) =>
    onChange({ ...draft, [setting]: { ...draft[setting], [axis]: v } });
  const listed = Object.entries(problems);
  return (
    <fieldset className="flex flex-col gap-2 rounded border border-ink-200 p-2">
      <legend className="px-1 text-xs font-medium text-ink-600">Touch-up for these runs (optional)</legend>
      <div className="flex flex-wrap gap-2">
        <Field
          label="Offset (s)"
          value={draft.offset_s}
          onChange={set('offset_s')}
          error={problems.offset_s}
        />
        <Field
          label="Trim in (s)"
          value={draft.trimIn_s}
          onChange={set('trimIn_s')}
          error={problems.trimIn_s}
        />
        <Field
          label="Trim out (s)"
          value={draft.trimOut_s}
          onChange={set('trimOut_s')}
          error={problems.trimOut_s}
        />
        {take.kind !== 'legs' ? (
          <>
            <Field
              label="Fade in (s)"
              value={draft.fadeIn_s}
              onChange={set('fadeIn_s')}
              error={problems.fadeIn_s}
            />
            <Field
              label="Fade out (s)"
              value={draft.fadeOut_s}
              onChange={set('fadeOut_s')}
              error={problems.fadeOut_s}
            />
          </>
        ) : null}
      </div>
      {axes.length > 0 ? (
        <div className="flex flex-wrap gap-3">
          {axes.map((axis) => (
            <div key={axis} className="flex gap-1">
              <Field
                label={`${axis} gain`}
                value={draft.gain[axis] ?? ''}
                onChange={setAxis('gain', axis)}
                error={problems[`gain.${axis}`]}
              />
              <Field
                label={`${axis} smoothing (Hz)`}
                value={draft.smoothing_hz[axis] ?? ''}
                onChange={setAxis('smoothing_hz', axis)}
                error={problems[`smoothing_hz.${axis}`]}
              />
            </div>
          ))}
        </div>
      ) : (
        <p className="text-xs text-ink-400">A leg-length take takes only the offset and the trim.</p>
      )}
      {listed.length > 0 ? (
        <ul className="text-xs text-stop-700">
          {listed.map(([path, message]) => (
            <li key={path}>
              {path}: {message}
            </li>
          ))}
        </ul>
      ) : null}
      <p className="text-xs text-ink-400">
        Applied in this order: offset, trim, gain (on the departure from rest), smoothing, fades. The runs
        record it; each run shows the take before and after it.
      </p>
    </fieldset>
  );
}
