// Film timecode (SMPTE ST 12-1): frame counts, labels and seconds for the picture rates a ride film
// is delivered at. Drop-frame labels (29.97 fps) skip frame numbers 00 and 01 at the start of every
// minute except each tenth minute, so the label stays within a frame or two of wall-clock time; the
// frames themselves are never dropped. Drop-frame labels write ';' before the frame field.

/** A picture rate: exact frames per second num/den, the nominal integer rate its labels count in. */
export interface FrameRate {
  readonly id: FrameRateId;
  readonly label: string;
  readonly num: number;
  readonly den: number;
  /** Frames per labelled second (24 for 23.976, 30 for 29.97). */
  readonly nominal: number;
  readonly dropFrame: boolean;
}

export const FRAME_RATE_IDS = ['23.976', '24', '25', '29.97df', '29.97', '30', '50', '60'] as const;
export type FrameRateId = (typeof FRAME_RATE_IDS)[number];

export const FRAME_RATES: Readonly<Record<FrameRateId, FrameRate>> = {
  '23.976': { id: '23.976', label: '23.976 fps', num: 24_000, den: 1001, nominal: 24, dropFrame: false },
  '24': { id: '24', label: '24 fps', num: 24, den: 1, nominal: 24, dropFrame: false },
  '25': { id: '25', label: '25 fps', num: 25, den: 1, nominal: 25, dropFrame: false },
  '29.97df': {
    id: '29.97df',
    label: '29.97 fps drop-frame',
    num: 30_000,
    den: 1001,
    nominal: 30,
    dropFrame: true,
  },
  '29.97': {
    id: '29.97',
    label: '29.97 fps non-drop',
    num: 30_000,
    den: 1001,
    nominal: 30,
    dropFrame: false,
  },
  '30': { id: '30', label: '30 fps', num: 30, den: 1, nominal: 30, dropFrame: false },
  '50': { id: '50', label: '50 fps', num: 50, den: 1, nominal: 50, dropFrame: false },
  '60': { id: '60', label: '60 fps', num: 60, den: 1, nominal: 60, dropFrame: false },
};

/** Thrown for a label that is not a timecode at the given rate (names the label and why). */
export class TimecodeError extends Error {
  override name = 'TimecodeError';
}

// Drop-frame constants for the 30-count labels of 29.97 fps.
const DROP = 2;
const DF_FRAMES_PER_MINUTE = 60 * 30 - DROP; // 1798
const DF_FRAMES_PER_10_MINUTES = 10 * DF_FRAMES_PER_MINUTE + DROP; // 17982

const TC_RE = /^(\d{2}):(\d{2}):(\d{2})([:;.])(\d{2})$/;

const pad2 = (n: number) => (n < 10 ? `0${n}` : String(n));

/** Frame number (0-based, from 00:00:00:00) of a timecode label; throws TimecodeError on a bad label. */
export function timecodeToFrames(label: string, rate: FrameRate): number {
  const m = TC_RE.exec(label.trim());
  if (!m)
    throw new TimecodeError(`"${label}" is not a timecode (HH:MM:SS:FF, or HH:MM:SS;FF for drop-frame)`);
  const [hh, mm, ss, ff] = [m[1], m[2], m[3], m[5]].map(Number) as [number, number, number, number];
  if (mm > 59 || ss > 59) throw new TimecodeError(`"${label}": minutes and seconds run from 00 to 59`);
  if (ff >= rate.nominal) {
    throw new TimecodeError(`"${label}": frames run from 00 to ${pad2(rate.nominal - 1)} at ${rate.label}`);
  }
  if (rate.dropFrame && ss === 0 && ff < DROP && mm % 10 !== 0) {
    throw new TimecodeError(
      `"${label}" does not exist in drop-frame timecode: frames 00 and 01 are skipped at the start of minute ${pad2(mm)}`,
    );
  }
  const nominalFrames = ((hh * 60 + mm) * 60 + ss) * rate.nominal + ff;
  if (!rate.dropFrame) return nominalFrames;
  const minutes = hh * 60 + mm;
  return nominalFrames - DROP * (minutes - Math.floor(minutes / 10));
}

/** Timecode label of a frame number (0-based); labels wrap at 24 hours like a timecode generator. */
export function framesToTimecode(frames: number, rate: FrameRate): string {
  if (!Number.isInteger(frames) || frames < 0)
    throw new TimecodeError(`frame number ${frames} is not a whole number >= 0`);
  let f = frames;
  if (rate.dropFrame) {
    const tens = Math.floor(f / DF_FRAMES_PER_10_MINUTES);
    const rest = f % DF_FRAMES_PER_10_MINUTES;
    // Labels skipped before this frame: 18 per whole ten minutes, 2 per minute begun after the tenth.
    f += 9 * DROP * tens + (rest > DROP ? DROP * Math.floor((rest - DROP) / DF_FRAMES_PER_MINUTE) : 0);
  }
  const ff = f % rate.nominal;
  const totalSeconds = Math.floor(f / rate.nominal);
  const ss = totalSeconds % 60;
  const mm = Math.floor(totalSeconds / 60) % 60;
  const hh = Math.floor(totalSeconds / 3600) % 24;
  return `${pad2(hh)}:${pad2(mm)}:${pad2(ss)}${rate.dropFrame ? ';' : ':'}${pad2(ff)}`;
}

/** Start time (s) of a frame number at the exact rate num/den. */
export function framesToSeconds(frames: number, rate: FrameRate): number {
  return (frames * rate.den) / rate.num;
}

/** The frame on screen at time t_s (s from the first frame): floor(t * num / den), robust to rounding. */
export function secondsToFrames(t_s: number, rate: FrameRate): number {
  const exact = (t_s * rate.num) / rate.den;
  const near = Math.round(exact);
  return Math.abs(exact - near) < 1e-6 ? near : Math.floor(exact);
}

/**
 * The picture's timecode label at motion time t_s, for a film whose first frame carries `start` and
 * whose motion is offset by offset_frames against the picture (positive: motion plays later).
 */
export function motionTimeToTimecode(
  t_s: number,
  rate: FrameRate,
  start = '00:00:00:00',
  offset_frames = 0,
): string {
  const frame = timecodeToFrames(start, rate) + secondsToFrames(t_s, rate) - offset_frames;
  const day = dayFrames(rate);
  return framesToTimecode(((frame % day) + day) % day, rate);
}

/** Frames in 24 hours of labels at this rate. */
export function dayFrames(rate: FrameRate): number {
  return rate.dropFrame ? 24 * 6 * DF_FRAMES_PER_10_MINUTES : 24 * 3600 * rate.nominal;
}
