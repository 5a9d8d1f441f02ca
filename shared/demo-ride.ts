// A fictional ride's vehicle motion for the demo studio and the tests: a car that waits in the station,
// launches, sweeps through a banked left turn, crests a small hill, drops and pulls out, banks right,
// rattles over three bumps, brakes and stops. Invented, no real ride. The track is built from a path
// (speed, heading, climb angle and bank as smooth functions of time) and the specific force and body
// angular rates follow from rigid-body kinematics, so what the file says is physically consistent:
// level at rest it reads +g0 on z, and it starts and ends at rest and level.
import { G0_MPS2, RAD_PER_DEG } from './motion/units';

export interface DemoRideOptions {
  /** Length of the take (s); the ride's script is stretched or squeezed to fit. Default 60. */
  duration_s?: number;
  /** Sample rate of the file (Hz). Default 100. */
  rate_hz?: number;
  /**
   * How hard the ride is driven: 1 is the gentle house cut; it scales the launch, the turn angles, the
   * drop and the bumps, so 4 is the demo's hot cut.
   */
  intensity?: number;
  /** How sharp the three bumps are, on top of the intensity: 1 is a soft rumble, 3 a rattle. Default 1. */
  bumps?: number;
}

/** The script's length at the nominal pace (s). */
export const DEMO_RIDE_NOMINAL_S = 60;

// A raised-cosine pulse on [t0, t0 + T] with unit peak, and its derivative.
function pulse(t: number, t0: number, T: number): [number, number] {
  const s = (t - t0) / T;
  if (s <= 0 || s >= 1) return [0, 0];
  const a = 2 * Math.PI * s;
  return [(1 - Math.cos(a)) / 2, (Math.PI / T) * Math.sin(a)];
}

// A crest: sin^3 over one cycle (up then down), zero slope at both ends, and its derivative.
function crest(t: number, t0: number, T: number): [number, number] {
  const s = (t - t0) / T;
  if (s <= 0 || s >= 1) return [0, 0];
  const a = 2 * Math.PI * s;
  const sn = Math.sin(a);
  return [sn * sn * sn, (6 * Math.PI * sn * sn * Math.cos(a)) / T];
}

interface Script {
  /** Tangential drive (launch, brake) acceleration, m/s^2. */
  drive(t: number): number;
  /** Heading rate (rad/s) and its derivative. */
  yawRate(t: number): [number, number];
  /** Climb angle (rad, positive up) and its rate. */
  climb(t: number): [number, number];
}

function script(k: number, intensity: number, bumpScale: number, brakePeak: number): Script {
  // Event times at the nominal pace (s), stretched by k; angles shrink with the script when it is
  // squeezed below its nominal length, so a short take stays a gentle one.
  const at = (s: number) => s * k;
  const angle = (deg: number) => deg * RAD_PER_DEG * intensity * Math.min(1, k);
  const launchPeak = 5.5 * intensity;
  const turns = [
    { t0: at(6.5), T: at(9), turn: angle(40) },
    { t0: at(27), T: at(7), turn: -angle(30) },
  ];
  const hills = [
    { t0: at(15.5), T: at(4), climb: angle(10) },
    { t0: at(20), T: at(6), climb: -angle(22) },
  ];
  const bumps = [36, 37.4, 38.8].map((s, i) => ({
    t0: at(s),
    T: at(1.2),
    climb: angle(i === 1 ? 1 : 0.8) * bumpScale,
  }));
  return {
    drive(t) {
      return launchPeak * pulse(t, at(2), at(4))[0] - brakePeak * pulse(t, at(42), at(6))[0];
    },
    yawRate(t) {
      let r = 0;
      let dr = 0;
      for (const { t0, T, turn } of turns) {
        // The pulse's area is T/2, so a peak of 2 turn / T turns by `turn`.
        const [p, dp] = pulse(t, t0, T);
        r += ((2 * turn) / T) * p;
        dr += ((2 * turn) / T) * dp;
      }
      return [r, dr];
    },
    climb(t) {
      let g = 0;
      let dg = 0;
      for (const { t0, T, climb } of hills) {
        const [p, dp] = pulse(t, t0, T);
        g += climb * p;
        dg += climb * dp;
      }
      for (const { t0, T, climb } of bumps) {
        const [c, dc] = crest(t, t0, T);
        g += climb * c;
        dg += climb * dc;
      }
      return [g, dg];
    },
  };
}

// Share of the turn's lean the track's banking takes up (the rest is felt sideways).
const BANK_SHARE = 0.9;

/** One sample of the ride: body specific force (m/s^2) and body angular rate (rad/s). */
type Sample = [number, number, number, number, number, number];

function sampleAt(s: Script, t: number, v: number, psi: number): Sample {
  const drive = s.drive(t);
  const [r, dr] = s.yawRate(t);
  const [gamma, dGamma] = s.climb(t);
  // Speed along the path changes with the drive and with gravity on the slope.
  const dv = drive - G0_MPS2 * Math.sin(gamma);
  // Velocity direction (x forward, y left, z up) and the world acceleration a = v' d + v d'.
  const cg = Math.cos(gamma);
  const sg = Math.sin(gamma);
  const cpsi = Math.cos(psi);
  const spsi = Math.sin(psi);
  const d = [cg * cpsi, cg * spsi, sg];
  const dd = [-sg * dGamma * cpsi - cg * spsi * r, -sg * dGamma * spsi + cg * cpsi * r, cg * dGamma];
  const a = [dv * d[0]! + v * dd[0]!, dv * d[1]! + v * dd[1]!, dv * d[2]! + v * dd[2]!];
  // Attitude: heading psi, pitch = -climb (positive pitch puts the nose down), and a bank that leans
  // into the turn (a left turn lowers the left side: negative roll).
  const lateral = (v * r) / G0_MPS2;
  const phi = -BANK_SHARE * Math.atan(lateral);
  const dLateral = (dv * r + v * dr) / G0_MPS2;
  const dPhi = (-BANK_SHARE * dLateral) / (1 + lateral * lateral);
  const theta = -gamma;
  const dTheta = -dGamma;
  // Specific force in the body frame: f = R^T (a - g), g = (0, 0, -g0); R = Rz(psi) Ry(theta) Rx(phi).
  const fw = [a[0]!, a[1]!, a[2]! + G0_MPS2];
  const cphi = Math.cos(phi);
  const sphi = Math.sin(phi);
  const cth = Math.cos(theta);
  const sth = Math.sin(theta);
  const R = [
    cpsi * cth,
    cpsi * sth * sphi - spsi * cphi,
    cpsi * sth * cphi + spsi * sphi,
    spsi * cth,
    spsi * sth * sphi + cpsi * cphi,
    spsi * sth * cphi - cpsi * sphi,
    -sth,
    cth * sphi,
    cth * cphi,
  ] as const;
  const fx = R[0] * fw[0]! + R[3] * fw[1]! + R[6] * fw[2]!;
  const fy = R[1] * fw[0]! + R[4] * fw[1]! + R[7] * fw[2]!;
  const fz = R[2] * fw[0]! + R[5] * fw[1]! + R[8] * fw[2]!;
  // Body rates from the Z-Y-X Euler rates (roll phi, pitch theta, heading psi with psi' = r).
  const wx = dPhi - r * sth;
  const wy = dTheta * cphi + r * cth * sphi;
  const wz = -dTheta * sphi + r * cth * cphi;
  return [fx, fy, fz, wx, wy, wz];
}

interface PathState {
  t: number;
  v: number;
  psi: number;
}

/**
 * Integrates speed and heading with a fine fixed step (classical fourth-order Runge-Kutta), so the
 * file's rate does not change the path.
 */
function integratePath(s: Script, until: number, step: number, start: PathState): PathState {
  let { t, v, psi } = start;
  const f = (tt: number): [number, number] => {
    const drive = s.drive(tt);
    const [gamma] = s.climb(tt);
    const [r] = s.yawRate(tt);
    return [drive - G0_MPS2 * Math.sin(gamma), r];
  };
  while (t < until - 1e-12) {
    const h = Math.min(step, until - t);
    const k1 = f(t);
    const k2 = f(t + h / 2);
    const k4 = f(t + h);
    // The right-hand side depends on time only, so k2 = k3.
    v += (h / 6) * (k1[0] + 4 * k2[0] + k4[0]);
    psi += (h / 6) * (k1[1] + 4 * k2[1] + k4[1]);
    t += h;
  }
  return { t, v, psi };
}

/** The samples of the ride at `rate_hz` (columns fx, fy, fz in m/s^2, wx, wy, wz in rad/s). */
export function demoRideSamples(o: DemoRideOptions = {}): { time_s: number[]; samples: Sample[] } {
  const duration = o.duration_s ?? DEMO_RIDE_NOMINAL_S;
  const rate = o.rate_hz ?? 100;
  const intensity = o.intensity ?? 1;
  const k = duration / DEMO_RIDE_NOMINAL_S;
  const step = Math.min(1 / rate, 0.005 * k);
  // The brake is sized so the car stops exactly: its pulse's area (T/2) times its peak takes away the
  // speed the car has when braking starts.
  const bumps = o.bumps ?? 1;
  const coast = script(k, intensity, bumps, 0);
  const atBrake = integratePath(coast, 42 * k, step, { t: 0, v: 0, psi: 0 });
  const brakePeak = atBrake.v / ((6 * k) / 2);
  const base = script(k, intensity, bumps, brakePeak);
  let state: PathState = { t: 0, v: 0, psi: 0 };
  const n = Math.round(duration * rate) + 1;
  const time_s: number[] = [];
  const samples: Sample[] = [];
  for (let i = 0; i < n; i++) {
    const t = i / rate;
    state = integratePath(base, t, step, state);
    time_s.push(t);
    samples.push(sampleAt(base, t, Math.max(state.v, 0), state.psi));
  }
  return { time_s, samples };
}

/** The demo ride as a vehicle track CSV with SI columns. */
export function demoRideCsv(o: DemoRideOptions = {}): string {
  const { time_s, samples } = demoRideSamples(o);
  const lines = new Array<string>(time_s.length + 1);
  lines[0] = 'time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps,wz_radps';
  for (let i = 0; i < time_s.length; i++) {
    const [fx, fy, fz, wx, wy, wz] = samples[i]!;
    lines[i + 1] =
      `${time_s[i]!.toFixed(4)},${fx.toFixed(6)},${fy.toFixed(6)},${fz.toFixed(6)},` +
      `${wx.toFixed(6)},${wy.toFixed(6)},${wz.toFixed(6)}`;
  }
  return lines.join('\n') + '\n';
}
