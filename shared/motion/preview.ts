// The cueing profile editor's live preview: what a run of a vehicle take would move, recomputed on every
// change of the profile. The take is prepared once per take and controller rate (the gap check and the
// anti-alias resampling of processTrack, which do not depend on the profile); each change then runs
// the same motion code as processTrack, in the same order: the classical washout (cueClassical), the
// planar stage's dropped axes, the controller's ramps from and to neutral (rampedColumn, the columns
// of withNeutralRamps), the platform's motion (platformAcceleration and platformRotation, the two
// halves of platformMotion), inverse kinematics (hexapodInverse / planar3Inverse) and the seat
// specific force (seatForceFromMotion).
// Between changes the prepared take keeps the stages' results (StageCache): the washout's channels,
// each ramped column and both halves of the platform's motion are computed again only when something
// they read has changed, so a change of the tilt limits, say, leaves the translational channel, its
// ramps and the origin's acceleration as they were. Stages computed again write into their previous
// arrays, which keeps the garbage collector out of the way. The numbers are the same as without any
// reuse (tests/unit/profiles/profile-preview.test.ts compares them with processTrack's).
// The budget's full checks (runChecks with every comfort figure) take about a second on a 10-minute
// take, so the editor runs them apart, through processTrack itself (previewChecks), and shows the
// stroke use computed here until they arrive.
import type { Budget } from '../schemas/budget';
import type { ControllerOutput } from '../schemas/controller-output';
import type { CueingProfile } from '../schemas/cueing-profile';
import type { Use } from '../schemas/findings';
import type { MotionBase } from '../schemas/motion-base';
import type { SeriesBand } from '../schemas/run-series';
import { strokeBand } from './checks';
import { rampedColumn, rampedTime } from './controller-output';
import type { PoseColumns } from './hexapod';
import { hexapodGeometry, hexapodInverse } from './hexapod';
import { planar3Geometry, planar3Inverse } from './planar3';
import { ProcessInputError, processTrack, sig } from './process';
import { GAP_MAX_S, findGaps, medianSpacing, resampleAntiAlias } from './resample';
import { seriesBucketEdges } from './run-series';
import type { PlatformMotion, PlatformRotation } from './seat-force';
import { platformAcceleration, platformRotation, seatForceFromMotion } from './seat-force';
import { NO_STAGE_CACHE, StageCache } from './stage-cache';
import type { Track } from './track-reader';
import { trackColumn } from './track-reader';
import { cueClassical } from './washout';

/** Buckets of the preview charts (min/max per bucket, as the run charts). */
export const PREVIEW_BUCKETS = 1000;

/** A vehicle take resampled to a controller rate, ready for any number of previews. */
export interface PreviewTake {
  rate_hz: number;
  time_s: Float64Array;
  fx_mps2: Float64Array;
  fy_mps2: Float64Array;
  fz_mps2: Float64Array;
  wx_radps: Float64Array;
  wy_radps: Float64Array;
  wz_radps: Float64Array;
  /**
   * The stages of the last previews on this take (washout channels, ramps, platform motion), reused by
   * the next preview where its inputs are the same; absent, every preview computes every stage.
   */
  cache?: StageCache;
}

/**
 * Resamples a vehicle take to the controller rate as processTrack does (the same gap rule, the same
 * anti-alias low-pass); throws ProcessInputError for a take processTrack would refuse.
 */
export function preparePreviewTake(track: Track, rate_hz: number): PreviewTake {
  if (track.kind !== 'vehicle') {
    throw new ProcessInputError(
      'a cueing profile applies to vehicle takes only (a pose or legs take is played as it is)',
    );
  }
  const spacing = medianSpacing(track.time_s);
  for (const g of findGaps(track, spacing)) {
    if (g.end_s - g.start_s > GAP_MAX_S) {
      throw new ProcessInputError(
        `time jumps from ${g.start_s} s to ${g.end_s} s, a gap over ${GAP_MAX_S} s: motion across it would be invented`,
      );
    }
  }
  const rs = resampleAntiAlias(track, rate_hz).track;
  if (rs.length < 4) {
    throw new ProcessInputError(
      `the take spans ${rs.length} sample(s) at the controller rate ${rate_hz} Hz; at least 4 are needed`,
    );
  }
  return {
    rate_hz,
    time_s: rs.time_s,
    fx_mps2: trackColumn(rs, 'fx_mps2'),
    fy_mps2: trackColumn(rs, 'fy_mps2'),
    fz_mps2: trackColumn(rs, 'fz_mps2'),
    wx_radps: trackColumn(rs, 'wx_radps'),
    wy_radps: trackColumn(rs, 'wy_radps'),
    wz_radps: trackColumn(rs, 'wz_radps'),
    cache: new StageCache(),
  };
}

/** What a preview is computed with: the venue's base, its controller ramps, and the profile being edited. */
export interface PreviewSettings {
  base: MotionBase;
  profile: CueingProfile;
  ramp?: ControllerOutput['ramp'];
  /** The stroke margin of the venue's budget (m); 0 when no budget is known. */
  strokeMargin_m: number;
}

/** The preview's motion at the controller rate, and the figures shown beside the charts. */
export interface PreviewMotion {
  rate_hz: number;
  time_s: Float64Array;
  /** Pose offsets from neutral (m, rad); a planar stage keeps z, roll and pitch at 0. */
  pose: PoseColumns;
  /** Leg lengths (m), leg1 first. */
  legs: Float64Array[];
  /** Specific force at each seat [x, y, z] (m/s^2, platform frame), before the rider low-pass. */
  seatForce_mps2: (readonly [Float64Array, Float64Array, Float64Array])[];
  /** Highest stroke use per leg (0 at mid-stroke, 1 at the margin; strokeUse of checks.ts). */
  strokeUse: number[];
}

/** Min/max chart bands of a preview, on one time axis. */
export interface PreviewSeries {
  time_s: number[];
  pose: Record<keyof PoseColumns, SeriesBand>;
  legs: SeriesBand[];
  /** Seat 1's specific force per axis (m/s^2). */
  seatForce: { x: SeriesBand; y: SeriesBand; z: SeriesBand };
  stroke: { low_m: number; high_m: number; mid_m: number };
}

/** Peaks read out beside the charts (m, rad, m/s^2) and the worst stroke use. */
export interface PreviewPeaks {
  pose: Record<keyof PoseColumns, number>;
  seatForce: { x: number; y: number; z: number };
  strokeUse: number;
  strokeLeg: number;
}

/** What the preview's Web Worker answers for one profile: the chart bands and the read-outs. */
export interface PreviewOutput {
  samples: number;
  rate_hz: number;
  series: PreviewSeries;
  peaks: PreviewPeaks;
  strokeUse: number[];
}

const POSE_KEYS = ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const;

/**
 * The motion of one profile on a prepared take (see the file comment: processTrack's steps, in its
 * order). With the take's cache, the arrays returned belong to it: read them before the next preview
 * on the same take, which may write over them.
 */
export function computePreviewMotion(take: PreviewTake, settings: PreviewSettings): PreviewMotion {
  const m = previewMotion(take, settings, 'all');
  const band = strokeBand(settings.base.leg, settings.strokeMargin_m);
  // strokeUse(L) = |L - mid| / half-width grows with |L - mid|, so the worst use is the largest excursion
  // over the half-width (a rounded division by one positive number keeps the order: the same value).
  return { ...m, strokeUse: m.legs.map((leg) => peakAbs(leg, band.mid_m) / band.halfWidth_m) };
}

/** computePreviewMotion's steps; `seats` says whether every seat's force is wanted or seat 1's alone. */
function previewMotion(
  take: PreviewTake,
  settings: PreviewSettings,
  seats: 'all' | 'first',
): Omit<PreviewMotion, 'strokeUse'> {
  const { base, profile } = settings;
  const rate_hz = take.rate_hz;
  if (rate_hz !== base.controllerRate_hz) {
    throw new ProcessInputError(
      `the take was prepared at ${rate_hz} Hz but the base runs at ${base.controllerRate_hz} Hz`,
    );
  }
  const c = take.cache ?? NO_STAGE_CACHE;
  const n = take.time_s.length;
  const cued = cueClassical(take, profile, take.cache);
  const p = cued.pose;
  let pose: PoseColumns = {
    x_m: p.x_m,
    y_m: p.y_m,
    z_m: p.z_m,
    roll_rad: p.roll_rad,
    pitch_rad: p.pitch_rad,
    yaw_rad: p.yaw_rad,
  };
  if (base.kind === 'planar3') {
    // Read-only zeros, shared by the previews of this take.
    const zeros = c.stage('planar.zeros', [n], () => new Float64Array(n));
    pose.z_m = zeros;
    pose.roll_rad = zeros;
    pose.pitch_rad = zeros;
  }
  let time_s = take.time_s;
  const ramp = settings.ramp;
  if (ramp && ramp.duration_s > 0) {
    // withNeutralRamps, column by column, so an unchanged column keeps its ramped copy.
    const rampInputs = [rate_hz, ramp.duration_s, ramp.profile];
    time_s = c.stage('ramp.time', [take.time_s, ...rampInputs], () => rampedTime(take.time_s, rate_hz, ramp));
    const col = (k: keyof PoseColumns) =>
      c.stage<Float64Array>(`ramp.${k}`, [pose[k], ...rampInputs], (prev) =>
        rampedColumn(pose[k], rate_hz, ramp, prev),
      );
    pose = {
      x_m: col('x_m'),
      y_m: col('y_m'),
      z_m: col('z_m'),
      roll_rad: col('roll_rad'),
      pitch_rad: col('pitch_rad'),
      yaw_rad: col('yaw_rad'),
    };
  }
  // platformMotion in its two parts, each reused while its three columns are the same; inverse
  // kinematics then reads the rotation matrices instead of computing the same ones again.
  const accel_mps2 = c.stage<Float64Array>('motion.accel', [pose.x_m, pose.y_m, pose.z_m, rate_hz], (prev) =>
    platformAcceleration({ rate_hz, ...pose }, prev),
  );
  const rot = c.stage(
    'motion.rotation',
    [pose.roll_rad, pose.pitch_rad, pose.yaw_rad, rate_hz, pose.x_m.length],
    (prev: PlatformRotation | undefined) => platformRotation({ rate_hz, ...pose }, pose.x_m.length, prev),
  );
  const m = pose.x_m.length;
  const motion: PlatformMotion = { length: m, rate_hz, accel_mps2, ...rot };
  const legs =
    base.kind === 'hexapod'
      ? hexapodInverse(
          hexapodGeometry(base),
          pose,
          [0, 1, 2, 3, 4, 5].map((i) => c.buffer(`legs.${i}`, m)),
          motion.rotation,
        )
      : planar3Inverse(planar3Geometry(base), { x_m: pose.x_m, y_m: pose.y_m, yaw_rad: pose.yaw_rad });
  const seatForce_mps2 = (seats === 'all' ? base.seats_m : base.seats_m.slice(0, 1)).map((seat, s) => {
    const f = seatForceFromMotion(motion, seat, {
      x: c.buffer(`seat${s}.x`, m),
      y: c.buffer(`seat${s}.y`, m),
      z: c.buffer(`seat${s}.z`, m),
    });
    return [f.x, f.y, f.z] as const;
  });
  return { rate_hz, time_s, pose, legs, seatForce_mps2 };
}

function peakAbs(a: Float64Array, offset = 0): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs((a[i] as number) - offset));
  return m;
}

/** Min and max per bucket of `edges` (a chart band, unrounded) and over the whole signal, in one pass. */
function bandAndRange(signal: Float64Array, edges: Int32Array): { band: SeriesBand; lo: number; hi: number } {
  const count = edges.length - 1;
  if (signal.length !== (edges[count] as number)) {
    throw new RangeError(`a chart signal of ${signal.length} samples on a time axis of ${edges[count]}`);
  }
  const min = new Array<number>(count);
  const max = new Array<number>(count);
  let lo = Infinity;
  let hi = -Infinity;
  for (let b = 0; b < count; b++) {
    let bl = Infinity;
    let bh = -Infinity;
    const end = edges[b + 1] as number;
    for (let i = edges[b] as number; i < end; i++) {
      const v = signal[i] as number;
      if (v < bl) bl = v;
      if (v > bh) bh = v;
    }
    min[b] = bl;
    max[b] = bh;
    if (bl < lo) lo = bl;
    if (bh > hi) hi = bh;
  }
  return { band: { min, max }, lo, hi };
}

/**
 * The preview for one profile: the motion (computePreviewMotion's steps) reduced to chart bands and
 * read-outs. This is the function the editor's Web Worker calls on every change. The bands are the exact
 * min and max of each bucket; each peak |v| is the larger of |min| and |max| over the take, and each
 * leg's stroke use the larger excursion of its longest and shortest length from mid-stroke, which are
 * the same numbers a pass of |v| (or strokeUse) over every sample gives.
 */
export function computeProfilePreview(take: PreviewTake, settings: PreviewSettings): PreviewOutput {
  // The charts show seat 1's force: the other seats are not computed here.
  const m = previewMotion(take, settings, 'first');
  const n = m.time_s.length;
  const edges = seriesBucketEdges(n, PREVIEW_BUCKETS);
  const time_s: number[] = [];
  for (let k = 0; k + 1 < edges.length; k++) time_s.push(m.time_s[edges[k] as number] as number);
  const stroke = strokeBand(settings.base.leg, settings.strokeMargin_m);
  const peak = (r: { lo: number; hi: number }) => Math.max(Math.abs(r.lo), Math.abs(r.hi));
  const pose = Object.fromEntries(POSE_KEYS.map((k) => [k, bandAndRange(m.pose[k], edges)])) as Record<
    keyof PoseColumns,
    ReturnType<typeof bandAndRange>
  >;
  const legs = m.legs.map((leg) => bandAndRange(leg, edges));
  const use = legs.map((r) => Math.max(r.hi - stroke.mid_m, stroke.mid_m - r.lo) / stroke.halfWidth_m);
  const seat = m.seatForce_mps2[0];
  const force = [0, 1, 2].map((a) => bandAndRange(seat?.[a] ?? new Float64Array(n), edges));
  const [fx, fy, fz] = force as [
    ReturnType<typeof bandAndRange>,
    ReturnType<typeof bandAndRange>,
    ReturnType<typeof bandAndRange>,
  ];
  let strokeLeg = 0;
  use.forEach((u, i) => {
    if (u > (use[strokeLeg] ?? 0)) strokeLeg = i;
  });
  return {
    samples: n,
    rate_hz: m.rate_hz,
    series: {
      time_s,
      pose: {
        x_m: pose.x_m.band,
        y_m: pose.y_m.band,
        z_m: pose.z_m.band,
        roll_rad: pose.roll_rad.band,
        pitch_rad: pose.pitch_rad.band,
        yaw_rad: pose.yaw_rad.band,
      },
      legs: legs.map((r) => r.band),
      seatForce: { x: fx.band, y: fy.band, z: fz.band },
      stroke: { low_m: stroke.low_m, high_m: stroke.high_m, mid_m: stroke.mid_m },
    },
    peaks: {
      pose: Object.fromEntries(POSE_KEYS.map((k) => [k, sig(peak(pose[k]))])) as Record<
        keyof PoseColumns,
        number
      >,
      seatForce: seat ? { x: sig(peak(fx)), y: sig(peak(fy)), z: sig(peak(fz)) } : { x: 0, y: 0, z: 0 },
      strokeUse: sig(use[strokeLeg] ?? 0),
      strokeLeg: strokeLeg + 1,
    },
    strokeUse: use.map(sig),
  };
}

/** The budget's verdict on a preview: every check's use, as a run would record it. */
export interface PreviewChecks {
  uses: Use[];
  within: boolean;
  exitCode: 0 | 3 | 4;
  findings: number;
}

/**
 * Every check of the budget on the take with this profile: processTrack itself (the worker's path), so
 * the uses are the ones a run with these settings would record. About a second on a 10-minute take.
 */
export function previewChecks(track: Track, settings: PreviewSettings & { budget: Budget }): PreviewChecks {
  const r = processTrack({
    track,
    base: settings.base,
    budget: settings.budget,
    profile: settings.profile,
    ...(settings.ramp ? { ramp: settings.ramp } : {}),
  });
  return {
    uses: r.findings.uses,
    within: r.findings.within,
    exitCode: r.exitCode,
    findings: r.findings.findings.length,
  };
}
