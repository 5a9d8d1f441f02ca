// Display formatting for numbers with units, shared by the pipeline tables and chart captions.

/** A size in bytes as B, kB or MB (powers of 1000, as file managers show them). */
export function formatBytes(size_bytes: number): string {
  if (!Number.isFinite(size_bytes)) return '—';
  if (size_bytes < 1000) return `${size_bytes} B`;
  if (size_bytes < 1e6) return `${(size_bytes / 1e3).toFixed(1)} kB`;
  return `${(size_bytes / 1e6).toFixed(1)} MB`;
}

/** A duration in seconds as "12.3 s" or "4 min 05.0 s". */
export function formatDuration_s(duration_s: number): string {
  if (!Number.isFinite(duration_s)) return '—';
  if (duration_s < 60) return `${duration_s.toFixed(1)} s`;
  const minutes = Math.floor(duration_s / 60);
  return `${minutes} min ${(duration_s - minutes * 60).toFixed(1).padStart(4, '0')} s`;
}

/** The first twelve hex digits of a SHA-256, enough to tell files apart on screen. */
export function shortSha(sha256: string): string {
  return sha256.slice(0, 12);
}

/** A number with up to `digits` significant digits, never "NaN". */
export function formatValue(value: number, digits = 4): string {
  return Number.isFinite(value) ? String(Number(value.toPrecision(digits))) : '—';
}
