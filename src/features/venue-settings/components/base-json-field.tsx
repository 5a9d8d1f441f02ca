import { useId } from 'react';
import { lineColumn, locateJsonPath, scanJson } from '../../../../shared/schemas/json-input';
import { FieldError } from '../../../components/ui/form';

/** One problem shown under the base textarea: JSON path, reason, and where it is in the text when known. */
export interface BaseIssue {
  path: string;
  message: string;
  line?: number;
  column?: number;
}

export type BaseJsonResult = { ok: true; base: unknown } | { ok: false; issue: BaseIssue };

/** Parses the textarea's motion base JSON; a syntax error names its line and column in the text. */
export function readBaseJson(text: string): BaseJsonResult {
  try {
    return { ok: true, base: JSON.parse(text) as unknown };
  } catch (error) {
    const reason = error instanceof Error ? error.message : 'not valid JSON';
    // JSON.parse on Node 20 and in some browsers gives no position, so the strict scanner finds it.
    const scan = scanJson(text);
    const where = scan.ok ? {} : lineColumn(text, scan.offset);
    return { ok: false, issue: { path: '(JSON)', message: `not valid JSON: ${reason}`, ...where } };
  }
}

/** Server issues (paths relative to the base) with their line and column in the submitted text. */
export function locateBaseIssues(text: string, issues: readonly { path: string; message: string }[]) {
  return issues.map((issue): BaseIssue => ({ ...issue, ...locateJsonPath(text, issue.path) }));
}

/** The motion base JSON textarea with its problems listed underneath, each with path and position. */
export function BaseJsonField({
  label,
  value,
  onChange,
  issues,
  rows = 18,
}: {
  label: string;
  value: string;
  onChange: (text: string) => void;
  issues: readonly BaseIssue[];
  rows?: number;
}) {
  const id = useId();
  const issuesId = `${id}-issues`;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-xs font-medium text-ink-600">
        {label}
      </label>
      <textarea
        id={id}
        value={value}
        rows={rows}
        spellCheck={false}
        onChange={(event) => onChange(event.target.value)}
        aria-invalid={issues.length > 0 ? true : undefined}
        aria-describedby={issues.length > 0 ? issuesId : undefined}
        className={`rounded border bg-white px-2 py-1.5 font-mono text-xs text-ink-900 ${issues.length > 0 ? 'border-stop-500' : 'border-ink-200'}`}
      />
      {issues.length > 0 ? (
        <ul id={issuesId} aria-label={`Problems in ${label}`} className="flex flex-col gap-0.5">
          {issues.map((issue, i) => (
            <li key={i}>
              <FieldError>
                <span className="font-mono">{issue.path}</span>
                {issue.line !== undefined ? ` (line ${issue.line}, column ${issue.column ?? 1})` : ''}:{' '}
                {issue.message}
              </FieldError>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
