// Track names in error messages read as plain English: a vehicle track has no base layout, so the
// layout is never put before the kind ("a vehicle vehicle track").
import { describe, expect, it } from 'vitest';
import { TrackFileError, parseTrackText } from '../../../shared/motion/track-reader';
import { trackName } from '../../../shared/motion/track-names';

function messageOf(text: string): string {
  try {
    parseTrackText(text, { file: 'ride.csv' });
  } catch (e) {
    if (e instanceof TrackFileError) return e.message;
    throw e;
  }
  throw new Error('expected a TrackFileError');
}

describe('track names', () => {
  it('names each kind and layout once', () => {
    expect(trackName('vehicle', 'vehicle')).toBe('vehicle track');
    expect(trackName('pose', 'hexapod')).toBe('hexapod pose track');
    expect(trackName('legs', 'planar3')).toBe('planar-stage legs track');
  });

  it('says "a vehicle track" when a vehicle column is missing', () => {
    const message = messageOf('time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps\n0,0,0,9.8,0,0\n');
    expect(message).toMatch(/missing column "wz_radps" or "wz_degps" for a vehicle track/);
    expect(message).not.toMatch(/vehicle vehicle/);
  });
});
