// Timecode arithmetic against the drop-frame rules of SMPTE ST 12-1 (formerly SMPTE 12M): at 29.97 fps
// the labels 00 and 01 are skipped at the start of every minute except minutes 00, 10, 20, 30, 40, 50;
// no frame is dropped, only labels. Counts below follow from that rule by hand arithmetic.
import { describe, expect, it } from 'vitest';
import {
  FRAME_RATES,
  TimecodeError,
  dayFrames,
  framesToSeconds,
  framesToTimecode,
  motionTimeToTimecode,
  secondsToFrames,
  timecodeToFrames,
} from '../../../shared/motion/timecode';
import { filmSyncSchema } from '../../../shared/schemas/film-sync';

const DF = FRAME_RATES['29.97df'];
const NDF = FRAME_RATES['29.97'];

describe('29.97 drop-frame labels (SMPTE ST 12-1 drop-frame rule)', () => {
  it('skips 00 and 01 after 00:00:59;29: frame 1800 is labelled 00:01:00;02', () => {
    // 60 s x 30 labels = 1800 labels in minute 0, none skipped (minute 0 is a tenth minute).
    expect(framesToTimecode(1799, DF)).toBe('00:00:59;29');
    expect(framesToTimecode(1800, DF)).toBe('00:01:00;02');
    expect(timecodeToFrames('00:01:00;02', DF)).toBe(1800);
  });

  it('does not skip at the tenth minute: 00:10:00;00 exists and is frame 17982', () => {
    // Minutes 1..9 skip 2 labels each: 10 x 1800 - 9 x 2 = 17982.
    expect(framesToTimecode(17_981, DF)).toBe('00:09:59;29');
    expect(framesToTimecode(17_982, DF)).toBe('00:10:00;00');
    expect(framesToTimecode(17_983, DF)).toBe('00:10:00;01');
    expect(timecodeToFrames('00:10:00;00', DF)).toBe(17_982);
  });

  it('counts 107,892 frames in one hour of labels, within a frame of 3600 s x 30000/1001', () => {
    // 6 x 17982 = 107892; 3600 x 29.97003 = 107892.1 (the point of drop-frame labels).
    expect(timecodeToFrames('01:00:00;00', DF)).toBe(107_892);
    expect(Math.abs(framesToSeconds(107_892, DF) - 3600)).toBeLessThan(1 / 29.97);
    expect(timecodeToFrames('01:00:00:00', NDF)).toBe(108_000);
  });

  it('refuses a skipped label with the minute it belongs to', () => {
    expect(() => timecodeToFrames('00:01:00;00', DF)).toThrow(TimecodeError);
    expect(() => timecodeToFrames('00:01:00;01', DF)).toThrow(/skipped at the start of minute 01/);
    expect(timecodeToFrames('00:20:00;00', DF)).toBe(2 * 17_982);
  });

  it('round-trips every frame of the first 25 minutes and the end of the day', () => {
    for (let f = 0; f < 25 * 1800; f++) expect(timecodeToFrames(framesToTimecode(f, DF), DF)).toBe(f);
    const last = dayFrames(DF) - 1;
    expect(framesToTimecode(last, DF)).toBe('23:59:59;29');
    expect(timecodeToFrames('23:59:59;29', DF)).toBe(last);
  });
});

describe('non-drop rates', () => {
  it('counts labels at the nominal rate', () => {
    expect(framesToTimecode(24 * 3600 - 1, FRAME_RATES['24'])).toBe('00:59:59:23');
    expect(timecodeToFrames('10:00:00:00', FRAME_RATES['25'])).toBe(10 * 3600 * 25);
    expect(framesToTimecode(59, FRAME_RATES['60'])).toBe('00:00:00:59');
    expect(() => timecodeToFrames('00:00:00:25', FRAME_RATES['25'])).toThrow(/00 to 24/);
  });

  it('23.976 fps counts 24 labels per labelled second, so one labelled hour is 3603.6 s', () => {
    // 86400 frames x 1001/24000 s = 3603.6 s (the usual 0.1 % pull-down of 24 fps film).
    const r = FRAME_RATES['23.976'];
    expect(timecodeToFrames('01:00:00:00', r)).toBe(86_400);
    expect(framesToSeconds(86_400, r)).toBeCloseTo(3603.6, 9);
  });
});

describe('motion time to picture timecode', () => {
  it('adds the start timecode and subtracts the motion offset', () => {
    const r = FRAME_RATES['25'];
    expect(motionTimeToTimecode(0, r, '01:00:00:00')).toBe('01:00:00:00');
    expect(motionTimeToTimecode(2.5, r, '01:00:00:00')).toBe('01:00:02:12');
    // Motion offset +5 frames: motion time 2.5 s shows the picture 5 frames earlier.
    expect(motionTimeToTimecode(2.5, r, '01:00:00:00', 5)).toBe('01:00:02:07');
  });

  it('maps seconds to the frame on screen without rounding errors at frame boundaries', () => {
    expect(secondsToFrames(framesToSeconds(12_345, DF), DF)).toBe(12_345);
    expect(secondsToFrames(0.999, FRAME_RATES['24'])).toBe(23);
  });
});

describe('film sync settings', () => {
  it('names a label that does not exist at the chosen rate', () => {
    const r = filmSyncSchema.safeParse({ frameRate: '29.97df', startTimecode: '00:03:00;00' });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path).toEqual(['startTimecode']);
    expect(filmSyncSchema.parse({ frameRate: '24' })).toEqual({
      frameRate: '24',
      startTimecode: '00:00:00:00',
      offset_frames: 0,
    });
  });
});
