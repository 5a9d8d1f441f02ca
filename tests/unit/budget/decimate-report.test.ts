import { describe, expect, it } from 'vitest';
import { decimateMinMax } from '../../../shared/motion/decimate';
import { findingsForJson } from '../../../shared/motion/process';
import { legsCsv } from '../../../shared/motion/run-outputs';
import { buildReport, comfortWording } from '../../../shared/motion/report';
import { DEMO_BUDGET } from '../../../shared/schemas/budget';
import type { CheckResult } from '../../../shared/schemas/findings';

describe('min/max decimation', () => {
  it('keeps the extremes of every bucket, so a one-sample spike survives', () => {
    const n = 10_000;
    const s = new Float64Array(n).map((_, i) => Math.sin(i / 500));
    s[4321] = 7;
    const d = decimateMinMax(s, 0, 1, n, 2, 100, 100);
    expect(d.max.length).toBe(100);
    // Every sample falls in one bucket of 100: bucket 43 holds sample 4321.
    expect(d.max[43]).toBe(7);
    expect(d.time_s[43]).toBeCloseTo(2 + 4300 / 100, 12);
    // Against a plain reduction over the same bucket edges.
    for (let b = 0; b < 100; b++) {
      const slice = Array.from(s.subarray(b * 100, (b + 1) * 100));
      expect(d.min[b]).toBe(Math.min(...slice));
      expect(d.max[b]).toBe(Math.max(...slice));
    }
  });

  it('keeps every sample of a short signal', () => {
    const s = Float64Array.from([3, 1, 2]);
    const d = decimateMinMax(s, 0, 1, 3, 0, 10, 2000);
    expect(Array.from(d.min)).toEqual([3, 1, 2]);
    expect(Array.from(d.max)).toEqual([3, 1, 2]);
  });
});

const result: CheckResult = {
  within: false,
  findings: [
    {
      check: 'stroke',
      severity: 'hard',
      subject: 'leg3',
      start_s: 12.31,
      end_s: 12.9,
      // A leg at 2.312 m with the demo stroke band [1.52, 2.28] m: 0.412 m from mid-stroke 1.90 m,
      // against the half-width 0.38 m.
      value: 0.412,
      limit: 0.38,
      ratio: 0.412 / 0.38,
    },
    {
      check: 'envelope',
      severity: 'hard',
      subject: 'seat2',
      start_s: 3.005,
      end_s: 4.505,
      value: 1.5,
      limit: 1,
      ratio: 1.5,
      axis: 'x',
      row: 1,
    },
  ],
  uses: [
    { check: 'stroke', subject: 'leg3', ratio: 0.412 / 0.38 },
    { check: 'jerk', subject: 'x', ratio: 0.99996 },
  ],
};

describe('findings JSON and report text', () => {
  it('rounds for reading but never shows a ratio under 1 as 1', () => {
    const j = findingsForJson(result);
    // 0.412 / 0.38 = 1.084210..., rounded to four decimals.
    expect(j.findings[0]?.ratio).toBe(1.0842);
    expect(j.uses[1]?.ratio).toBe(0.9999);
  });

  it('says the result, names each finding with its span, and carries the cautions', () => {
    const text = buildReport(result, {
      inputFile: 'ride.csv',
      inputKind: 'vehicle',
      inputRows: 100,
      start_s: 0,
      end_s: 20,
      baseName: 'Harbour Lights Dome',
      baseKind: 'hexapod',
      seats: 4,
      rate_hz: 100,
      profileName: null,
      budget: DEMO_BUDGET,
      budgetIsDemo: true,
      softwareVersion: '0.1.0',
    });
    expect(text).toMatch(/RESULT: OVER A HARD LIMIT/);
    expect(text).toMatch(
      /Leg stroke, leg3, 12\.31-12\.90 s: 0\.412 m from mid-stroke, past the half-width 0\.38 m of the usable band \(108\.4 % of the limit\)/,
    );
    expect(text).toMatch(/x stayed outside \[-0\.5, 0\.5\] g for 1\.5 s; the row allows less than 1 s/);
    expect(text).toMatch(/DEMO budget/);
    expect(text).toMatch(/never replaces/);
    expect(text).toMatch(/qualified person/);
  });

  it('uses the comfort wording of ISO 2631-1 Annex C (from memory) at the range edges', () => {
    expect(comfortWording(0.3)).toBe('not uncomfortable');
    expect(comfortWording(0.4)).toBe('a little uncomfortable');
    expect(comfortWording(3)).toBe('extremely uncomfortable');
  });

  it('writes legs CSV in the documented columns with plain zeros', () => {
    const csv = legsCsv({ time_s: Float64Array.from([0, 0.01]), legs: [Float64Array.from([1.9, -1e-12])] });
    expect(csv).toBe('time_s,leg1_m\n0.000000,1.900000000\n0.010000,0.000000000\n');
  });
});
