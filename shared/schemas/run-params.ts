// A cue run's own parameters, beside the take, the venue and the profile versions: what a producer set
// for this run only. They are part of the run's identity (cue_runs.params counts in the unique key), so
// a change is a new run and the old one is never rewritten.
import { z } from 'zod';
import type { FilmSync } from './film-sync';
import { isIdentityTouchup, touchupSchema } from './touchup';
import type { Touchup } from './touchup';
import { controllerOutputSchema } from './controller-output';
import type { ControllerOutput } from './controller-output';

/** The bound of a film offset in frames (the same as the take's film sync). */
export const FILM_OFFSET_MAX_FRAMES = 100_000;
export const filmOffsetSchema = z
  .number({ error: 'must be a whole number of frames' })
  .int('must be a whole number of frames')
  .min(-FILM_OFFSET_MAX_FRAMES)
  .max(FILM_OFFSET_MAX_FRAMES);

export const runParamsSchema = z.strictObject({
  /**
   * The motion's offset against the picture (frames; positive plays the motion later) for a take with
   * film sync. Recorded on every run of such a take, from the take's own offset unless a producer
   * nudged it; absent when the take has no film sync. It changes the sync, not the motion.
   */
  filmOffset_frames: filmOffsetSchema.optional(),
  /** The take touch-up applied before cueing; absent when none (an identity touch-up counts as none). */
  touchup: touchupSchema.optional(),
  /**
   * The venue controller's settings when the run was queued (ramps from and to neutral, encoder
   * counts), so the run and its package keep them when the venue changes; absent on runs made before
   * venues had them (no ramps, millimetres only).
   */
  controller: controllerOutputSchema.optional(),
});
export type RunParams = z.infer<typeof runParamsSchema>;

/** A run's parameters in their one stored form: an identity touch-up dropped, absent keys left out. */
export function normalRunParams(p: {
  filmOffset_frames?: number | undefined;
  touchup?: Touchup | undefined;
  controller?: ControllerOutput | undefined;
}): RunParams {
  const out: RunParams = {};
  if (p.filmOffset_frames !== undefined) out.filmOffset_frames = p.filmOffset_frames;
  if (p.touchup && !isIdentityTouchup(p.touchup)) out.touchup = p.touchup;
  if (p.controller) out.controller = p.controller;
  return out;
}

/** The film sync a run plays with: the take's, with the run's own offset; null for a take without. */
export function runFilmSync(take: FilmSync | null, params: RunParams): FilmSync | null {
  if (!take) return null;
  return { ...take, offset_frames: params.filmOffset_frames ?? take.offset_frames };
}

/** The body of POST .../runs/:run/film-offset: the new offset of the motion against the picture. */
export const filmOffsetBody = z.strictObject({ offset_frames: filmOffsetSchema });
