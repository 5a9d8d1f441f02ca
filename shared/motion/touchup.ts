// Applies a take touch-up (shared/schemas/touchup.ts) to a parsed track, before cueing. The order is
// fixed and documented: offset, trim, gain, smoothing, fades. Gains and fades act on the departure
// from rest (a vehicle at rest and level: f = (0, 0, +g0), w = 0; a pose or leg track: its value at
// neutral, which is 0 for pose offsets), so a fade ends exactly at rest and a gain never scales
// gravity. Leg-length tracks take only the offset and the trim: their rest is the base's neutral
// length, which a file alone does not know.
import type { Touchup, TouchupAxis } from '../schemas/touchup';
import { TOUCHUP_AXES } from '../schemas/touchup';
import { filterInto, lowPass2, steadyState } from './filters';
import { resampleLinear } from './resample';
import type { Track } from './track-reader';
import { G0_MPS2 } from './units';

/** The axes a touch-up may name for a take of this kind and layout (none for leg lengths). */
export function touchupAxesOf(kind: Track['kind'], layout: Track['layout']): TouchupAxis[] {
  if (kind === 'vehicle') return ['fx', 'fy', 'fz', 'wx', 'wy', 'wz'];
  if (kind === 'pose')
    return layout === 'planar3' ? ['x', 'y', 'yaw'] : ['x', 'y', 'z', 'roll', 'pitch', 'yaw'];
  return [];
}

/** A touch-up that cannot apply to this track (names the setting and why). */
export class TouchupError extends Error {
  override name = 'TouchupError';
}

const axisOf = (siName: string) => siName.slice(0, siName.indexOf('_')) as TouchupAxis;

/** The value of a column at rest, in SI. */
function restValue(track: Track, siName: string): number {
  return track.kind === 'vehicle' && siName === 'fz_mps2' ? G0_MPS2 : 0;
}

function trackAxes(track: Track): TouchupAxis[] {
  return track.names
    .map(axisOf)
    .filter((a): a is TouchupAxis => (TOUCHUP_AXES as readonly string[]).includes(a));
}

function checkAxes(track: Track, setting: 'gain' | 'smoothing_hz', keys: string[]): void {
  if (keys.length === 0) return;
  if (track.kind === 'legs') {
    throw new TouchupError(`${setting}: a leg-length track takes only offset_s and the trim`);
  }
  const have = trackAxes(track);
  for (const k of keys) {
    if (!have.includes(k as TouchupAxis)) {
      throw new TouchupError(
        `${setting}.${k}: this ${track.kind} track has no ${k} axis (it has ${have.join(', ')})`,
      );
    }
  }
}

/** Value of column `col` at time t by linear interpolation between samples i and i + 1. */
function lerpAt(time: Float64Array, col: Float64Array, i: number, t: number): number {
  const t0 = time[i] as number;
  const t1 = time[i + 1] as number;
  const s = t1 > t0 ? (t - t0) / (t1 - t0) : 0;
  return (col[i] as number) + s * ((col[i + 1] as number) - (col[i] as number));
}

/** Index of the last sample at or before t (time strictly increasing, t within range). */
function lastAtOrBefore(time: Float64Array, t: number): number {
  let lo = 0;
  let hi = time.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if ((time[mid] as number) <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Cuts the track to [from, to] (s), with the ends interpolated so the window is exact. */
function trim(track: Track, from: number, to: number): Track {
  const time = track.time_s;
  const n = time.length;
  const first = time[0] as number;
  const last = time[n - 1] as number;
  if (from >= last)
    throw new TouchupError(`trimIn_s: ${from} s is at or after the take's end (${last} s after the offset)`);
  if (to <= first)
    throw new TouchupError(
      `trimOut_s: ${to} s is at or before the take's start (${first} s after the offset)`,
    );
  const a = Math.max(from, first);
  const b = Math.min(to, last);
  const ia = lastAtOrBefore(time, a);
  const ib = lastAtOrBefore(time, b);
  // Samples strictly inside (a, b), plus the two interpolated ends.
  const innerStart = ia + 1;
  const innerEnd = (time[ib] as number) === b ? ib - 1 : ib;
  const inner = Math.max(0, innerEnd - innerStart + 1);
  const m = inner + 2;
  const outT = new Float64Array(m);
  outT[0] = a;
  outT.set(time.subarray(innerStart, innerStart + inner), 1);
  outT[m - 1] = b;
  const columns = track.columns.map((col) => {
    const out = new Float64Array(m);
    out[0] = ia < n - 1 ? lerpAt(time, col, ia, a) : (col[ia] as number);
    out.set(col.subarray(innerStart, innerStart + inner), 1);
    out[m - 1] = ib < n - 1 ? lerpAt(time, col, ib, b) : (col[ib] as number);
    return out;
  });
  return { ...track, length: m, time_s: outT, columns, lines: undefined };
}

function medianSpacing(time: Float64Array): number {
  const d = new Float64Array(time.length - 1);
  for (let i = 1; i < time.length; i++) d[i - 1] = (time[i] as number) - (time[i - 1] as number);
  d.sort();
  return d[d.length >> 1] as number;
}

/** Zero-phase low-pass in place: 2nd-order Butterworth forwards then backwards, started in steady state. */
function smoothInPlace(col: Float64Array, cutoff_hz: number, rate_hz: number): void {
  const cascade = lowPass2(cutoff_hz, Math.SQRT1_2, rate_hz);
  filterInto(cascade, col, col, steadyState(cascade, col[0] as number));
  col.reverse();
  filterInto(cascade, col, col, steadyState(cascade, col[0] as number));
  col.reverse();
}

/** Raised-cosine weight rising from 0 at u = 0 to 1 at u = 1. */
const rise = (u: number) => (u <= 0 ? 0 : u >= 1 ? 1 : 0.5 - 0.5 * Math.cos(Math.PI * u));

/** The track with the touch-up applied (a new track; the input is not changed). */
export function applyTouchup(input: Track, t: Touchup): Track {
  if (input.length < 2) throw new TouchupError('a touch-up needs a take of at least two samples');
  let track: Track = input;

  if (t.offset_s !== 0) {
    const time_s = new Float64Array(track.time_s.length);
    for (let i = 0; i < time_s.length; i++) time_s[i] = (track.time_s[i] as number) + t.offset_s;
    track = { ...track, time_s };
  }
  if (t.trimIn_s !== undefined || t.trimOut_s !== undefined) {
    track = trim(track, t.trimIn_s ?? -Infinity, t.trimOut_s ?? Infinity);
  }

  const gainKeys = Object.keys(t.gain);
  const smoothKeys = Object.keys(t.smoothing_hz);
  checkAxes(track, 'gain', gainKeys);
  checkAxes(track, 'smoothing_hz', smoothKeys);
  const fades = t.fadeIn_s > 0 || t.fadeOut_s > 0;
  if (fades && track.kind === 'legs')
    throw new TouchupError('fadeIn_s, fadeOut_s: a leg-length track takes only offset_s and the trim');
  if (gainKeys.length === 0 && smoothKeys.length === 0 && !fades) return track;

  // Smoothing needs a uniform grid: a take with uneven spacing is first put on its median spacing.
  if (smoothKeys.length > 0) {
    const dt = medianSpacing(track.time_s);
    const uniform = track.time_s.every(
      (v, i, a) => i === 0 || Math.abs(v - (a[i - 1] as number) - dt) < dt * 1e-6,
    );
    if (!uniform) {
      const r = resampleLinear(track.time_s, track.columns, 1 / dt);
      track = { ...track, length: r.time_s.length, time_s: r.time_s, columns: r.columns, lines: undefined };
    }
    const rate_hz = 1 / dt;
    for (const k of smoothKeys) {
      const f = t.smoothing_hz[k as TouchupAxis] as number;
      if (f >= 0.45 * rate_hz) {
        throw new TouchupError(
          `smoothing_hz.${k}: ${f} Hz is not below 0.45 x the take's sample rate (${(0.45 * rate_hz).toFixed(3)} Hz)`,
        );
      }
    }
  }

  const time = track.time_s;
  const n = time.length;
  const t0 = time[0] as number;
  const tEnd = time[n - 1] as number;
  const columns = track.columns.map((src, c) => {
    const name = track.names[c] as string;
    const axis = axisOf(name);
    const rest = restValue(track, name);
    const gain = t.gain[axis] ?? 1;
    const cutoff = t.smoothing_hz[axis];
    if (gain === 1 && cutoff === undefined && !fades) return src;
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = gain * ((src[i] as number) - rest);
    if (cutoff !== undefined) smoothInPlace(out, cutoff, 1 / medianSpacing(time));
    for (let i = 0; i < n; i++) {
      const ti = time[i] as number;
      const w =
        (t.fadeIn_s > 0 ? rise((ti - t0) / t.fadeIn_s) : 1) *
        (t.fadeOut_s > 0 ? rise((tEnd - ti) / t.fadeOut_s) : 1);
      out[i] = rest + w * (out[i] as number);
    }
    return out;
  });
  return { ...track, columns };
}
