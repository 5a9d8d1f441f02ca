// A fictional ride's vehicle motion for the demo studio and the tests: slow surge and heave swells and
// a gentle turn, starting from rest and coming back to rest before the end (so the cued platform starts
// and ends at neutral). Invented numbers, no real ride.
import { G0_MPS2 } from './motion/units';

export interface DemoRideOptions {
  duration_s?: number;
  rate_hz?: number;
  /** Peak surge specific force (m/s^2). */
  surge_mps2?: number;
  /** Peak heave deviation (m/s^2). */
  heave_mps2?: number;
  /** Peak yaw rate (rad/s). */
  yaw_radps?: number;
}

/** Seconds of stillness at the end of a demo ride of 20 s or more (shorter rides: in proportion). */
export const REST_TAIL_S = 8;

const fade = (t: number): number => (t <= 0 ? 0 : t < 2 ? (1 - Math.cos((Math.PI * t) / 2)) / 2 : 1);

/** The demo ride as a vehicle track CSV with SI columns. */
export function demoRideCsv(o: DemoRideOptions = {}): string {
  const duration = o.duration_s ?? 20;
  const rate = o.rate_hz ?? 100;
  const surge = o.surge_mps2 ?? 0.8;
  const heave = o.heave_mps2 ?? 0.5;
  const yaw = o.yaw_radps ?? 0.05;
  const n = Math.round(duration * rate) + 1;
  const lines = new Array<string>(n + 1);
  lines[0] = 'time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps,wz_radps';
  for (let i = 0; i < n; i++) {
    const t = i / rate;
    // A smooth onset and fade (1 - cos over 2 s each) so the ride starts at rest, and a still tail of
    // REST_TAIL_S so the washout brings the platform home before the last sample.
    const ramp = fade(t) * fade(duration - REST_TAIL_S * Math.min(1, duration / 20) - t);
    const fx = ramp * surge * Math.sin(2 * Math.PI * 0.3 * t);
    const fz = G0_MPS2 + ramp * heave * Math.sin(2 * Math.PI * 0.7 * t);
    const wz = ramp * yaw * Math.sin(2 * Math.PI * 0.1 * t);
    lines[i + 1] = `${t.toFixed(4)},${fx.toFixed(6)},0,${fz.toFixed(6)},0,0,${wz.toFixed(6)}`;
  }
  return lines.join('\n') + '\n';
}
