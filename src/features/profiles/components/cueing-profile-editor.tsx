import { useId, useMemo, useState } from 'react';
import type { FormEvent } from 'react';
import { Link } from 'react-router-dom';
import { appPaths } from '../../../../shared/app-paths';
import { parseCueingProfile, parseCueingProfileJson } from '../../../../shared/schemas/cueing-profile';
import type { CueingProfile, ProfileIssue } from '../../../../shared/schemas/cueing-profile';
import type { Profile, RunSummary } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { FieldError, TextField } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useCan } from '../../../lib/membership';
import { useCreateProfile } from '../api/create-profile';
import { useCreateProfileVersion } from '../api/create-profile-version';
import { useCueTake } from '../api/cue-take';
import { CUEING_FIELD_GROUPS, defaultOf, getAt, pathKey, setAt, withOrder } from './cueing-fields';
import type { FieldGroup, NumberField } from './cueing-fields';
import { ProfilePreview } from './profile-preview';
import type { PreviewChoice } from './profile-preview';

/** The shared parser's problems keyed by field path (the zod issue path, as formatJsonPath writes it). */
function issuesByPath(issues: readonly ProfileIssue[]): Map<string, string[]> {
  const map = new Map<string, string[]>();
  for (const i of issues) map.set(i.path, [...(map.get(i.path) ?? []), i.message]);
  return map;
}

const FIELD_KEYS = new Set(
  CUEING_FIELD_GROUPS.flatMap((g) => [
    ...g.fields.map((f) => pathKey(f.path)),
    ...(g.orderPath ? [pathKey(g.orderPath)] : []),
  ]).concat(['name']),
);

function formatDefault(v: unknown): string {
  return typeof v === 'number' ? String(v) : '—';
}

function NumberInput({
  field,
  value,
  text,
  problems,
  onChange,
}: {
  field: NumberField;
  value: unknown;
  text: string | undefined;
  problems: readonly string[] | undefined;
  onChange: (text: string) => void;
}) {
  const id = useId();
  const key = pathKey(field.path);
  const shown = text ?? (value === undefined ? '' : String(value));
  const d = defaultOf(field.path);
  const errorId = `${id}-error`;
  return (
    <div className="flex flex-col gap-0.5" data-field={key}>
      <label htmlFor={id} className="flex min-h-8 items-end text-xs leading-tight font-medium text-ink-700">
        {field.label}
      </label>
      <div className="flex items-center gap-1">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          value={shown}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={problems ? true : undefined}
          aria-describedby={`${id}-unit ${id}-default${problems ? ` ${errorId}` : ''}`}
          className={`w-full min-w-0 rounded border bg-white px-2 py-1 font-mono text-sm text-ink-900 ${problems ? 'border-stop-500' : 'border-ink-200'}`}
        />
        <span id={`${id}-unit`} className="shrink-0 text-xs text-ink-600">
          {field.unit}
        </span>
      </div>
      <p id={`${id}-default`} className="text-[11px] text-ink-500">
        default {formatDefault(d)}
        {d !== undefined && typeof value === 'number' && value !== d ? ' · changed' : ''}
      </p>
      {problems ? <FieldError id={errorId}>{problems.join('; ')}</FieldError> : null}
    </div>
  );
}

function GroupFields({
  group,
  draft,
  texts,
  problems,
  onText,
  onOrder,
}: {
  group: FieldGroup;
  draft: unknown;
  texts: Record<string, string>;
  problems: Map<string, string[]>;
  onText: (field: NumberField, text: string) => void;
  onOrder: (group: FieldGroup, order: number) => void;
}) {
  const orderId = useId();
  const order = group.orderPath ? getAt(draft, group.orderPath) : undefined;
  const orderProblems = group.orderPath ? problems.get(pathKey(group.orderPath)) : undefined;
  return (
    <fieldset className="flex flex-col gap-2 rounded border border-ink-200 bg-white p-2.5">
      <legend className="px-1 text-xs font-semibold text-ink-900">{group.title}</legend>
      <p className="text-[11px] text-ink-500">{group.hint}</p>
      {group.orderPath ? (
        <div className="flex items-center gap-2">
          <label htmlFor={orderId} className="text-xs font-medium text-ink-700">
            Filter order
          </label>
          <select
            id={orderId}
            value={typeof order === 'number' ? order : ''}
            onChange={(e) => onOrder(group, Number(e.target.value))}
            className="rounded border border-ink-200 bg-white px-1.5 py-0.5 text-sm"
          >
            {group.orderChoices?.map((o) => (
              <option key={o} value={o}>
                {o}
              </option>
            ))}
          </select>
          <span className="text-[11px] text-ink-500">
            default {formatDefault(defaultOf(group.orderPath))}
          </span>
          {orderProblems ? <FieldError>{orderProblems.join('; ')}</FieldError> : null}
        </div>
      ) : null}
      <div className="grid grid-cols-2 gap-x-3 gap-y-2 sm:grid-cols-3">
        {group.fields
          .filter((f) => !f.orders || (typeof order === 'number' && f.orders.includes(order)))
          .map((f) => (
            <NumberInput
              key={pathKey(f.path)}
              field={f}
              value={getAt(draft, f.path)}
              text={texts[pathKey(f.path)]}
              problems={problems.get(pathKey(f.path))}
              onChange={(t) => onText(f, t)}
            />
          ))}
      </div>
    </fieldset>
  );
}

/** A typed number becomes a number; anything else stays text, so the shared parser names the field. */
function valueOfText(text: string): unknown {
  const t = text.trim();
  if (t === '') return undefined;
  const n = Number(t);
  return Number.isFinite(n) ? n : t;
}

/** The draft as the form starts it: the version's parameters with every section the schema defaults. */
function startDraft(params: unknown): unknown {
  const r = parseCueingProfile(params);
  return r.ok ? structuredClone(r.profile) : params;
}

function JsonView({ draft, onImport }: { draft: unknown; onImport: (profile: CueingProfile) => void }) {
  const id = useId();
  const [text, setText] = useState<string | null>(null);
  const [issues, setIssues] = useState<ProfileIssue[]>([]);
  const [copied, setCopied] = useState(false);
  const current = JSON.stringify(draft, null, 2);
  const shown = text ?? current;
  return (
    <details className="rounded border border-ink-200 bg-white p-2.5">
      <summary className="cursor-pointer text-xs font-semibold text-ink-900">
        JSON (copy or paste a whole profile)
      </summary>
      <div className="mt-2 flex flex-col gap-2">
        <label htmlFor={id} className="text-xs font-medium text-ink-600">
          Parameters (JSON)
        </label>
        <textarea
          id={id}
          value={shown}
          onChange={(e) => setText(e.target.value)}
          spellCheck={false}
          rows={14}
          className="rounded border border-ink-200 bg-white px-2 py-1.5 font-mono text-xs text-ink-900"
        />
        {issues.length > 0 ? (
          <ul role="alert" aria-label="Problems in the JSON" className="text-xs text-stop-700">
            {issues.map((i, k) => (
              <li key={k}>
                <span className="font-mono font-semibold">{i.path}</span>
                {i.line !== undefined ? ` (line ${i.line}, column ${i.column})` : ''}: {i.message}
              </li>
            ))}
          </ul>
        ) : null}
        <div className="flex flex-wrap gap-2">
          <Button
            size="sm"
            disabled={text === null}
            onClick={() => {
              const r = parseCueingProfileJson(shown);
              if (!r.ok) {
                setIssues(r.issues);
                return;
              }
              setIssues([]);
              setText(null);
              onImport(r.profile);
            }}
          >
            Use this JSON
          </Button>
          <Button
            size="sm"
            variant="quiet"
            onClick={() => {
              void navigator.clipboard?.writeText(current).then(() => setCopied(true));
            }}
          >
            Copy
          </Button>
          {text !== null ? (
            <Button size="sm" variant="quiet" onClick={() => (setText(null), setIssues([]))}>
              Discard the pasted text
            </Button>
          ) : null}
          {copied ? <span className="self-center text-xs text-ink-600">Copied.</span> : null}
        </div>
      </div>
    </details>
  );
}

function CueAgain({
  studioId,
  choice,
  version,
}: {
  studioId: string;
  choice: PreviewChoice | null;
  version: { id: string; version: number; profileName: string };
}) {
  const cue = useCueTake(studioId);
  const [run, setRun] = useState<RunSummary | null>(null);
  const [reason, setReason] = useState('');
  const canCue = useCan('runs.request');
  if (!canCue) return null;
  if (!choice)
    return (
      <p className="text-xs text-ink-600">
        Choose a take and a venue in the preview to cue it with v{version.version}.
      </p>
    );
  return (
    <div className="flex flex-col gap-1.5">
      <TextField
        label={`Why ${choice.venueName} changes to v${version.version} (kept in the audit log)`}
        value={reason}
        maxLength={500}
        onChange={(e) => setReason(e.target.value)}
        className="max-w-xl"
      />
      <div className="flex flex-wrap items-center gap-2">
        <Button
          size="sm"
          variant="primary"
          busy={cue.isPending}
          disabled={reason.trim() === ''}
          onClick={() =>
            cue.mutate(
              {
                studioId,
                takeId: choice.takeId,
                venueId: choice.venueId,
                cueingVersionId: version.id,
                reason: reason.trim(),
              },
              { onSuccess: setRun },
            )
          }
        >
          Cue take {choice.takeNumber} at {choice.venueName} with v{version.version}
        </Button>
        <span className="text-xs text-ink-600">
          Makes v{version.version} {choice.venueName}’s cueing profile, then queues the run for review.
        </span>
      </div>
      {cue.error ? <ErrorNotice error={cue.error} /> : null}
      {run ? (
        <Notice>
          Run queued.{' '}
          <Link to={appPaths.run(studioId, run.id)} className="text-tealdeep-600 underline">
            Open the run of take {run.takeNumber} at {run.venueName}
          </Link>
        </Notice>
      ) : null}
    </div>
  );
}

/**
 * The cueing profile editor: every parameter as a labelled number with its unit and default, grouped
 * as the schema groups them, problems beside their fields (the shared parser's issue paths), the JSON
 * to copy or paste, and a live preview on a chosen take and venue. Saving makes a new version (or a
 * new profile when none is given); the take can then be cued with it in one click.
 */
export function CueingProfileEditor({
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
  const [draft, setDraft] = useState<unknown>(() => startDraft(initialParams));
  const [texts, setTexts] = useState<Record<string, string>>({});
  const [profileName, setProfileName] = useState('');
  const [nameError, setNameError] = useState<string | undefined>();
  const [note, setNote] = useState('');
  const [choice, setChoice] = useState<PreviewChoice | null>(null);
  const [saved, setSaved] = useState<{ id: string; version: number; profileName: string } | null>(null);
  const createVersion = useCreateProfileVersion(studioId, 'cueing');
  const createProfile = useCreateProfile(studioId, 'cueing');
  const mutation = profile ? createVersion : createProfile;

  const parsed = useMemo(() => parseCueingProfile(draft), [draft]);
  const problems = useMemo(() => issuesByPath(parsed.ok ? [] : parsed.issues), [parsed]);
  const otherProblems = parsed.ok ? [] : parsed.issues.filter((i) => !FIELD_KEYS.has(i.path));
  const validProfile = parsed.ok ? parsed.profile : null;
  // The preview keeps the last profile without problems while a field is being fixed.
  const [lastValid, setLastValid] = useState<CueingProfile | null>(validProfile);
  if (validProfile && validProfile !== lastValid) setLastValid(validProfile);

  const onText = (field: NumberField, text: string) => {
    setTexts((t) => ({ ...t, [pathKey(field.path)]: text }));
    setDraft((d: unknown) => setAt(d, field.path, valueOfText(text)));
    setSaved(null);
  };
  const onOrder = (group: FieldGroup, order: number) => {
    if (!group.orderPath) return;
    setDraft((d: unknown) => withOrder(d, group.orderPath!, order, group));
    setSaved(null);
  };

  const serverIssues =
    mutation.error instanceof ApiRequestError
      ? mutation.error.issues.map((i) => ({
          path: i.path.replace(/^params\.?/, '') || '(profile)',
          message: i.message,
        }))
      : [];
  const allProblems = new Map(problems);
  for (const i of serverIssues) allProblems.set(i.path, [...(allProblems.get(i.path) ?? []), i.message]);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const missingName = !profile && !profileName.trim();
    setNameError(missingName ? 'required' : undefined);
    if (!parsed.ok || missingName) return;
    const onSuccess = (p: Profile) => {
      const latest = [...p.versions].sort((a, b) => b.version - a.version)[0];
      if (latest) setSaved({ id: latest.id, version: latest.version, profileName: p.name });
    };
    if (profile)
      createVersion.mutate({ studioId, profileId: profile.id, params: parsed.profile, note }, { onSuccess });
    else
      createProfile.mutate(
        { studioId, kind: 'cueing', name: profileName.trim(), params: parsed.profile, note },
        { onSuccess },
      );
  };

  const nameInFile = getAt(draft, ['name']);
  const problemCount = parsed.ok ? 0 : parsed.issues.length;

  return (
    <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
      <form
        onSubmit={submit}
        noValidate
        aria-label={profile ? `New version of ${profile.name}` : 'New cueing profile'}
        className="flex flex-col gap-3"
        data-problems={problemCount}
      >
        {!profile ? (
          <TextField
            label="Profile name"
            value={profileName}
            error={nameError}
            onChange={(e) => setProfileName(e.target.value)}
            className="max-w-sm"
          />
        ) : null}
        <TextField
          label="Name in the profile file"
          value={typeof nameInFile === 'string' ? nameInFile : ''}
          error={allProblems.get('name')?.join('; ')}
          onChange={(e) => setDraft((d: unknown) => setAt(d, ['name'], e.target.value))}
          className="max-w-md"
        />
        <p className="text-xs text-ink-600">
          Defaults are common practice for ride bases of this size, not a standard. Frequencies in rad/s as in
          the washout literature; angles in degrees.
        </p>
        {otherProblems.length > 0 ? (
          <ul role="alert" aria-label="Problems in the parameters" className="text-xs text-stop-700">
            {otherProblems.map((i, k) => (
              <li key={k}>
                <span className="font-mono font-semibold">{i.path}</span>: {i.message}
              </li>
            ))}
          </ul>
        ) : null}
        <div className="grid gap-3 2xl:grid-cols-2">
          {CUEING_FIELD_GROUPS.map((g) => (
            <GroupFields
              key={g.title}
              group={g}
              draft={draft}
              texts={texts}
              problems={allProblems}
              onText={onText}
              onOrder={onOrder}
            />
          ))}
        </div>
        <JsonView
          draft={draft}
          onImport={(p) => {
            setDraft(structuredClone(p));
            setTexts({});
            setSaved(null);
          }}
        />
        <TextField
          label="Note (what changed and why)"
          value={note}
          onChange={(e) => setNote(e.target.value)}
        />
        {problemCount > 0 ? (
          <p className="text-xs text-stop-700" role="status">
            {problemCount} problem{problemCount === 1 ? '' : 's'} to fix before saving (shown beside the
            fields).
          </p>
        ) : null}
        {mutation.error && serverIssues.length === 0 ? <ErrorNotice error={mutation.error} /> : null}
        <div className="flex gap-2">
          <Button type="submit" variant="primary" busy={mutation.isPending} disabled={problemCount > 0}>
            {profile ? 'Save as new version' : 'Create profile'}
          </Button>
          <Button variant="quiet" onClick={onDone}>
            {saved ? 'Close' : 'Cancel'}
          </Button>
        </div>
        {saved ? (
          <div className="flex flex-col gap-2 rounded border border-tealdeep-600/40 bg-white p-2.5">
            <Notice>
              Saved as {saved.profileName} v{saved.version}.
            </Notice>
            <CueAgain studioId={studioId} choice={choice} version={saved} />
          </div>
        ) : null}
      </form>
      <ProfilePreview studioId={studioId} profile={lastValid} stale={!parsed.ok} onChoice={setChoice} />
    </div>
  );
}
