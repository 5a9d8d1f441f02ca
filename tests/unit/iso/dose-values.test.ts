// VDV, crest factor and MTVV (ISO 2631-1:1997, 6.2.1, 6.3.1 and 6.3.2) from their definitions: for a
// steady sine of amplitude a the weighted r.m.s. is |W| a / sqrt(2), the crest factor sqrt(2), the
// 1 s running r.m.s. (MTVV) equals the r.m.s., and VDV = (3/8)^(1/4) |W| a T^(1/4) (the mean of
// sin^4 is 3/8). A short shock raises the crest factor above 9 and the MTVV above the r.m.s.
import { describe, expect, it } from 'vitest';
import { processTrack } from '../../../shared/motion/process';
import { weightingMagnitude } from '../../../shared/motion/iso2631';
import { makeHexapodBase } from '../../factories/motion';
import { makeBudget, makePoseTrackFrom, smoothStep } from '../budget/track-builders';

const base = makeHexapodBase({ controllerRate_hz: 200 });

describe('VDV, crest factor and MTVV', () => {
  it('a steady 4 Hz heave: crest sqrt(2), MTVV = r.m.s., VDV from the closed form; a VDV limit below it is a comfort finding', () => {
    const f = 4;
    const w = 2 * Math.PI * f;
    const a = 0.3; // m/s^2 of heave acceleration
    const T = 40;
    const track = makePoseTrackFrom(200, T, (t) => {
      const s = smoothStep(t, 0, 0.001); // on from the start (the fade is shorter than a sample)
      return [0, 0, (-s * a * Math.sin(w * t)) / (w * w), 0, 0, 0];
    });
    const wk = weightingMagnitude('Wk', f);
    const r = processTrack({
      track,
      base,
      budget: makeBudget({ comfort: { vdvMax_mps1_75: 0.5 } }),
    });
    const c = r.check.comfort;
    expect((c?.wrms_mps2.z ?? 0) / ((wk * a) / Math.SQRT2)).toBeCloseTo(1, 2);
    expect(c?.crestFactor?.z).toBeCloseTo(Math.SQRT2, 1);
    expect((c?.mtvv_mps2?.z ?? 0) / (c?.wrms_mps2.z ?? 1)).toBeCloseTo(1, 1);
    const vdvClosed = Math.pow(3 / 8, 0.25) * wk * a * Math.pow(T, 0.25);
    expect((c?.vdv_mps1_75.z ?? 0) / vdvClosed).toBeCloseTo(1, 1);
    const vdvFinding = r.check.findings.find((x) => x.check === 'vdv' && x.subject === 'z');
    expect(vdvFinding?.severity).toBe('comfort');
    expect(vdvFinding?.limit).toBe(0.5);
  });

  it('a single shock: crest factor above 9 is noted, the MTVV exceeds the r.m.s., no VDV check without a limit', () => {
    const track = makePoseTrackFrom(200, 60, (t) => {
      // A 0.2 s raised-cosine heave bump at 30 s in an otherwise still track.
      const bump = t > 30 && t < 30.2 ? 0.5 - 0.5 * Math.cos((2 * Math.PI * (t - 30)) / 0.2) : 0;
      return [0, 0, 0.01 * bump, 0, 0, 0];
    });
    const r = processTrack({ track, base, budget: makeBudget({}) });
    const c = r.check.comfort;
    expect(c?.crestFactor?.z ?? 0).toBeGreaterThan(9);
    expect(c?.mtvv_mps2?.z ?? 0).toBeGreaterThan(3 * (c?.wrms_mps2.z ?? 0));
    expect(r.notes.some((n) => /Crest factor above 9 on z/.test(n))).toBe(true);
    expect(r.check.uses.some((u) => u.check === 'vdv')).toBe(false);
  });
});
