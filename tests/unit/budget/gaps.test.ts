// Holes in a track: a spacing over 5 x the median is a gap, named in the notes (times and lines) and
// put in the chart series; a gap over 1 s is bad input naming its line (interpolating across it would
// invent motion: a cubic bridging 2 s of a 100 Hz track is not the ride). Common practice for logged data.
import { describe, expect, it } from 'vitest';
import { ProcessInputError, processTrack } from '../../../shared/motion/process';
import { buildRunSeries } from '../../../shared/motion/run-series';
import { parseTrackText } from '../../../shared/motion/track-reader';
import { runSeriesSchema } from '../../../shared/schemas/run-series';
import { makeHexapodBase } from '../../factories/motion';
import { makeBudget } from './track-builders';

/** A 100 Hz still pose track from 0 to 10 s with the rows strictly inside (from, to) left out. */
function csvWithHole(from: number, to: number): string {
  const lines = ['time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad'];
  for (let i = 0; i <= 1000; i++) {
    const t = i / 100;
    if (t > from + 1e-9 && t < to - 1e-9) continue;
    lines.push(`${t.toFixed(2)},0,0,0,0,0,0`);
  }
  return `${lines.join('\n')}\n`;
}

const base = makeHexapodBase({ controllerRate_hz: 100 });

describe('gaps in a track', () => {
  it('a 0.5 s hole in a 100 Hz track is named in the notes with its times and lines, and is in the chart series', () => {
    const track = parseTrackText(csvWithHole(4, 4.5), { file: 'hole.csv' });
    const r = processTrack({ track, base, budget: makeBudget({}) });
    // Row at 4.00 s is data row 401, file line 402 (the header is line 1); the next row is 4.50 s.
    expect(r.gaps).toEqual([{ start_s: 4, end_s: 4.5 }]);
    expect(r.notes.some((n) => /Gap in the track from 4 s to 4\.5 s \(lines 402-403\)/.test(n))).toBe(true);
    const series = buildRunSeries(r, track, base);
    expect(runSeriesSchema.parse(series).gaps).toEqual([{ start_s: 4, end_s: 4.5 }]);
  });

  it('a spacing of 4 x the median is not a gap', () => {
    const track = parseTrackText(csvWithHole(4, 4.04), { file: 'small.csv' });
    expect(processTrack({ track, base, budget: makeBudget({}) }).gaps).toEqual([]);
  });

  it('a 2 s hole is bad input naming the line after it', () => {
    const track = parseTrackText(csvWithHole(3, 5), { file: 'long.csv' });
    expect(() => processTrack({ track, base, budget: makeBudget({}) })).toThrow(ProcessInputError);
    expect(() => processTrack({ track, base, budget: makeBudget({}) })).toThrow(
      /line 303: time jumps from 3 s to 5 s, a gap of 2 s/,
    );
  });
});
