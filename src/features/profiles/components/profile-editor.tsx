import { useId, useState } from 'react';
import type { FormEvent } from 'react';
import { JsonInputError, locateJsonPath, parseBudgetText } from '../../../../shared/schemas/budget';
import { parseCueingProfileJson } from '../../../../shared/schemas/cueing-profile';
import type { Profile } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useCreateProfile } from '../api/create-profile';
import { useCreateProfileVersion } from '../api/create-profile-version';

export interface JsonIssue {
  path: string;
  message: string;
  line?: number | undefined;
  column?: number | undefined;
}

/** Checks profile JSON text in the browser with the same shared parsers the server uses; [] when it is valid. */
export function checkProfileText(kind: Profile['kind'], text: string): JsonIssue[] {
  if (kind === 'cueing') {
    const result = parseCueingProfileJson(text);
    return result.ok ? [] : result.issues;
  }
  try {
    parseBudgetText(text, 'budget');
    return [];
  } catch (error) {
    if (error instanceof JsonInputError) {
      return error.problems.map((p) => ({
        path: p.path || '(budget)',
        message: p.reason,
        line: p.line,
        column: p.column,
      }));
    }
    return [{ path: '(budget)', message: error instanceof Error ? error.message : 'could not be read' }];
  }
}

function IssueList({ issues }: { issues: readonly JsonIssue[] }) {
  return (
    <ul
      role="alert"
      aria-label="Problems in the parameters"
      className="flex flex-col gap-0.5 rounded border border-stop-500 bg-white px-3 py-2 text-xs text-stop-700"
    >
      {issues.map((issue, i) => (
        <li key={i}>
          <span className="font-mono font-semibold">{issue.path}</span>
          {issue.line !== undefined ? (
            <span className="text-ink-600">
              {' '}
              (line {issue.line}, column {issue.column})
            </span>
          ) : null}
          : {issue.message}
        </li>
      ))}
    </ul>
  );
}

/**
 * A JSON editor for profile parameters: a new version of `profile`, or a new profile of `kind` when
 * none is given. Problems are shown by field path, with line and column in the text.
 */
export function ProfileEditor({
  studioId,
  kind,
  profile,
  initialText,
  onDone,
}: {
  studioId: string;
  kind: Profile['kind'];
  profile?: Profile;
  initialText: string;
  onDone: () => void;
}) {
  const textId = useId();
  const [text, setText] = useState(initialText);
  const [name, setName] = useState('');
  const [note, setNote] = useState('');
  const [clientIssues, setClientIssues] = useState<JsonIssue[]>([]);
  const [nameError, setNameError] = useState<string | undefined>();
  const createVersion = useCreateProfileVersion(studioId, kind);
  const createProfile = useCreateProfile(studioId, kind);
  const mutation = profile ? createVersion : createProfile;

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const issues = checkProfileText(kind, text);
    setClientIssues(issues);
    const missingName = !profile && !name.trim();
    setNameError(missingName ? 'required' : undefined);
    if (issues.length > 0 || missingName) return;
    const params: unknown = JSON.parse(text);
    if (profile)
      createVersion.mutate({ studioId, profileId: profile.id, params, note }, { onSuccess: onDone });
    else createProfile.mutate({ studioId, kind, name: name.trim(), params, note }, { onSuccess: onDone });
  };

  // Server issues name a field path; find it in the text so the person can go straight to it.
  const serverIssues: JsonIssue[] =
    mutation.error instanceof ApiRequestError
      ? mutation.error.issues.map((issue) => {
          const path = issue.path.replace(/^params\.?/, '') || '(profile)';
          return { path, message: issue.message, ...locateJsonPath(text, path) };
        })
      : [];
  const shownIssues = clientIssues.length > 0 ? clientIssues : serverIssues;

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={profile ? `New version of ${profile.name}` : `New ${kind} profile`}
      className="flex flex-col gap-2"
    >
      {!profile ? (
        <TextField
          label="Profile name"
          value={name}
          error={nameError}
          onChange={(e) => setName(e.target.value)}
          className="max-w-sm"
        />
      ) : null}
      <div className="flex flex-col gap-1">
        <label htmlFor={textId} className="text-xs font-medium text-ink-600">
          Parameters (JSON)
        </label>
        <textarea
          id={textId}
          value={text}
          onChange={(event) => setText(event.target.value)}
          spellCheck={false}
          rows={18}
          aria-invalid={shownIssues.length > 0 || undefined}
          className="rounded border border-ink-200 bg-white px-2 py-1.5 font-mono text-xs text-ink-900"
        />
      </div>
      {shownIssues.length > 0 ? <IssueList issues={shownIssues} /> : null}
      {mutation.error && serverIssues.length === 0 ? <ErrorNotice error={mutation.error} /> : null}
      <TextField label="Note (what changed and why)" value={note} onChange={(e) => setNote(e.target.value)} />
      <div className="flex gap-2">
        <Button type="submit" variant="primary" busy={mutation.isPending}>
          {profile ? 'Save as new version' : 'Create profile'}
        </Button>
        <Button variant="quiet" onClick={onDone}>
          Cancel
        </Button>
      </div>
      {mutation.isSuccess ? <Notice>Saved.</Notice> : null}
    </form>
  );
}
