import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'danger' | 'quiet' | 'onDark';

const VARIANTS: Record<Variant, string> = {
  primary: 'bg-tealdeep-600 text-white hover:bg-tealdeep-700 border-tealdeep-700',
  secondary: 'bg-white text-ink-800 hover:bg-ink-100 border-ink-200',
  danger: 'bg-white text-stop-700 hover:bg-stop-500 hover:text-white border-stop-500',
  quiet: 'bg-transparent text-ink-600 hover:text-ink-900 hover:bg-ink-100 border-transparent',
  onDark: 'bg-transparent text-ink-100 hover:text-white hover:bg-ink-800 border-ink-600',
};

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: Variant;
  size?: 'sm' | 'md';
  busy?: boolean;
}

/** A button in one of the app's few variants; `busy` disables it while its action runs. */
export function Button({
  variant = 'secondary',
  size = 'md',
  busy = false,
  className = '',
  disabled,
  ...rest
}: ButtonProps) {
  const sizing = size === 'sm' ? 'px-2 py-0.5 text-xs' : 'px-3 py-1.5 text-sm';
  return (
    <button
      type="button"
      {...rest}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={`inline-flex items-center gap-1 rounded border font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-50 ${sizing} ${VARIANTS[variant]} ${className}`}
    />
  );
}
