import { useEffect, useId, useMemo, useState } from 'react';
import type { FormEvent, ReactNode } from 'react';
import type { MotionBase, MotionBaseIssue } from '../../../../shared/schemas/motion-base';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { FieldError } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useUpdateVenueBase } from '../api/update-venue-base';
import { checkDraft, draftFromBase, layoutJoints, recogniseLayout } from './base-draft';
import type { BaseDraft, BaseMode } from './base-draft';
import { BaseJsonField, readBaseJson } from './base-json-field';
import type { BaseIssue } from './base-json-field';
import { BaseStaticView, NEUTRAL_POSE } from './base-static-view';
import type { PlaceJoints, ViewPose } from './base-static-view';
import { BaseWorkspaceTable } from './base-workspace-table';
import type { WorkspacePick } from './base-workspace-table';

/** How long typing must pause before the view and the workspace follow (ms). */
const SETTLE_MS = 250;

function useSettled<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(timer);
  }, [value, ms]);
  return settled;
}

type IssueMap = ReadonlyMap<string, string[]>;

function byPath(issues: readonly MotionBaseIssue[]): IssueMap {
  const map = new Map<string, string[]>();
  for (const i of issues) map.set(i.path, [...(map.get(i.path) ?? []), i.message]);
  return map;
}

/** A labelled number field with its unit and the problems at its path beside it. */
function NumberField({
  label,
  unit,
  path,
  value,
  onChange,
  issues,
  hint,
}: {
  label: string;
  unit: string;
  path: string;
  value: string;
  onChange: (value: string) => void;
  issues: IssueMap;
  hint?: string;
}) {
  const id = useId();
  const problems = issues.get(path) ?? [];
  return (
    <div className="flex flex-col gap-0.5" data-path={path}>
      <label htmlFor={id} className="text-xs font-medium text-ink-600">
        {label} <span className="font-normal text-ink-400">({unit})</span>
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
        <p id={`${id}-hint`} className="text-xs text-ink-400">
          {hint}
        </p>
      ) : null}
      {problems.length > 0 ? <FieldError id={`${id}-problem`}>{problems.join('; ')}</FieldError> : null}
    </div>
  );
}

function Group({ title, children, note }: { title: string; children: ReactNode; note?: ReactNode }) {
  return (
    // min-w-0: a fieldset is as wide as its content by default and would spill into the view beside it.
    <fieldset className="flex min-w-0 flex-col gap-2 rounded border border-ink-100 p-3">
      <legend className="px-1 text-xs font-semibold text-ink-800">{title}</legend>
      {note ? <p className="text-xs text-ink-400">{note}</p> : null}
      <div className="flex flex-wrap gap-x-4 gap-y-2">{children}</div>
    </fieldset>
  );
}

/** A table of points (joints or seats), one row each, x/y(/z) in m, with each cell's and row's problems in the row. */
function PointTable({
  caption,
  rowLabel,
  path,
  points,
  dim,
  onChange,
  issues,
  onRemove,
}: {
  caption: string;
  rowLabel: string;
  path: string;
  points: string[][];
  dim: 2 | 3;
  onChange: (row: number, k: number, value: string) => void;
  issues: IssueMap;
  onRemove?: (row: number) => void;
}) {
  const axes = ['x', 'y', 'z'].slice(0, dim);
  const whole = issues.get(path) ?? [];
  return (
    <div className="flex max-w-full flex-col gap-1 overflow-x-auto">
      <table className="border-collapse text-sm" aria-label={caption}>
        <caption className="pb-1 text-left text-xs font-medium text-ink-600">{caption}</caption>
        <thead>
          <tr>
            <th scope="col" className="px-1 text-left text-xs font-normal text-ink-400">
              {rowLabel}
            </th>
            {axes.map((a) => (
              <th key={a} scope="col" className="px-1 text-left text-xs font-normal text-ink-400">
                {a} (m)
              </th>
            ))}
            <th />
          </tr>
        </thead>
        <tbody>
          {points.map((point, i) => {
            const rowPath = `${path}[${i}]`;
            const problems = [
              ...(issues.get(rowPath) ?? []),
              ...axes.flatMap((a, k) => (issues.get(`${rowPath}[${k}]`) ?? []).map((m) => `${a}: ${m}`)),
            ];
            return (
              <tr key={i} data-path={rowPath} className="align-top">
                <th scope="row" className="px-1 py-0.5 text-left font-mono text-xs font-normal text-ink-600">
                  {i + 1}
                </th>
                {axes.map((a, k) => {
                  const bad =
                    (issues.get(`${rowPath}[${k}]`) ?? []).length > 0 ||
                    (issues.get(rowPath) ?? []).length > 0;
                  return (
                    <td key={a} className="px-1 py-0.5">
                      <input
                        aria-label={`${rowLabel} ${i + 1} ${a} (m)`}
                        inputMode="decimal"
                        value={point[k] ?? ''}
                        onChange={(event) => onChange(i, k, event.target.value)}
                        aria-invalid={bad ? true : undefined}
                        className={`w-36 rounded border bg-white px-1.5 py-0.5 font-mono text-xs text-ink-900 ${bad ? 'border-stop-500' : 'border-ink-200'}`}
                      />
                    </td>
                  );
                })}
                <td className="px-1 py-0.5">
                  {onRemove && points.length > 1 ? (
                    <Button
                      size="sm"
                      variant="quiet"
                      onClick={() => onRemove(i)}
                      aria-label={`Remove ${rowLabel.toLowerCase()} ${i + 1}`}
                    >
                      Remove
                    </Button>
                  ) : null}
                  {problems.length > 0 ? <FieldError>{problems.join('; ')}</FieldError> : null}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {whole.length > 0 ? <FieldError>{whole.join('; ')}</FieldError> : null}
    </div>
  );
}

const MODE_LABELS: Record<BaseMode, string> = {
  parametric: 'Hexapod, parametric layout',
  joints: 'Hexapod, twelve joints',
  planar3: 'Planar three-leg stage',
};

/** Paths the form shows beside a field; problems at any other path are listed above the form. */
function fieldPaths(draft: BaseDraft): Set<string> {
  const paths = [
    'name',
    'park',
    'controllerRate_hz',
    'leg',
    'leg.min_m',
    'leg.max_m',
    'leg.speedMax_mps',
    'leg.accelMax_mps2',
    'leg.forceMax_N',
    'seats_m',
  ];
  draft.seats.forEach((_, i) =>
    paths.push(`seats_m[${i}]`, `seats_m[${i}][0]`, `seats_m[${i}][1]`, `seats_m[${i}][2]`),
  );
  if (draft.mode === 'parametric') {
    paths.push(
      'baseRadius_m',
      'platformRadius_m',
      'baseHalfAngle_deg',
      'platformHalfAngle_deg',
      'platformJointZ_m',
    );
  } else {
    const count = draft.mode === 'planar3' ? 3 : 6;
    for (const f of ['baseJoints_m', 'platformJoints_m']) {
      paths.push(f);
      for (let i = 0; i < count; i++)
        paths.push(`${f}[${i}]`, `${f}[${i}][0]`, `${f}[${i}][1]`, `${f}[${i}][2]`);
    }
  }
  if (draft.mode !== 'planar3') {
    paths.push('neutralHeight_m');
    if (draft.payloadOn) {
      paths.push('payload', 'payload.mass_kg', 'payload.centreOfMass_m', 'payload.inertia_kgm2');
      for (let k = 0; k < 3; k++) paths.push(`payload.centreOfMass_m[${k}]`);
      for (let k = 0; k < 6; k++) paths.push(`payload.inertia_kgm2[${k}]`);
    }
  }
  return new Set(paths);
}

const INERTIA_LABELS = ['Ixx', 'Iyy', 'Izz', 'Ixy', 'Ixz', 'Iyz'] as const;

/**
 * Edits the venue's motion base as a form (lengths m, angles deg): the parametric hexapod layout or
 * the joints, the leg limits, the seats and the payload. Problems come from the shared parser the
 * server uses and stand beside their fields; the 3-D view and the workspace follow the edits. JSON
 * stays available for import and export.
 */
export function BaseForm({
  studioId,
  venue,
  placeJoints,
}: {
  studioId: string;
  venue: VenueDetail;
  placeJoints: PlaceJoints;
}) {
  const [draft, setDraft] = useState<BaseDraft>(() => draftFromBase(venue.base));
  const [saved, setSaved] = useState(false);
  const [tried, setTried] = useState(false);
  const [jsonText, setJsonText] = useState(() => JSON.stringify(venue.base, null, 2));
  const [jsonIssue, setJsonIssue] = useState<BaseIssue | null>(null);
  const [pick, setPick] = useState<WorkspacePick | null>(null);
  const update = useUpdateVenueBase(studioId, venue.id);

  const settledDraft = useSettled(draft, SETTLE_MS);
  const check = useMemo(() => checkDraft(settledDraft), [settledDraft]);
  const serverIssues = update.error instanceof ApiRequestError ? update.error.issues : [];
  const issues = byPath(check.issues.length > 0 ? check.issues : serverIssues);
  const known = fieldPaths(draft);
  const general = (check.issues.length > 0 ? check.issues : serverIssues).filter((i) => !known.has(i.path));

  const edit = (change: (d: BaseDraft) => BaseDraft) => {
    setDraft((d) => change(structuredClone(d)));
    setSaved(false);
    setPick(null);
    if (update.error) update.reset();
  };
  const set = (mutate: (d: BaseDraft) => void) =>
    edit((d) => {
      mutate(d);
      return d;
    });

  const switchMode = (mode: BaseMode) =>
    set((d) => {
      if (d.mode === 'parametric' && mode === 'joints') {
        const joints = layoutJoints(d.layout);
        if (joints) d.hexJoints = joints;
      }
      if (d.mode === 'joints' && mode === 'parametric') {
        const layout = recogniseLayout(
          d.hexJoints.base.map((j) => j.map(Number)),
          d.hexJoints.platform.map((j) => j.map(Number)),
        );
        if (layout) d.layout = layout;
      }
      d.mode = mode;
    });

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setSaved(false);
    setTried(true);
    const now = checkDraft(draft);
    if (now.issues.length > 0) {
      update.reset();
      return;
    }
    update.mutate(
      { studioId, venueId: venue.id, base: now.input },
      {
        // The server keeps joint form; a parametric layout is recognised again from its joints.
        onSuccess: (stored) => {
          setDraft(draftFromBase(stored.base));
          setJsonText(JSON.stringify(stored.base, null, 2));
          setSaved(true);
          setTried(false);
        },
      },
    );
  };

  const pose: ViewPose = pick
    ? {
        ...NEUTRAL_POSE,
        ...{
          surge: { x_m: pick.value },
          sway: { y_m: pick.value },
          heave: { z_m: pick.value },
          roll: { roll_rad: pick.value },
          pitch: { pitch_rad: pick.value },
          yaw: { yaw_rad: pick.value },
        }[pick.axis],
      }
    : NEUTRAL_POSE;
  const hexapod = draft.mode !== 'planar3';
  const pending = draft !== settledDraft;
  // The 3-D view keeps the last base without problems while a field is being fixed, rather than
  // going blank at the first stray keystroke.
  const [lastValid, setLastValid] = useState<MotionBase | null>(check.base);
  if (check.base && check.base !== lastValid) setLastValid(check.base);
  const viewBase = check.base ?? lastValid;
  const stale = !check.base && lastValid !== null;

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={`Motion base of ${venue.name}`}
      className="flex flex-col gap-3"
    >
      <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_minmax(0,31rem)]">
        <div className="flex flex-col gap-3">
          <div className="flex flex-wrap items-end gap-4">
            <div className="flex flex-col gap-0.5">
              <label htmlFor={`${venue.id}-mode`} className="text-xs font-medium text-ink-600">
                Kind and joints given as
              </label>
              <select
                id={`${venue.id}-mode`}
                value={draft.mode}
                onChange={(event) => switchMode(event.target.value as BaseMode)}
                className="rounded border border-ink-200 bg-white px-2 py-1 text-sm text-ink-900"
              >
                {(Object.keys(MODE_LABELS) as BaseMode[]).map((m) => (
                  <option key={m} value={m}>
                    {MODE_LABELS[m]}
                  </option>
                ))}
              </select>
            </div>
            <div className="flex flex-col gap-0.5">
              <label htmlFor={`${venue.id}-name`} className="text-xs font-medium text-ink-600">
                Name <span className="font-normal text-ink-400">(optional)</span>
              </label>
              <input
                id={`${venue.id}-name`}
                value={draft.name}
                maxLength={200}
                onChange={(event) => set((d) => void (d.name = event.target.value))}
                className="w-64 rounded border border-ink-200 bg-white px-2 py-1 text-sm text-ink-900"
              />
            </div>
          </div>
          {general.length > 0 ? (
            <ul
              aria-label="Problems with the base as a whole"
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

          {draft.mode === 'parametric' ? (
            <Group
              title="Parametric layout"
              note="Base joints in pairs centred at 0, 120 and 240 deg from +x, platform joints in pairs centred at 60, 180 and 300 deg; each joint the half angle either side of its pair's centre."
            >
              <NumberField
                label="Base joint circle radius"
                unit="m"
                path="baseRadius_m"
                value={draft.layout.baseRadius_m}
                onChange={(v) => set((d) => void (d.layout.baseRadius_m = v))}
                issues={issues}
              />
              <NumberField
                label="Platform joint circle radius"
                unit="m"
                path="platformRadius_m"
                value={draft.layout.platformRadius_m}
                onChange={(v) => set((d) => void (d.layout.platformRadius_m = v))}
                issues={issues}
              />
              <NumberField
                label="Base pair half angle"
                unit="deg"
                path="baseHalfAngle_deg"
                value={draft.layout.baseHalfAngle_deg}
                onChange={(v) => set((d) => void (d.layout.baseHalfAngle_deg = v))}
                issues={issues}
                hint="above 0, below 60"
              />
              <NumberField
                label="Platform pair half angle"
                unit="deg"
                path="platformHalfAngle_deg"
                value={draft.layout.platformHalfAngle_deg}
                onChange={(v) => set((d) => void (d.layout.platformHalfAngle_deg = v))}
                issues={issues}
                hint="above 0, below 60"
              />
              <NumberField
                label="Platform joint height"
                unit="m"
                path="platformJointZ_m"
                value={draft.layout.platformJointZ_m}
                onChange={(v) => set((d) => void (d.layout.platformJointZ_m = v))}
                issues={issues}
                hint="optional; negative below the deck"
              />
            </Group>
          ) : (
            <Group
              title={draft.mode === 'joints' ? 'Joints (six legs)' : 'Joints (three legs)'}
              note="Base joints in the base frame, platform joints in the platform frame (x forward, y left, z up); leg i joins base joint i to platform joint i."
            >
              {(['base', 'platform'] as const).map((side) => (
                <PointTable
                  key={side}
                  caption={side === 'base' ? 'Base joints' : 'Platform joints'}
                  rowLabel={side === 'base' ? 'Base joint' : 'Platform joint'}
                  path={side === 'base' ? 'baseJoints_m' : 'platformJoints_m'}
                  dim={draft.mode === 'joints' ? 3 : 2}
                  points={draft.mode === 'joints' ? draft.hexJoints[side] : draft.planarJoints[side]}
                  onChange={(row, k, v) =>
                    set((d) => {
                      const table = d.mode === 'joints' ? d.hexJoints[side] : d.planarJoints[side];
                      const r = table[row];
                      if (r) r[k] = v;
                    })
                  }
                  issues={issues}
                />
              ))}
            </Group>
          )}

          <Group title="Legs and controller">
            {hexapod ? (
              <NumberField
                label="Neutral height"
                unit="m"
                path="neutralHeight_m"
                value={draft.neutralHeight_m}
                onChange={(v) => set((d) => void (d.neutralHeight_m = v))}
                issues={issues}
                hint="platform origin above the base origin"
              />
            ) : null}
            <NumberField
              label="Shortest leg"
              unit="m"
              path="leg.min_m"
              value={draft.leg.min_m}
              onChange={(v) => set((d) => void (d.leg.min_m = v))}
              issues={issues}
            />
            <NumberField
              label="Longest leg"
              unit="m"
              path="leg.max_m"
              value={draft.leg.max_m}
              onChange={(v) => set((d) => void (d.leg.max_m = v))}
              issues={issues}
            />
            <NumberField
              label="Leg speed limit"
              unit="m/s"
              path="leg.speedMax_mps"
              value={draft.leg.speedMax_mps}
              onChange={(v) => set((d) => void (d.leg.speedMax_mps = v))}
              issues={issues}
            />
            <NumberField
              label="Leg acceleration limit"
              unit="m/s²"
              path="leg.accelMax_mps2"
              value={draft.leg.accelMax_mps2}
              onChange={(v) => set((d) => void (d.leg.accelMax_mps2 = v))}
              issues={issues}
            />
            <NumberField
              label="Leg force rating"
              unit="N"
              path="leg.forceMax_N"
              value={draft.leg.forceMax_N}
              onChange={(v) => set((d) => void (d.leg.forceMax_N = v))}
              issues={issues}
              hint="optional; checked with a payload"
            />
            <NumberField
              label="Controller rate"
              unit="Hz"
              path="controllerRate_hz"
              value={draft.controllerRate_hz}
              onChange={(v) => set((d) => void (d.controllerRate_hz = v))}
              issues={issues}
            />
          </Group>

          <Group title="Seats (rider reference points, platform frame)">
            <div className="flex w-full min-w-0 flex-col gap-1">
              <PointTable
                caption="Seat positions"
                rowLabel="Seat"
                path="seats_m"
                dim={3}
                points={draft.seats}
                onChange={(row, k, v) =>
                  set((d) => {
                    const r = d.seats[row];
                    if (r) r[k] = v;
                  })
                }
                onRemove={(row) => set((d) => void d.seats.splice(row, 1))}
                issues={issues}
              />
              <div>
                <Button
                  size="sm"
                  onClick={() => set((d) => void d.seats.push(['', '', '']))}
                  disabled={draft.seats.length >= 64}
                >
                  Add a seat
                </Button>
              </div>
            </div>
          </Group>

          {hexapod ? (
            <Group title="Payload (riders included; for the actuator forces)">
              <label className="inline-flex w-full items-center gap-1.5 text-sm text-ink-800">
                <input
                  type="checkbox"
                  checked={draft.payloadOn}
                  onChange={(event) => set((d) => void (d.payloadOn = event.target.checked))}
                  className="accent-tealdeep-600"
                />
                The base carries a known payload
              </label>
              {draft.payloadOn ? (
                <>
                  <NumberField
                    label="Mass"
                    unit="kg"
                    path="payload.mass_kg"
                    value={draft.payload.mass_kg}
                    onChange={(v) => set((d) => void (d.payload.mass_kg = v))}
                    issues={issues}
                  />
                  {(['x', 'y', 'z'] as const).map((a, k) => (
                    <NumberField
                      key={a}
                      label={`Centre of mass ${a}`}
                      unit="m, platform frame"
                      path={`payload.centreOfMass_m[${k}]`}
                      value={draft.payload.centreOfMass_m[k] ?? ''}
                      onChange={(v) => set((d) => void (d.payload.centreOfMass_m[k] = v))}
                      issues={issues}
                    />
                  ))}
                  {INERTIA_LABELS.map((a, k) => (
                    <NumberField
                      key={a}
                      label={a}
                      unit="kg·m²"
                      path={`payload.inertia_kgm2[${k}]`}
                      value={draft.payload.inertia_kgm2[k] ?? ''}
                      onChange={(v) => set((d) => void (d.payload.inertia_kgm2[k] = v))}
                      issues={issues}
                    />
                  ))}
                  {(issues.get('payload.inertia_kgm2') ?? []).length > 0 ? (
                    <div className="w-full">
                      <FieldError>{issues.get('payload.inertia_kgm2')?.join('; ')}</FieldError>
                    </div>
                  ) : null}
                </>
              ) : null}
            </Group>
          ) : null}

          <div className="flex flex-col gap-0.5">
            <label htmlFor={`${venue.id}-park`} className="text-xs font-medium text-ink-600">
              Return to neutral, park and emergency stop, as the ride maker gives it{' '}
              <span className="font-normal text-ink-400">(optional)</span>
            </label>
            <textarea
              id={`${venue.id}-park`}
              value={draft.park}
              rows={2}
              maxLength={4000}
              onChange={(event) => set((d) => void (d.park = event.target.value))}
              className="rounded border border-ink-200 bg-white px-2 py-1 text-sm text-ink-900"
            />
          </div>
        </div>

        <div className="flex flex-col gap-3 xl:sticky xl:top-2 xl:self-start">
          <BaseWorkspaceTable base={check.base} picked={pick} onPick={setPick} />
          <BaseStaticView
            base={viewBase}
            stale={stale}
            pose={pose}
            placeJoints={placeJoints}
            caption={
              stale
                ? 'The last base without problems, at neutral: the form has problems marked beside their fields, and the view follows again once they are fixed.'
                : pick
                  ? `At the ${pick.axis} extreme shown in the table; legs past their stroke would be drawn red.`
                  : 'At neutral. Base joints grey, platform teal; a leg outside its stroke is drawn red.'
            }
          />
          {pending ? <p className="text-xs text-ink-400">Updating…</p> : null}
        </div>
      </div>

      {update.error ? <ErrorNotice error={update.error} /> : null}
      {tried && check.issues.length > 0 && !update.error ? (
        <p role="alert" className="text-sm text-stop-700">
          Fix the problems marked above before saving; nothing was sent.
        </p>
      ) : null}
      {saved ? <Notice>Motion base saved.</Notice> : null}
      <div>
        <Button type="submit" variant="primary" busy={update.isPending}>
          Save
        </Button>
      </div>

      <details className="rounded border border-ink-100 px-3 py-2">
        <summary className="cursor-pointer text-xs font-medium text-ink-600">
          JSON (import and export)
        </summary>
        <div className="mt-2 flex flex-col gap-2">
          <BaseJsonField
            label="Motion base (JSON)"
            value={jsonText}
            onChange={(next) => {
              setJsonText(next);
              setJsonIssue(null);
            }}
            issues={jsonIssue ? [jsonIssue] : []}
            rows={12}
          />
          <div className="flex gap-2">
            <Button
              size="sm"
              onClick={() => {
                const read = readBaseJson(jsonText);
                if (!read.ok) {
                  setJsonIssue(read.issue);
                  return;
                }
                setJsonIssue(null);
                edit(() => draftFromBase(read.base));
              }}
            >
              Load the JSON into the form
            </Button>
            <Button
              size="sm"
              onClick={() => {
                setJsonText(JSON.stringify(checkDraft(draft).input, null, 2));
                setJsonIssue(null);
              }}
            >
              Write the form as JSON
            </Button>
          </div>
          <p className="text-xs text-ink-400">
            Loading replaces the form; nothing is saved until you press Save. Problems in the loaded base are
            shown beside their fields.
          </p>
        </div>
      </details>
      <p className="text-xs text-ink-400">
        Finished runs keep the base they used (it is in their manifest); queued runs use the base as it is
        when they start. Changed by motion engineers and studio admins; the server refuses anyone else.
      </p>
      <p className="text-xs text-ink-400">
        Legwork supports, and never replaces, the ride manufacturer&apos;s engineering, the applicable codes
        and a qualified person&apos;s sign-off.
      </p>
    </form>
  );
}
