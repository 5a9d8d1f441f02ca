// Bench section "profile-preview": the cueing profile editor's live preview on a 10-minute 100 Hz
// vehicle take (60,000 samples, the demo hexapod's controller rate). It times computeProfilePreview,
// the function the editor's Web Worker calls on each change (shared/motion/preview.ts): washout, ramps,
// inverse kinematics, seat specific force, stroke use and the chart bands. Target: within 100 ms per
// recompute. It also times the take's one-off preparation (resampling) and previewChecks, the full
// budget checks the editor runs apart (processTrack), which have no such target.
// `BENCH_PREVIEW_REPS` sets the timed recomputes (default 15).
import { cpus, loadavg } from 'node:os';
import { defaultCueingProfile } from '../../../shared/schemas/cueing-profile';
import { DEMO_BUDGET } from '../../../shared/schemas/budget';
import { demoHexapodBase } from '../../../shared/schemas/motion-base';
import { computeProfilePreview, preparePreviewTake, previewChecks } from '../../../shared/motion/preview';
import type { Track } from '../../../shared/motion/track-reader';
import { makeRng } from '../../factories/motion';
import type { BenchSection } from '../bench';

const RATE_HZ = 100;
const N = 10 * 60 * RATE_HZ;

/** A fictional 10-minute ride at 100 Hz: per channel three seeded sinusoids, 0.05 to 3 Hz, plus 1 g on z. */
function benchTake(): Track {
  const rng = makeRng(20261203);
  const amp = [3, 2.5, 2, 0.4, 0.4, 0.6];
  const time_s = new Float64Array(N);
  for (let i = 0; i < N; i++) time_s[i] = i / RATE_HZ;
  const columns = amp.map((a, c) => {
    const h = [0, 1, 2].map(() => ({
      a: (a / 3) * (0.5 + rng()),
      w: 2 * Math.PI * (0.05 + 2.95 * rng()),
      ph: 6.3 * rng(),
    }));
    const col = new Float64Array(N);
    for (let i = 0; i < N; i++) {
      const t = time_s[i] as number;
      let v = c === 2 ? 9.80665 : 0;
      for (const k of h) v += k.a * Math.sin(k.w * t + k.ph);
      col[i] = v;
    }
    return col;
  });
  return {
    kind: 'vehicle',
    layout: 'vehicle',
    length: N,
    time_s,
    names: ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'],
    columns,
  };
}

const ms = (t0: number) => performance.now() - t0;

function stats(times: number[]): string {
  const s = [...times].sort((a, b) => a - b);
  const median = s[Math.floor(s.length / 2)] as number;
  const max = s[s.length - 1] as number;
  return `median ${median.toFixed(1)} ms, max ${max.toFixed(1)} ms over ${s.length} runs`;
}

const sections: BenchSection[] = [
  {
    name: 'profile-preview',
    run(log) {
      const reps = Math.max(3, Number(process.env.BENCH_PREVIEW_REPS ?? 15));
      const track = benchTake();
      const base = demoHexapodBase;
      const ramp = { duration_s: 3, profile: 'quintic' as const };
      let t0 = performance.now();
      const take = preparePreviewTake(track, base.controllerRate_hz);
      log(
        `take of ${N} samples (10 min at ${RATE_HZ} Hz) prepared (resampled) once: ${ms(t0).toFixed(1)} ms`,
      );
      // Each recompute gets another profile, as the editor does: the tilt angle limit steps through 6..12 deg.
      const profiles = Array.from({ length: reps }, (_, i) => {
        const p = defaultCueingProfile();
        p.tilt.angleLimit_deg = 6 + (i % 7);
        return p;
      });
      const settings = { base, ramp, strokeMargin_m: DEMO_BUDGET.strokeMargin_m };
      computeProfilePreview(take, { ...settings, profile: defaultCueingProfile() }); // warm-up
      const times: number[] = [];
      const cpu: number[] = [];
      let stroke = 0;
      for (const profile of profiles) {
        t0 = performance.now();
        const c0 = process.cpuUsage();
        const out = computeProfilePreview(take, { ...settings, profile });
        times.push(ms(t0));
        const c = process.cpuUsage(c0);
        cpu.push((c.user + c.system) / 1000);
        stroke = Math.max(stroke, out.peaks.strokeUse);
      }
      log(`computeProfilePreview (the Web Worker's function): ${stats(times)} (target <= 100 ms)`);
      // CPU time beside wall time: on a shared machine the wall clock also counts waiting for a core.
      log(
        `  its CPU time: ${stats(cpu)}; load average ${loadavg()[0]?.toFixed(2)} on ${cpus().length} cores`,
      );
      log(`worst stroke use seen ${stroke.toFixed(3)}`);
      const checkTimes: number[] = [];
      for (let i = 0; i < 3; i++) {
        t0 = performance.now();
        previewChecks(track, {
          ...settings,
          profile: profiles[i] ?? defaultCueingProfile(),
          budget: DEMO_BUDGET,
        });
        checkTimes.push(ms(t0));
      }
      log(`previewChecks (processTrack, every budget check, run apart): ${stats(checkTimes)}`);
    },
  },
];

export default sections;
