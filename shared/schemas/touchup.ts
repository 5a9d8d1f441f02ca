// Take touch-up: small fixes a producer applies to a take before cueing, recorded in the run's
// parameters so the worker and `legwork process --touchup` apply the same ones. Times in s, cut-offs
// in Hz; gains are plain factors on the motion's departure from rest.
import { z } from 'zod';

/** Axes a touch-up can address: vehicle (specific force, angular rate) and pose (offsets, angles). */
export const TOUCHUP_AXES = [
  'fx',
  'fy',
  'fz',
  'wx',
  'wy',
  'wz',
  'x',
  'y',
  'z',
  'roll',
  'pitch',
  'yaw',
] as const;
export const touchupAxisSchema = z.enum(TOUCHUP_AXES);
export type TouchupAxis = z.infer<typeof touchupAxisSchema>;

export const touchupSchema = z
  .strictObject({
    /** Shifts the whole take in time; positive plays it later (s). */
    offset_s: z.number().min(-3600).max(3600).default(0),
    /** Keeps only the take from trimIn_s to trimOut_s, measured after the offset (s). */
    trimIn_s: z.number().min(0).max(86_400).optional(),
    trimOut_s: z.number().positive().max(86_400).optional(),
    /** Per-axis factor on the departure from rest (0 removes an axis, 1 leaves it). */
    gain: z.partialRecord(touchupAxisSchema, z.number().min(0).max(10)).default({}),
    /** Per-axis zero-phase low-pass cut-off (Hz): a 2nd-order Butterworth run forwards and backwards. */
    smoothing_hz: z.partialRecord(touchupAxisSchema, z.number().positive().max(1000)).default({}),
    /** Raised-cosine fade from rest at the start and back to rest at the end (s). */
    fadeIn_s: z.number().min(0).max(600).default(0),
    fadeOut_s: z.number().min(0).max(600).default(0),
  })
  .refine((t) => t.trimIn_s === undefined || t.trimOut_s === undefined || t.trimOut_s > t.trimIn_s, {
    path: ['trimOut_s'],
    message: 'trimOut_s must be later than trimIn_s',
  });
export type Touchup = z.infer<typeof touchupSchema>;

/** True when a touch-up changes nothing (so runs without one and with an empty one are the same). */
export function isIdentityTouchup(t: Touchup): boolean {
  return (
    t.offset_s === 0 &&
    t.trimIn_s === undefined &&
    t.trimOut_s === undefined &&
    Object.values(t.gain).every((g) => g === 1) &&
    Object.keys(t.smoothing_hz).length === 0 &&
    t.fadeIn_s === 0 &&
    t.fadeOut_s === 0
  );
}
