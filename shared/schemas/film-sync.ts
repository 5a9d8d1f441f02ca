// Film sync settings of a take: the picture rate, the first frame's timecode and the motion's offset
// against the picture. Used by the upload form, the API, the worker and the package manifest.
import { z } from 'zod';
import { text } from './text';
import { FRAME_RATES, FRAME_RATE_IDS, timecodeToFrames } from '../motion/timecode';

export const frameRateIdSchema = z.enum(FRAME_RATE_IDS);

/** Film sync settings a take carries: picture rate, the first frame's timecode, and the motion's offset. */
export const filmSyncSchema = z
  .strictObject({
    frameRate: frameRateIdSchema,
    startTimecode: text().default('00:00:00:00'),
    /** Motion against picture, in frames; positive plays the motion later. */
    offset_frames: z
      .number({ error: 'must be a whole number of frames' })
      .int('must be a whole number of frames')
      .min(-100_000)
      .max(100_000)
      .default(0),
  })
  .superRefine((v, ctx) => {
    try {
      timecodeToFrames(v.startTimecode, FRAME_RATES[v.frameRate]);
    } catch (e) {
      ctx.addIssue({ code: 'custom', path: ['startTimecode'], message: (e as Error).message });
    }
  });
export type FilmSync = z.infer<typeof filmSyncSchema>;
