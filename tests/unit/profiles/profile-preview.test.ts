// The profile editor's live preview against the worker's processing path. The reference is the call
// worker/jobs/cue-run.ts (buildOutputsOf) makes for a run: processTrack({ track, base, budget, profile,
// ramp }) from shared/motion/process.ts, on the whole take. The preview prepares the take once and
// recomputes per profile (shared/motion/preview.ts), reusing the stages a change leaves alone, so it
// must give the same pose, leg lengths and seat specific force, to 1e-9, for every profile it is given
// in turn (a reused stage that should have been computed again, or a write into the prepared take,
// would show here).
import { matrix, multiply, norm, rotationMatrix, add, subtract } from 'mathjs';
import type { Matrix } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { demoRideSamples } from '../../../shared/demo-ride';
import { DEMO_BUDGET } from '../../../shared/schemas/budget';
import { defaultCueingProfile } from '../../../shared/schemas/cueing-profile';
import type { CueingProfile } from '../../../shared/schemas/cueing-profile';
import { demoHexapodBase, demoPlanar3Base } from '../../../shared/schemas/motion-base';
import type { MotionBase } from '../../../shared/schemas/motion-base';
import { processTrack, sig } from '../../../shared/motion/process';
import { seriesBucketEdges } from '../../../shared/motion/run-series';
import {
  computePreviewMotion,
  PREVIEW_BUCKETS,
  computeProfilePreview,
  preparePreviewTake,
  previewChecks,
} from '../../../shared/motion/preview';
import type { Track } from '../../../shared/motion/track-reader';

const TOL = 1e-9;

function demoTake(duration_s = 30): Track {
  const { time_s, samples } = demoRideSamples({ duration_s, rate_hz: 100 });
  const n = time_s.length;
  const columns = Array.from({ length: 6 }, (_, c) => Float64Array.from(samples, (s) => s[c] as number));
  return {
    kind: 'vehicle',
    layout: 'vehicle',
    length: n,
    time_s: Float64Array.from(time_s),
    names: ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'],
    columns,
  };
}

function maxDiff(a: Float64Array, b: Float64Array): number {
  expect(a.length).toBe(b.length);
  let d = 0;
  for (let i = 0; i < a.length; i++) d = Math.max(d, Math.abs((a[i] as number) - (b[i] as number)));
  return d;
}

function stiffer(p: CueingProfile): CueingProfile {
  const q = structuredClone(p);
  q.tilt.angleLimit_deg = 4;
  q.translational.x = { order: 3, naturalFrequency_radps: 3.5, damping: 0.9, breakFrequency_radps: 1.2 };
  q.scale.sway = 0.8;
  return q;
}

const RAMP = { duration_s: 2, profile: 'quintic' as const };

/**
 * An editing session: the default profile, then one field after another changed and kept (every
 * section of the profile, so each stage the preview reuses between changes is changed at some point,
 * alone), then the default again.
 */
function editSession(): CueingProfile[] {
  const edits: ((p: CueingProfile) => void)[] = [
    (p) => (p.tilt.angleLimit_deg = 6),
    (p) => (p.tilt.lowPassFrequency_radps = 4),
    (p) => (p.translational.x.naturalFrequency_radps = 3),
    (p) => (p.rotational.z.frequency_radps = 0.7),
    (p) => (p.scale.sway = 0.8),
    (p) => (p.inputLimit.angularRate_radps.limit = 0.5),
    (p) => (p.poseLimit.roll_deg = 12),
    (p) => (p.poseLimit.knee = 0.7),
  ];
  const p = defaultCueingProfile();
  return [defaultCueingProfile(), ...edits.map((e) => (e(p), structuredClone(p))), defaultCueingProfile()];
}

describe('profile preview against the worker path (processTrack as worker/jobs/cue-run.ts calls it)', () => {
  const track = demoTake();
  const cases: { name: string; base: MotionBase; ramp?: typeof RAMP }[] = [
    { name: 'hexapod, no ramps', base: demoHexapodBase },
    { name: 'hexapod, quintic ramps', base: demoHexapodBase, ramp: RAMP },
    { name: 'planar stage, ramps', base: demoPlanar3Base, ramp: RAMP },
  ];
  for (const c of cases) {
    it(`${c.name}: same legs and seat force for successive profiles`, () => {
      const take = preparePreviewTake(track, c.base.controllerRate_hz);
      for (const profile of [stiffer(defaultCueingProfile()), ...editSession()]) {
        const preview = computePreviewMotion(take, {
          base: c.base,
          profile,
          ...(c.ramp ? { ramp: c.ramp } : {}),
          strokeMargin_m: DEMO_BUDGET.strokeMargin_m,
        });
        const ref = processTrack({
          track,
          base: c.base,
          budget: DEMO_BUDGET,
          profile,
          ...(c.ramp ? { ramp: c.ramp } : {}),
        });
        expect(maxDiff(preview.time_s, ref.time_s)).toBeLessThanOrEqual(TOL);
        for (const k of ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const) {
          expect(maxDiff(preview.pose[k], ref.pose[k])).toBeLessThanOrEqual(TOL);
        }
        expect(preview.legs.length).toBe(ref.legs.length);
        preview.legs.forEach((leg, i) => expect(maxDiff(leg, ref.legs[i]!)).toBeLessThanOrEqual(TOL));
        expect(preview.seatForce_mps2.length).toBe(ref.seatForce_mps2.length);
        preview.seatForce_mps2.forEach((seat, s) =>
          seat.forEach((axis, a) =>
            expect(maxDiff(axis, ref.seatForce_mps2[s]![a]!)).toBeLessThanOrEqual(TOL),
          ),
        );
        // The stroke use read out beside the charts is the run's stroke use for each leg.
        const refStroke = ref.check.uses.filter((u) => u.check === 'stroke');
        preview.strokeUse.forEach((u, i) => {
          const r = refStroke.find((x) => x.subject === `leg${i + 1}`);
          expect(r).toBeDefined();
          expect(Math.abs(u - r!.ratio)).toBeLessThanOrEqual(TOL);
        });
      }
    });
  }

  it("what the Web Worker answers (computeProfilePreview) is the run's own series, bucket by bucket", () => {
    // Reference: processTrack's pose, legs and seat 1 force, reduced here with a plain min/max per
    // bucket of seriesBucketEdges; the peaks are max |v| over the take and the stroke use the run's
    // stroke ratio, all rounded by sig as the preview rounds them. Tolerance 0: the preview must show
    // the very numbers of the run, for each of several profiles given in turn.
    const base = demoHexapodBase;
    const take = preparePreviewTake(track, base.controllerRate_hz);
    for (const profile of [stiffer(defaultCueingProfile()), ...editSession()]) {
      const out = computeProfilePreview(take, {
        base,
        profile,
        ramp: RAMP,
        strokeMargin_m: DEMO_BUDGET.strokeMargin_m,
      });
      const ref = processTrack({ track, base, budget: DEMO_BUDGET, profile, ramp: RAMP });
      const n = ref.time_s.length;
      expect(out.samples).toBe(n);
      const edges = seriesBucketEdges(n, PREVIEW_BUCKETS);
      expect(out.series.time_s).toEqual(Array.from(edges.subarray(0, -1), (e) => ref.time_s[e]));
      const expectBand = (band: { min: number[]; max: number[] }, a: Float64Array) => {
        expect(band.min.length).toBe(edges.length - 1);
        for (let k = 0; k + 1 < edges.length; k++) {
          const part = Array.from(a.subarray(edges[k], edges[k + 1]));
          expect(band.min[k]).toBe(Math.min(...part));
          expect(band.max[k]).toBe(Math.max(...part));
        }
      };
      const peak = (a: Float64Array) => sig(a.reduce((m, v) => Math.max(m, Math.abs(v)), 0));
      for (const k of ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const) {
        expectBand(out.series.pose[k], ref.pose[k]);
        expect(out.peaks.pose[k]).toBe(peak(ref.pose[k]));
      }
      ref.legs.forEach((leg, i) => expectBand(out.series.legs[i]!, leg));
      const seat = ref.seatForce_mps2[0]!;
      (['x', 'y', 'z'] as const).forEach((a, j) => {
        expectBand(out.series.seatForce[a], seat[j]!);
        expect(out.peaks.seatForce[a]).toBe(peak(seat[j]!));
      });
      const refStroke = ref.check.uses.filter((u) => u.check === 'stroke');
      expect(out.strokeUse).toEqual(
        ref.legs.map((_, i) => sig(refStroke.find((u) => u.subject === `leg${i + 1}`)!.ratio)),
      );
      expect(out.peaks.strokeUse).toBe(Math.max(...out.strokeUse));
    }
  });

  it('the budget uses of previewChecks are the run summary uses of the same inputs', () => {
    const profile = stiffer(defaultCueingProfile());
    const checks = previewChecks(track, {
      base: demoHexapodBase,
      profile,
      ramp: RAMP,
      budget: DEMO_BUDGET,
      strokeMargin_m: DEMO_BUDGET.strokeMargin_m,
    });
    const ref = processTrack({ track, base: demoHexapodBase, budget: DEMO_BUDGET, profile, ramp: RAMP });
    expect(checks.uses).toEqual(ref.findings.uses);
    expect(checks.exitCode).toBe(ref.exitCode);
  });

  it('leg lengths agree with |p + R P_i - B_i| computed with mathjs from the preview pose', () => {
    // An oracle outside the motion core: mathjs rotationMatrix and norm, R = Rz(yaw) Ry(pitch) Rx(roll)
    // (docs/motion-conventions.md, section 1).
    const take = preparePreviewTake(track, demoHexapodBase.controllerRate_hz);
    const m = computePreviewMotion(take, {
      base: demoHexapodBase,
      profile: defaultCueingProfile(),
      strokeMargin_m: DEMO_BUDGET.strokeMargin_m,
    });
    const B = demoHexapodBase.baseJoints_m.map((b) => matrix([...b]));
    const P = demoHexapodBase.platformJoints_m.map((p) => matrix([...p]));
    let worst = 0;
    for (let s = 0; s < m.time_s.length; s += 97) {
      const R = multiply(
        multiply(
          rotationMatrix(m.pose.yaw_rad[s]!, matrix([0, 0, 1])),
          rotationMatrix(m.pose.pitch_rad[s]!, matrix([0, 1, 0])),
        ),
        rotationMatrix(m.pose.roll_rad[s]!, matrix([1, 0, 0])),
      ) as Matrix;
      const p = matrix([m.pose.x_m[s]!, m.pose.y_m[s]!, m.pose.z_m[s]! + demoHexapodBase.neutralHeight_m]);
      for (let i = 0; i < 6; i++) {
        const L = norm(subtract(add(p, multiply(R, P[i]!)), B[i]!) as Matrix) as number;
        worst = Math.max(worst, Math.abs(L - m.legs[i]![s]!));
      }
    }
    expect(worst).toBeLessThanOrEqual(TOL);
  });

  it('a lower tilt angle limit lowers the peak pitch the preview reads out', () => {
    const take = preparePreviewTake(track, demoHexapodBase.controllerRate_hz);
    const settings = { base: demoHexapodBase, strokeMargin_m: DEMO_BUDGET.strokeMargin_m };
    const wide = computeProfilePreview(take, { ...settings, profile: defaultCueingProfile() });
    const narrow = computeProfilePreview(take, { ...settings, profile: stiffer(defaultCueingProfile()) });
    expect(narrow.peaks.pose.pitch_rad).toBeLessThan(wide.peaks.pose.pitch_rad);
    // The tilt limit is a bound on the tilt coordination angle (4 deg here), which the pitch includes.
    expect(wide.series.time_s.length).toBeLessThanOrEqual(1000);
  });

  it('refuses a pose take, which no cueing profile changes', () => {
    const pose: Track = { ...track, kind: 'pose', layout: 'hexapod' };
    expect(() => preparePreviewTake(pose, 100)).toThrow(/vehicle takes only/);
  });
});
