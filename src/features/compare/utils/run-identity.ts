// The words that tell compared runs apart: what each run was made with, beside its take and venue.
import type { RunDetail } from '../../../../shared/schemas/pipeline';
import type { Touchup } from '../../../../shared/schemas/touchup';

/** "Run A", "Run B", ... in the order of the address. */
export function runLetter(k: number): string {
  return `Run ${String.fromCharCode(65 + k)}`;
}

/** A touch-up in a few words: what it changes and by how much. */
export function touchupWords(t: Touchup): string {
  const parts: string[] = [];
  if (t.offset_s !== 0) parts.push(`shift ${t.offset_s} s`);
  if (t.trimIn_s !== undefined || t.trimOut_s !== undefined)
    parts.push(`trim ${t.trimIn_s ?? 0}–${t.trimOut_s ?? 'end'} s`);
  for (const [axis, gain] of Object.entries(t.gain)) if (gain !== 1) parts.push(`${axis} × ${gain}`);
  for (const [axis, hz] of Object.entries(t.smoothing_hz)) parts.push(`${axis} smoothed ${hz} Hz`);
  if (t.fadeIn_s > 0) parts.push(`fade in ${t.fadeIn_s} s`);
  if (t.fadeOut_s > 0) parts.push(`fade out ${t.fadeOut_s} s`);
  return parts.join(', ') || 'none';
}

export function versionWords(v: { name: string; version: number } | null): string {
  return v ? `${v.name} v${v.version}` : 'none (pose or legs take)';
}

/** The verdict of a finished run, or what it is waiting for. */
export function verdictWords(run: Pick<RunDetail, 'result' | 'state'>): string {
  if (run.result) return run.result.within ? 'Within budget' : 'Over budget';
  if (run.state === 'failed') return 'Failed, no result';
  return 'No result yet';
}
