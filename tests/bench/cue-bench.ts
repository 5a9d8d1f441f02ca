// Cueing throughput: classical washout of a 600,000-sample 1 kHz vehicle track, then inverse
// kinematics of the cued poses; the target is cueing + IK under 1 s together. Also the ISO 2631-1
// weighting filters over the same length, which the budget checks run per seat and axis.

import { hexapodGeometry, hexapodInverse } from '../../shared/motion/hexapod';
import { weight } from '../../shared/motion/iso2631';
import { G0_MPS2 } from '../../shared/motion/units';
import type { VehicleTrack } from '../../shared/motion/washout';
import { cueClassical } from '../../shared/motion/washout';
import { defaultCueingProfile } from '../../shared/schemas/cueing-profile';
import { demoHexapodBase } from '../../shared/schemas/motion-base';
import { makeRng } from '../factories/motion';
import type { BenchSection } from './bench';

const N = 600_000;
const RATE_HZ = 1000;

/** A smooth but busy fictional ride: per channel three seeded sinusoids, 0.05 to 3 Hz, plus 1 g on z. */
function benchVehicle(): VehicleTrack {
  const rng = makeRng(20260202);
  const amp = [3, 2.5, 2, 0.4, 0.4, 0.6]; // m/s^2 for f, rad/s for w
  const cols = amp.map((a) => {
    const h = [0, 1, 2].map(() => ({
      a: (a / 3) * (0.5 + rng()),
      w: 2 * Math.PI * (0.05 + 2.95 * rng()),
      ph: 6.3 * rng(),
    }));
    const col = new Float64Array(N);
    for (let i = 0; i < N; i++) {
      const t = i / RATE_HZ;
      col[i] = h.reduce((s, k) => s + k.a * Math.sin(k.w * t + k.ph), 0);
    }
    return col;
  });
  const fz = cols[2]!;
  for (let i = 0; i < N; i++) fz[i] = (fz[i] as number) + G0_MPS2;
  return {
    rate_hz: RATE_HZ,
    fx_mps2: cols[0]!,
    fy_mps2: cols[1]!,
    fz_mps2: fz,
    wx_radps: cols[3]!,
    wy_radps: cols[4]!,
    wz_radps: cols[5]!,
  };
}

function cpuSeconds(start: NodeJS.CpuUsage): number {
  const d = process.cpuUsage(start);
  return (d.user + d.system) / 1e6;
}

function seconds(start: bigint): number {
  return Number(process.hrtime.bigint() - start) / 1e9;
}

/** The `cue` bench section. */
export const cueBenchSection: BenchSection = {
  name: 'cue',
  run(log) {
    const vehicle = benchVehicle();
    const profile = defaultCueingProfile();
    const geometry = hexapodGeometry(demoHexapodBase);
    cueClassical(vehicle, profile); // warm-up
    const reps = 3;
    let cueBest = Infinity;
    let ikBest = Infinity;
    // CPU time as well as wall time: on a shared machine the wall clock also counts waiting for a core.
    let cueCpuBest = Infinity;
    let ikCpuBest = Infinity;
    let legMin = Infinity;
    let legMax = -Infinity;
    for (let r = 0; r < reps; r++) {
      const t0 = process.hrtime.bigint();
      const c0 = process.cpuUsage();
      const { pose, diagnostics } = cueClassical(vehicle, profile);
      // The rider-force diagnostic is computed when first read; read it so the figure includes it.
      void diagnostics.riderForce_mps2;
      cueBest = Math.min(cueBest, seconds(t0));
      cueCpuBest = Math.min(cueCpuBest, cpuSeconds(c0));
      const t1 = process.hrtime.bigint();
      const c1 = process.cpuUsage();
      const legs = hexapodInverse(geometry, pose);
      ikBest = Math.min(ikBest, seconds(t1));
      ikCpuBest = Math.min(ikCpuBest, cpuSeconds(c1));
      for (const l of legs) {
        for (const v of l) {
          legMin = Math.min(legMin, v);
          legMax = Math.max(legMax, v);
        }
      }
    }
    log(
      `${N} samples at 1 kHz, classical washout with rider-force diagnostics: ${cueBest.toFixed(3)} s ` +
        `(${(N / cueBest / 1e6).toFixed(2)} M samples/s), best of ${reps}`,
    );
    log(`inverse kinematics of the cued poses: ${ikBest.toFixed(3)} s`);
    log(
      `cueing + IK: ${(cueBest + ikBest).toFixed(3)} s wall, ${(cueCpuBest + ikCpuBest).toFixed(3)} s CPU ` +
        `(target < 1 s)`,
    );
    log(`cued leg range ${legMin.toFixed(4)} .. ${legMax.toFixed(4)} m`);
    for (const w of ['Wk', 'Wd', 'Wf'] as const) {
      const t0 = process.hrtime.bigint();
      weight(vehicle.fz_mps2, RATE_HZ, w);
      log(`ISO 2631-1 ${w} weighting of ${N} samples at 1 kHz: ${seconds(t0).toFixed(3)} s`);
    }
    const slow = vehicle.fz_mps2.subarray(0, 60_000);
    const t0 = process.hrtime.bigint();
    weight(slow, 100, 'Wk');
    log(`Wk of 60,000 samples at 100 Hz (upsampled x8 internally): ${seconds(t0).toFixed(3)} s`);
  },
};
