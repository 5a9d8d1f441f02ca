import { useId } from 'react';
import type { InputHTMLAttributes, ReactNode, TextareaHTMLAttributes } from 'react';

export interface TextFieldProps extends InputHTMLAttributes<HTMLInputElement> {
  label: string;
  error?: string | undefined;
  hint?: ReactNode;
}

/** A labelled input with its hint and its error, wired for screen readers. */
export function TextField({ label, error, hint, className = '', ...input }: TextFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-xs font-medium text-ink-600">
        {label}
      </label>
      <input
        id={id}
        {...input}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`rounded border bg-white px-2 py-1.5 text-sm text-ink-900 ${error ? 'border-stop-500' : 'border-ink-200'}`}
      />
      {hint ? (
        <p id={hintId} className="text-xs text-ink-400">
          {hint}
        </p>
      ) : null}
      {error ? <FieldError id={errorId}>{error}</FieldError> : null}
    </div>
  );
}

/** The red line under a field or a group that says what is wrong with it. */
export function FieldError({ id, children }: { id?: string; children: ReactNode }) {
  return (
    <p id={id} className="text-xs text-stop-700">
      {children}
    </p>
  );
}

export interface CheckboxOption<T extends string> {
  value: T;
  label: string;
}

export interface CheckboxGroupProps<T extends string> {
  legend: string;
  options: readonly CheckboxOption<T>[];
  value: readonly T[];
  onChange: (next: T[]) => void;
  error?: string | undefined;
  disabled?: boolean;
}

/** A fieldset of checkboxes holding a list of chosen values, in the order of the options. */
export function CheckboxGroup<T extends string>({
  legend,
  options,
  value,
  onChange,
  error,
  disabled,
}: CheckboxGroupProps<T>) {
  const errorId = useId();
  const toggle = (option: T, checked: boolean) => {
    const chosen = new Set(value);
    if (checked) chosen.add(option);
    else chosen.delete(option);
    onChange(options.map((o) => o.value).filter((v) => chosen.has(v)));
  };
  return (
    <fieldset
      className="flex flex-col gap-1"
      aria-invalid={error ? true : undefined}
      aria-describedby={error ? errorId : undefined}
      disabled={disabled}
    >
      <legend className="mb-1 text-xs font-medium text-ink-600">{legend}</legend>
      <div className="flex flex-wrap gap-x-4 gap-y-1">
        {options.map((option) => (
          <label key={option.value} className="inline-flex items-center gap-1.5 text-sm text-ink-800">
            <input
              type="checkbox"
              checked={value.includes(option.value)}
              onChange={(event) => toggle(option.value, event.target.checked)}
              className="accent-tealdeep-600"
            />
            {option.label}
          </label>
        ))}
      </div>
      {error ? <FieldError id={errorId}>{error}</FieldError> : null}
    </fieldset>
  );
}

/** Turns a list of `{ path, message }` issues into one message per top-level field name, or per whole path (`keys: 'path'`). */
export function issuesByField(
  issues: readonly { path: string; message: string }[],
  keys: 'top' | 'path' = 'top',
): Record<string, string> {
  const byField: Record<string, string> = {};
  for (const issue of issues) {
    const field = (keys === 'path' ? issue.path : issue.path.split(/[.[]/)[0]) || '_';
    byField[field] = byField[field] ? `${byField[field]}; ${issue.message}` : issue.message;
  }
  return byField;
}

export interface TextAreaFieldProps extends TextareaHTMLAttributes<HTMLTextAreaElement> {
  label: string;
  error?: string | undefined;
  hint?: ReactNode;
}

/** A labelled multi-line input with its hint and its error, wired for screen readers. */
export function TextAreaField({ label, error, hint, className = '', ...input }: TextAreaFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-xs font-medium text-ink-600">
        {label}
      </label>
      <textarea
        id={id}
        rows={3}
        {...input}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`rounded border bg-white px-2 py-1.5 text-sm text-ink-900 ${error ? 'border-stop-500' : 'border-ink-200'}`}
      />
      {hint ? (
        <p id={hintId} className="text-xs text-ink-400">
          {hint}
        </p>
      ) : null}
      {error ? <FieldError id={errorId}>{error}</FieldError> : null}
    </div>
  );
}
