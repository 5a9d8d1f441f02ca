// What a venue's motion controller loads: actuator positions at the controller rate, measured from the
// fully retracted length (the base's leg.min_m) in mm, as CSV and as little-endian float32 frames
// (one frame = one value per actuator, in leg order), and optionally as encoder counts. Also the
// ramps from neutral at rest into the show's first pose and back out of its last, so the platform
// never jumps at show start or stop. Pure: bytes are built in Uint8Arrays, no Buffer.
import type { ControllerOutput, RampProfile } from '../schemas/controller-output';
import type { PoseColumns } from './hexapod';

/** The binary file's layout, written into the manifest so any reader can decode it. */
export interface FrameLayout {
  file: string;
  format: 'float32' | 'int32';
  byteOrder: 'little-endian';
  valuesPerFrame: number;
  bytesPerFrame: number;
  frames: number;
  rate_hz: number;
  columns: string[];
  unit: 'mm' | 'counts';
  zero: string;
  header: 'none';
}

/** Positions (mm) of each actuator from its fully retracted length retracted_m, one array per leg. */
export function actuatorPositions_mm(legs_m: readonly Float64Array[], retracted_m: number): Float64Array[] {
  return legs_m.map((leg) => {
    const out = new Float64Array(leg.length);
    for (let i = 0; i < leg.length; i++) out[i] = ((leg[i] as number) - retracted_m) * 1000;
    return out;
  });
}

/** Encoder counts of each position: round(mm x countsPerMm + zeroOffset_counts). */
export function encoderCounts(
  positions_mm: readonly Float64Array[],
  enc: NonNullable<ControllerOutput['encoder']>,
): Float64Array[] {
  return positions_mm.map((p) => {
    const out = new Float64Array(p.length);
    for (let i = 0; i < p.length; i++)
      out[i] = Math.round((p[i] as number) * enc.countsPerMm + enc.zeroOffset_counts);
    return out;
  });
}

/** Little-endian float32 frames: frame k holds value k of every column, in column order. */
export function float32Frames(columns: readonly Float64Array[]): Uint8Array {
  return frames(columns, (view, at, v) => view.setFloat32(at, v, true));
}

/** Frames of four-byte values, frame k holding every column's k-th value; `put` writes one value. */
function frames(
  columns: readonly Float64Array[],
  put: (view: DataView, at: number, v: number, column: number, frame: number) => void,
): Uint8Array {
  const n = columns[0]?.length ?? 0;
  const c = columns.length;
  const bytes = new Uint8Array(n * c * 4);
  const view = new DataView(bytes.buffer);
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < c; j++) put(view, (k * c + j) * 4, (columns[j] as Float64Array)[k] as number, j, k);
  }
  return bytes;
}

/** Thrown when encoder counts do not fit the controller's signed 32-bit integers. */
export class ControllerOutputError extends Error {
  override name = 'ControllerOutputError';
}

/**
 * Little-endian signed 32-bit integer frames of encoder counts, laid out as float32Frames. A count
 * outside the int32 range is refused, naming the leg and frame, rather than wrapped.
 */
export function int32Frames(columns: readonly Float64Array[]): Uint8Array {
  return frames(columns, (view, at, v, j, k) => {
    if (!Number.isInteger(v) || v < -2_147_483_648 || v > 2_147_483_647) {
      throw new ControllerOutputError(
        `leg${j + 1} frame ${k}: ${v} encoder counts do not fit a signed 32-bit integer; ` +
          'lower counts per mm or move the zero offset',
      );
    }
    view.setInt32(at, v, true);
  });
}

/** The manifest's description of a frame file: float32 millimetres or int32 encoder counts. */
export function frameLayout(
  file: string,
  columns: string[],
  frames: number,
  rate_hz: number,
  kind: 'mm' | 'counts' = 'mm',
): FrameLayout {
  return {
    file,
    format: kind === 'mm' ? 'float32' : 'int32',
    byteOrder: 'little-endian',
    valuesPerFrame: columns.length,
    bytesPerFrame: columns.length * 4,
    frames,
    rate_hz,
    columns,
    unit: kind,
    zero:
      kind === 'mm'
        ? 'fully retracted actuator length (leg.min_m of the motion base)'
        : 'counts = round(mm x countsPerMm + zeroOffset_counts), mm from the fully retracted length',
    header: 'none',
  };
}

/** CSV of actuator positions (mm, three decimals) and, when given, encoder counts. */
export function controllerCsv(
  time_s: Float64Array,
  positions_mm: readonly Float64Array[],
  counts?: readonly Float64Array[],
): string {
  const legs = positions_mm.map((_, i) => `leg${i + 1}`);
  const header = ['time_s', ...legs.map((l) => `${l}_mm`), ...(counts ? legs.map((l) => `${l}_counts`) : [])];
  const lines = new Array<string>(time_s.length + 1);
  lines[0] = header.join(',');
  const row = new Array<string>(header.length);
  for (let i = 0; i < time_s.length; i++) {
    row[0] = (time_s[i] as number).toFixed(6);
    for (let j = 0; j < positions_mm.length; j++)
      row[1 + j] = ((positions_mm[j] as Float64Array)[i] as number).toFixed(3);
    if (counts) {
      for (let j = 0; j < counts.length; j++) {
        row[1 + positions_mm.length + j] = String((counts[j] as Float64Array)[i] as number);
      }
    }
    lines[i + 1] = row.join(',');
  }
  return `${lines.join('\n')}\n`;
}

// Quintic Hermite basis from rest: p(0) = p'(0) = p''(0) = 0, p(1) = P, p'(1) = V, p''(1) = A (in the
// ramp's unit time). With V = A = 0 it is the minimum-jerk smoothstep 10u^3 - 15u^4 + 6u^5.
function quinticFromRest(u: number, P: number, V: number, A: number): number {
  const u3 = u * u * u;
  const u4 = u3 * u;
  const u5 = u4 * u;
  return P * (10 * u3 - 15 * u4 + 6 * u5) + V * (-4 * u3 + 7 * u4 - 3 * u5) + A * (0.5 * u3 - u4 + 0.5 * u5);
}

/** Raised cosine from 0 to P: zero speed at both ends (the acceleration steps there). */
const raisedCosine = (u: number, P: number) => P * (0.5 - 0.5 * Math.cos(Math.PI * u));

/** Shape value at u in [0, 1] of a ramp from neutral at rest to (P, V, A), V and A per ramp length. */
function rampValue(profile: RampProfile, u: number, P: number, V: number, A: number): number {
  return profile === 'quintic' ? quinticFromRest(u, P, V, A) : raisedCosine(u, P);
}

/**
 * The show's pose with its ramps. The show keeps its own times: the ramp in plays at the rampIn_s
 * seconds before the show's first sample (negative times for a show starting at 0), the ramp out in
 * the rampOut_s seconds after its last.
 */
export interface RampedPose {
  time_s: Float64Array;
  pose: PoseColumns;
  /** Length of the ramp into the show (s). */
  rampIn_s: number;
  rampOut_s: number;
  /** Index of the show's first and last frame in the ramped columns. */
  showStartFrame: number;
  showEndFrame: number;
}

const POSE_KEYS = ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const;

/**
 * The time axis of withNeutralRamps (which calls this): the show's own times, with the r ramp samples
 * before its first and after its last at the uniform rate; time_s itself when there is no ramp.
 */
export function rampedTime(
  time_s: Float64Array,
  rate_hz: number,
  ramp: ControllerOutput['ramp'],
): Float64Array {
  const n = time_s.length;
  const r = Math.round(ramp.duration_s * rate_hz);
  if (r === 0 || n < 3) return time_s;
  const dt = 1 / rate_hz;
  const out = new Float64Array(n + 2 * r);
  const t0 = time_s[0] as number;
  const t1 = time_s[n - 1] as number;
  out.set(time_s, r);
  for (let k = 0; k < r; k++) {
    out[k] = t0 - (r - k) * dt;
    out[n + r + k] = t1 + (k + 1) * dt;
  }
  return out;
}

/**
 * One pose column with the ramps of withNeutralRamps (which calls this for each column): r =
 * round(duration x rate) samples from neutral at rest before it and as many back to neutral after it.
 * The column itself is returned unchanged when there is no ramp (r = 0 or fewer than 3 samples).
 * `previous` (a column this returned before) is written over when it has the ramped length.
 */
export function rampedColumn(
  src: Float64Array,
  rate_hz: number,
  ramp: ControllerOutput['ramp'],
  previous?: Float64Array,
): Float64Array {
  const n = src.length;
  const r = Math.round(ramp.duration_s * rate_hz);
  if (r === 0 || n < 3) return src;
  const dt = 1 / rate_hz;
  const d = r * dt;
  const m = n + 2 * r;
  // Every sample is written below, so the previous column of this length can take the new one.
  const col = previous && previous.length === m && previous !== src ? previous : new Float64Array(m);
  col.set(src, r);
  // One-sided speed and acceleration of the show at its ends, scaled to the ramp's unit time.
  const v0 = (((src[1] as number) - (src[0] as number)) / dt) * d;
  const a0 = (((src[2] as number) - 2 * (src[1] as number) + (src[0] as number)) / (dt * dt)) * d * d;
  const v1 = (((src[n - 1] as number) - (src[n - 2] as number)) / dt) * d;
  const a1 =
    (((src[n - 1] as number) - 2 * (src[n - 2] as number) + (src[n - 3] as number)) / (dt * dt)) * d * d;
  for (let k = 0; k < r; k++) {
    // Ramp in: u from 0 (neutral, k = 0) towards 1 (the show's first sample at k = r).
    col[k] = rampValue(ramp.profile, k / r, src[0] as number, v0, a0);
    // Ramp out, mirrored in time: from the last sample (u = 1) down to neutral (u = 0) at the end.
    const u = (r - 1 - k) / r;
    col[n + r + k] = rampValue(ramp.profile, u, src[n - 1] as number, -v1, a1);
  }
  return col;
}

/**
 * Adds a ramp from neutral at rest (pose offset 0) into the first pose and one from the last pose back
 * to neutral at rest, at the uniform rate of the show. The quintic ramp meets the show's position,
 * speed and acceleration at the join, so nothing steps there; the raised cosine meets the position only.
 */
export function withNeutralRamps(
  time_s: Float64Array,
  pose: PoseColumns,
  rate_hz: number,
  ramp: ControllerOutput['ramp'],
): RampedPose {
  const n = time_s.length;
  const r = Math.round(ramp.duration_s * rate_hz);
  if (r === 0 || n < 3) {
    return { time_s, pose, rampIn_s: 0, rampOut_s: 0, showStartFrame: 0, showEndFrame: n - 1 };
  }
  const d = r * (1 / rate_hz);
  const out = rampedTime(time_s, rate_hz, ramp);
  const ramped = {} as Record<(typeof POSE_KEYS)[number], Float64Array>;
  for (const key of POSE_KEYS) ramped[key] = rampedColumn(pose[key], rate_hz, ramp);
  return {
    time_s: out,
    pose: ramped,
    rampIn_s: d,
    rampOut_s: d,
    showStartFrame: r,
    showEndFrame: r + n - 1,
  };
}
