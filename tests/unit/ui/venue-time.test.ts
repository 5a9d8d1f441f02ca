// Venue times: where a venue is the subject, an instant reads in the venue's own zone, labelled.
// Offsets from the IANA time zone database: Asia/Tokyo is UTC+9 with no daylight saving;
// America/Los_Angeles is UTC-8 in December (PST).
import { describe, expect, it } from 'vitest';
import { checkLabel, formatVenueTime } from '../../../src/lib/format';

describe('formatVenueTime', () => {
  it("shows the venue's local time with the zone beside it", () => {
    expect(formatVenueTime('2026-12-02T09:30:00.000Z', 'Asia/Tokyo')).toBe('02 Dec 2026, 18:30 Asia/Tokyo');
    expect(formatVenueTime('2026-12-02T09:30:00.000Z', 'America/Los_Angeles')).toBe(
      '02 Dec 2026, 01:30 America/Los_Angeles',
    );
  });

  it('falls back to a labelled browser time for an unknown zone and keeps non-dates as they came', () => {
    expect(formatVenueTime('2026-12-02T09:30:00.000Z', 'Not/AZone')).toMatch(/2026/);
    expect(formatVenueTime('soon', 'Asia/Tokyo')).toBe('soon');
  });
});

describe('checkLabel', () => {
  it("reads a run summary's worst check in people words", () => {
    expect(checkLabel('stroke leg4')).toBe('Leg stroke, Leg 4');
    expect(checkLabel('wrms')).toBe('Weighted r.m.s. acceleration');
    expect(checkLabel('unknownKey')).toBe('unknownKey');
  });
});
