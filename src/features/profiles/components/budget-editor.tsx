// The budget editor for safety reviewers: the acceleration-duration envelope per axis as rows with a
// chart beside them, the comfort limits and the stroke margin as labelled fields with units, the
// start-and-end tolerances. Checked with the shared budget schema (shared/schemas/budget.ts) as the
// person types; problems stand beside their fields. Saving makes a new version, never an edit.
import { useId, useState } from 'react';
import type { FormEvent, ReactNode } from 'react';
import {
  DEFAULT_START_END_TOLERANCE,
  DEMO_BUDGET,
  ENVELOPE_AXES,
  REST_G,
  budgetSchema,
  formatJsonPath,
} from '../../../../shared/schemas/budget';
import type { Budget, EnvelopeAxis, EnvelopeRow } from '../../../../shared/schemas/budget';
import type { Profile } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { FieldError, TextField } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useCreateProfile } from '../api/create-profile';
import { useCreateProfileVersion } from '../api/create-profile-version';
import { EnvelopeChart } from './envelope-chart';

const COMFORT_FIELDS = [
  { key: 'jerkMax_mps3', label: 'Jerk limit', unit: 'm/s³' },
  { key: 'angularSpeedMax_radps', label: 'Angular speed limit', unit: 'rad/s' },
  { key: 'angularAccelMax_radps2', label: 'Angular acceleration limit', unit: 'rad/s²' },
  { key: 'msdvZMax_mps1_5', label: 'Motion sickness dose (vertical, ISO 2631-1 MSDVz)', unit: 'm/s^1.5' },
  { key: 'wrmsMax_mps2', label: 'Weighted r.m.s. acceleration (ISO 2631-1)', unit: 'm/s²' },
  { key: 'vdvMax_mps1_75', label: 'Vibration dose value (ISO 2631-1 VDV)', unit: 'm/s^1.75', optional: true },
  { key: 'conditioningMax', label: 'Jacobian condition number limit', unit: 'no unit', optional: true },
] as const;

const START_END_FIELDS = [
  { key: 'position_m', label: 'Position off neutral', unit: 'm' },
  { key: 'angle_rad', label: 'Angle off neutral', unit: 'rad' },
  { key: 'speed_mps', label: 'Speed', unit: 'm/s' },
  { key: 'angularSpeed_radps', label: 'Angular speed', unit: 'rad/s' },
] as const;

const AXIS_TITLES: Record<EnvelopeAxis, string> = {
  x: 'x (fore-aft)',
  y: 'y (lateral)',
  z: 'z (vertical)',
};

type ComfortKey = (typeof COMFORT_FIELDS)[number]['key'];
type StartEndKey = (typeof START_END_FIELDS)[number]['key'];

export interface BudgetDraft {
  name: string;
  version: string;
  source: string;
  strokeMargin_m: string;
  envelope: Record<EnvelopeAxis, string[][]>;
  comfort: Record<ComfortKey, string>;
  startEndOn: boolean;
  startEnd: Record<StartEndKey, string>;
}

const str = (v: unknown): string => (typeof v === 'number' ? String(v) : typeof v === 'string' ? v : '');
const obj = (v: unknown): Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v) ? (v as Record<string, unknown>) : {};

/** A draft of any stored or starter budget; what cannot be read becomes an empty field. */
export function budgetDraft(params: unknown): BudgetDraft {
  const b = obj(params);
  const env = obj(b.envelope);
  const comfort = obj(b.comfort);
  const startEnd = b.startEnd === undefined ? null : obj(b.startEnd);
  const rowsOf = (v: unknown) =>
    Array.isArray(v)
      ? v.map((r) => [0, 1, 2].map((k) => str(Array.isArray(r) ? (r as unknown[])[k] : undefined)))
      : [];
  return {
    name: str(b.name),
    version: str(b.version),
    source: str(b.source),
    strokeMargin_m: str(b.strokeMargin_m),
    envelope: { x: rowsOf(env.x), y: rowsOf(env.y), z: rowsOf(env.z) },
    comfort: Object.fromEntries(COMFORT_FIELDS.map((f) => [f.key, str(comfort[f.key])])) as Record<
      ComfortKey,
      string
    >,
    startEndOn: startEnd !== null,
    startEnd: Object.fromEntries(
      START_END_FIELDS.map((f) => [
        f.key,
        str(startEnd ? startEnd[f.key] : DEFAULT_START_END_TOLERANCE[f.key]),
      ]),
    ) as Record<StartEndKey, string>,
  };
}

interface Issue {
  path: string;
  message: string;
}

/** The draft as budget parameters, with the shared schema's problems by path ("envelope.x[1][0]"). */
export function checkBudgetDraft(draft: BudgetDraft): {
  params: Record<string, unknown>;
  budget: Budget | null;
  issues: Issue[];
} {
  const own: Issue[] = [];
  const num = (path: string, s: string, optional = false): number | string | undefined => {
    const t = s.trim();
    if (t === '') {
      if (!optional) own.push({ path, message: 'required' });
      return undefined;
    }
    const v = Number(t);
    if (!Number.isFinite(v)) {
      own.push({ path, message: `"${t}" is not a number` });
      return t;
    }
    return v;
  };
  const params: Record<string, unknown> = {};
  if (draft.name.trim()) params.name = draft.name.trim();
  if (draft.version.trim()) {
    const v = draft.version.trim();
    params.version = /^\d+$/.test(v) ? Number(v) : v;
  }
  if (draft.source.trim()) params.source = draft.source.trim();
  params.strokeMargin_m = num('strokeMargin_m', draft.strokeMargin_m);
  params.envelope = Object.fromEntries(
    ENVELOPE_AXES.map((axis) => [
      axis,
      draft.envelope[axis].map((row, i) => row.map((s, k) => num(`envelope.${axis}[${i}][${k}]`, s))),
    ]),
  );
  const comfort: Record<string, unknown> = {};
  for (const f of COMFORT_FIELDS) {
    const v = num(`comfort.${f.key}`, draft.comfort[f.key], 'optional' in f);
    if (v !== undefined) comfort[f.key] = v;
  }
  params.comfort = comfort;
  if (draft.startEndOn) {
    params.startEnd = Object.fromEntries(
      START_END_FIELDS.map((f) => [f.key, num(`startEnd.${f.key}`, draft.startEnd[f.key])]),
    );
  }
  const r = budgetSchema.safeParse(params);
  const mine = new Set(own.map((i) => i.path));
  const schemaIssues = r.success
    ? []
    : r.error.issues
        .map((i) => ({ path: formatJsonPath(i.path) || '(budget)', message: i.message }))
        .filter((i) => !mine.has(i.path));
  const issues = [...own, ...schemaIssues];
  return { params, budget: r.success && issues.length === 0 ? r.data : null, issues };
}

function isDemoValue(path: readonly (string | number)[], value: string): boolean {
  let v: unknown = DEMO_BUDGET;
  for (const k of path) v = (v as Record<string | number, unknown> | undefined)?.[k];
  return typeof v === 'number' && value.trim() !== '' && Number(value) === v;
}

function DemoTag() {
  return (
    <span
      className="ml-1 rounded bg-signal-400/20 px-1 text-[10px] font-medium text-signal-600"
      title="From the demo budget shipped with Legwork"
    >
      demo value, not a standard
    </span>
  );
}

function NumberField({
  label,
  unit,
  value,
  onChange,
  problems,
  demo,
  hint,
}: {
  label: string;
  unit: string;
  value: string;
  onChange: (value: string) => void;
  problems: string[];
  demo: boolean;
  hint?: string;
}) {
  const id = useId();
  return (
    <div className="flex flex-col gap-0.5">
      <label htmlFor={id} className="text-xs font-medium text-ink-600">
        {label} <span className="font-normal text-ink-600">({unit})</span>
        {demo ? <DemoTag /> : null}
      </label>
      <input
        id={id}
        inputMode="decimal"
        value={value}
        onChange={(event) => onChange(event.target.value)}
        aria-invalid={problems.length > 0 ? true : undefined}
        aria-describedby={problems.length > 0 ? `${id}-problem` : hint ? `${id}-hint` : undefined}
        className={`w-32 rounded border bg-white px-2 py-1 font-mono text-sm text-ink-900 ${problems.length > 0 ? 'border-stop-500' : 'border-ink-200'}`}
      />
      {hint && problems.length === 0 ? (
        <p id={`${id}-hint`} className="text-xs text-ink-600">
          {hint}
        </p>
      ) : null}
      {problems.length > 0 ? <FieldError id={`${id}-problem`}>{problems.join('; ')}</FieldError> : null}
    </div>
  );
}

function Group({ title, note, children }: { title: string; note?: ReactNode; children: ReactNode }) {
  return (
    <fieldset className="flex flex-col gap-2 rounded border border-ink-100 p-3">
      <legend className="px-1 text-xs font-semibold text-ink-800">{title}</legend>
      {note ? <p className="text-xs text-ink-600">{note}</p> : null}
      {children}
    </fieldset>
  );
}

/**
 * A form for budget parameters: a new version of `profile`, or a new budget profile when none is
 * given, prefilled from `initialParams`.
 */
export function BudgetEditor({
  studioId,
  profile,
  initialParams,
  onDone,
}: {
  studioId: string;
  profile?: Profile;
  initialParams: unknown;
  onDone: () => void;
}) {
  const [draft, setDraft] = useState<BudgetDraft>(() => budgetDraft(initialParams));
  const [profileName, setProfileName] = useState('');
  const [note, setNote] = useState('');
  const [tried, setTried] = useState(false);
  const [nameError, setNameError] = useState<string | undefined>();
  const createVersion = useCreateProfileVersion(studioId, 'budget');
  const createProfile = useCreateProfile(studioId, 'budget');
  const mutation = profile ? createVersion : createProfile;

  const check = checkBudgetDraft(draft);
  const serverIssues =
    mutation.error instanceof ApiRequestError
      ? mutation.error.issues.map((i) => ({ ...i, path: i.path.replace(/^params\.?/, '') || '(budget)' }))
      : [];
  const shown = check.issues.length > 0 ? check.issues : serverIssues;
  const at = (path: string) => shown.filter((i) => i.path === path).map((i) => i.message);
  const set = (mutate: (d: BudgetDraft) => void) => {
    setDraft((d) => {
      const next = structuredClone(d);
      mutate(next);
      return next;
    });
    if (mutation.error) mutation.reset();
  };
  const known = new Set<string>(['strokeMargin_m', 'comfort', 'startEnd', 'envelope']);
  for (const f of COMFORT_FIELDS) known.add(`comfort.${f.key}`);
  for (const f of START_END_FIELDS) known.add(`startEnd.${f.key}`);
  for (const axis of ENVELOPE_AXES) {
    known.add(`envelope.${axis}`);
    draft.envelope[axis].forEach((_, i) => {
      known.add(`envelope.${axis}[${i}]`);
      for (let k = 0; k < 3; k++) known.add(`envelope.${axis}[${i}][${k}]`);
    });
  }
  const general = shown.filter((i) => !known.has(i.path));
  const anyDemo =
    isDemoValue(['strokeMargin_m'], draft.strokeMargin_m) ||
    COMFORT_FIELDS.some((f) => isDemoValue(['comfort', f.key], draft.comfort[f.key])) ||
    ENVELOPE_AXES.some((axis) =>
      draft.envelope[axis].some((row, i) => row.some((v, k) => isDemoValue(['envelope', axis, i, k], v))),
    );

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setTried(true);
    const missingName = !profile && !profileName.trim();
    setNameError(missingName ? 'required' : undefined);
    if (check.issues.length > 0 || missingName) return;
    if (profile)
      createVersion.mutate(
        { studioId, profileId: profile.id, params: check.params, note },
        { onSuccess: onDone },
      );
    else
      createProfile.mutate(
        { studioId, kind: 'budget', name: profileName.trim(), params: check.params, note },
        { onSuccess: onDone },
      );
  };

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={profile ? `New version of ${profile.name}` : 'New budget profile'}
      className="flex flex-col gap-3 rounded bg-white p-3"
      data-testid="budget-editor"
    >
      {anyDemo ? (
        <p
          role="note"
          className="rounded border border-signal-400 bg-signal-400/10 px-3 py-2 text-xs text-ink-800"
        >
          Fields marked <DemoTag /> hold the demo values shipped with Legwork: invented for trying the
          product, not taken from any standard or code. Enter the envelope and limits from the venue&apos;s
          safety engineering and the code that applies to the ride.
        </p>
      ) : null}
      {!profile ? (
        <TextField
          label="Profile name"
          value={profileName}
          error={nameError}
          onChange={(e) => setProfileName(e.target.value)}
          className="max-w-sm"
        />
      ) : null}
      <div className="flex flex-wrap gap-4">
        <TextField
          label="Budget name (in the file)"
          value={draft.name}
          onChange={(e) => set((d) => void (d.name = e.target.value))}
          className="w-80"
          maxLength={200}
        />
        <TextField
          label="Version label (in the file)"
          value={draft.version}
          onChange={(e) => set((d) => void (d.version = e.target.value))}
          className="w-40"
          maxLength={50}
        />
      </div>
      <TextField
        label="Where the numbers come from"
        value={draft.source}
        onChange={(e) => set((d) => void (d.source = e.target.value))}
        maxLength={2000}
        hint="The venue's safety engineering, the applicable code and clause."
      />
      {general.length > 0 ? (
        <ul
          aria-label="Problems with the budget as a whole"
          className="flex flex-col gap-0.5 rounded border border-stop-500 px-3 py-2"
        >
          {general.map((issue, i) => (
            <li key={i}>
              <FieldError>
                <span className="font-mono">{issue.path}</span>: {issue.message}
              </FieldError>
            </li>
          ))}
        </ul>
      ) : null}

      <Group
        title="Acceleration-duration envelope (specific force at each seat, g)"
        note="Each row: the rider may be outside [lower, upper] for less than the duration at a time; a row with duration 0 is a bound never to reach. Rows by increasing duration; every row must contain the at-rest value."
      >
        <div className="flex flex-col gap-4">
          {ENVELOPE_AXES.map((axis) => {
            const rows = draft.envelope[axis];
            const parsedRows: EnvelopeRow[] = rows.map(
              (r) => r.map((s) => (s.trim() === '' ? NaN : Number(s))) as EnvelopeRow,
            );
            const axisProblems = at(`envelope.${axis}`);
            return (
              <div
                key={axis}
                className="grid gap-3 lg:grid-cols-[minmax(0,1fr)_minmax(0,24rem)]"
                data-axis={axis}
              >
                <div className="flex flex-col gap-1">
                  <table
                    className="self-start border-collapse text-sm"
                    aria-label={`Envelope rows, ${AXIS_TITLES[axis]}`}
                  >
                    <caption className="pb-1 text-left text-xs font-medium text-ink-800">
                      {AXIS_TITLES[axis]}{' '}
                      <span className="font-normal text-ink-600">(at rest {REST_G[axis]} g)</span>
                      {rows.some((row, i) => row.some((v, k) => isDemoValue(['envelope', axis, i, k], v))) ? (
                        <DemoTag />
                      ) : null}
                    </caption>
                    <thead>
                      <tr>
                        {['Duration (s)', 'Lower (g)', 'Upper (g)'].map((h) => (
                          <th key={h} scope="col" className="px-1 text-left text-xs font-normal text-ink-600">
                            {h}
                          </th>
                        ))}
                        <th />
                      </tr>
                    </thead>
                    {rows.map((row, i) => {
                      const rowPath = `envelope.${axis}[${i}]`;
                      const problems = [
                        ...at(rowPath),
                        ...['duration_s', 'lower_g', 'upper_g'].flatMap((name, k) =>
                          at(`${rowPath}[${k}]`).map((m) => `${name}: ${m}`),
                        ),
                      ];
                      return (
                        <tbody key={i} data-path={rowPath}>
                          <tr className="align-top">
                            {row.map((value, k) => {
                              const bad = at(`${rowPath}[${k}]`).length > 0 || at(rowPath).length > 0;
                              const names = ['duration', 'lower bound', 'upper bound'] as const;
                              return (
                                <td key={k} className="px-1 py-0.5">
                                  <input
                                    aria-label={`${axis} row ${i + 1} ${names[k]} (${k === 0 ? 's' : 'g'})`}
                                    inputMode="decimal"
                                    value={value}
                                    onChange={(event) =>
                                      set((d) => {
                                        const r = d.envelope[axis][i];
                                        if (r) r[k] = event.target.value;
                                      })
                                    }
                                    aria-invalid={bad ? true : undefined}
                                    className={`w-24 rounded border bg-white px-1.5 py-0.5 font-mono text-xs text-ink-900 ${bad ? 'border-stop-500' : 'border-ink-200'}`}
                                  />
                                  {isDemoValue(['envelope', axis, i, k], value) ? (
                                    <span className="sr-only"> (demo value, not a standard)</span>
                                  ) : null}
                                </td>
                              );
                            })}
                            <td className="px-1 py-0.5">
                              {rows.length > 1 ? (
                                <Button
                                  size="sm"
                                  variant="quiet"
                                  onClick={() => set((d) => void d.envelope[axis].splice(i, 1))}
                                  aria-label={`Remove ${axis} row ${i + 1}`}
                                >
                                  Remove
                                </Button>
                              ) : null}
                            </td>
                          </tr>
                          {problems.length > 0 ? (
                            <tr>
                              <td colSpan={4} className="px-1 pb-1">
                                <FieldError>{problems.join('; ')}</FieldError>
                              </td>
                            </tr>
                          ) : null}
                        </tbody>
                      );
                    })}
                  </table>
                  {axisProblems.length > 0 ? <FieldError>{axisProblems.join('; ')}</FieldError> : null}
                  <div>
                    <Button
                      size="sm"
                      onClick={() =>
                        set((d) => {
                          const last = d.envelope[axis].at(-1);
                          const next =
                            last && Number.isFinite(Number(last[0])) ? String(Number(last[0]) * 2 || 1) : '1';
                          d.envelope[axis].push([next, last?.[1] ?? '', last?.[2] ?? '']);
                        })
                      }
                    >
                      Add a row
                    </Button>
                  </div>
                </div>
                <EnvelopeChart title={AXIS_TITLES[axis]} rows={parsedRows} rest_g={REST_G[axis]} />
              </div>
            );
          })}
        </div>
      </Group>

      <Group title="Actuators">
        <NumberField
          label="Stroke margin"
          unit="m"
          value={draft.strokeMargin_m}
          onChange={(v) => set((d) => void (d.strokeMargin_m = v))}
          problems={at('strokeMargin_m')}
          demo={isDemoValue(['strokeMargin_m'], draft.strokeMargin_m)}
          hint="kept clear at each end of every leg's stroke"
        />
      </Group>

      <Group title="Comfort limits (findings a reviewer may clear with a reason)">
        <div className="flex flex-wrap gap-x-5 gap-y-2">
          {COMFORT_FIELDS.map((f) => (
            <NumberField
              key={f.key}
              label={f.label}
              unit={f.unit}
              value={draft.comfort[f.key]}
              onChange={(v) => set((d) => void (d.comfort[f.key] = v))}
              problems={at(`comfort.${f.key}`)}
              demo={isDemoValue(['comfort', f.key], draft.comfort[f.key])}
              {...('optional' in f ? { hint: 'optional; empty: not checked' } : {})}
            />
          ))}
        </div>
      </Group>

      <Group title="Start and end at neutral and at rest">
        <label className="inline-flex items-center gap-1.5 text-sm text-ink-800">
          <input
            type="checkbox"
            checked={draft.startEndOn}
            onChange={(e) => set((d) => void (d.startEndOn = e.target.checked))}
            className="accent-tealdeep-600"
          />
          Set this budget&apos;s own tolerances (otherwise 5 mm, 0.25 deg, 10 mm/s and 0.5 deg/s, the
          product&apos;s choice, not a standard&apos;s)
        </label>
        {draft.startEndOn ? (
          <div className="flex flex-wrap gap-x-5 gap-y-2">
            {START_END_FIELDS.map((f) => (
              <NumberField
                key={f.key}
                label={f.label}
                unit={f.unit}
                value={draft.startEnd[f.key]}
                onChange={(v) => set((d) => void (d.startEnd[f.key] = v))}
                problems={at(`startEnd.${f.key}`)}
                demo={false}
              />
            ))}
          </div>
        ) : null}
      </Group>

      <TextField label="Note (what changed and why)" value={note} onChange={(e) => setNote(e.target.value)} />
      {mutation.error ? <ErrorNotice error={mutation.error} /> : null}
      {tried && check.issues.length > 0 ? (
        <p role="alert" className="text-sm text-stop-700">
          Fix the problems marked above before saving; nothing was sent.
        </p>
      ) : null}
      <div className="flex gap-2">
        <Button type="submit" variant="primary" busy={mutation.isPending}>
          {profile ? 'Save as new version' : 'Create profile'}
        </Button>
        <Button variant="quiet" onClick={onDone}>
          Cancel
        </Button>
      </div>
      {mutation.isSuccess ? <Notice>Saved.</Notice> : null}
      <p className="text-xs text-ink-600">
        A budget supports, and never replaces, the ride manufacturer&apos;s engineering, the applicable codes
        (for example ASTM F2291 or EN 13814 / ISO 17842-1 where they apply) and a qualified person&apos;s
        sign-off.
      </p>
    </form>
  );
}
