// Run time (s) as the picture's timecode, for a run with film sync (the take's rate and start
// timecode, the run's offset). Labels follow SMPTE ST 12-1 (drop-frame at 29.97 fps), shared/motion/timecode.ts.
import { FRAME_RATES, motionTimeToTimecode } from '../../../../shared/motion/timecode';
import type { FilmSync } from '../../../../shared/schemas/film-sync';

/** The timecode on screen at run time t_s, or null without film sync or for a time before the picture. */
export function runTimecode(t_s: number, sync: FilmSync | null): string | null {
  if (!sync || !Number.isFinite(t_s)) return null;
  return motionTimeToTimecode(
    Math.max(0, t_s),
    FRAME_RATES[sync.frameRate],
    sync.startTimecode,
    sync.offset_frames,
  );
}

/** "29.97 fps drop-frame, starts 01:00:00;00, motion +3 frames" */
export function describeFilmSync(sync: FilmSync): string {
  const o = sync.offset_frames;
  const offset =
    o === 0
      ? 'motion on the picture'
      : `motion ${o > 0 ? '+' : '−'}${Math.abs(o)} frame${Math.abs(o) === 1 ? '' : 's'}`;
  return `${FRAME_RATES[sync.frameRate].label}, starts ${sync.startTimecode}, ${offset}`;
}
