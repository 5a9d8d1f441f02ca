// Bench section "profile-preview": the cueing profile editor's live preview on a 10-minute 100 Hz
// vehicle take (60,000 samples, the demo hexapod's controller rate, with the venue's 3 s quintic ramps).
// It measures what the editor's motion Web Worker does after a change of the profile: the take is
// prepared (resampled) once when it is loaded, then each change calls computeProfilePreview on that
// prepared take (shared/motion/preview.ts: the washout, the ramps, inverse kinematics, the seat specific
// force, the stroke use and the chart bands; stages whose inputs did not change are reused), and the
// answer is copied to the page (structuredClone, as postMessage copies it). Target: within 100 ms per
// change. The changes walk through every section of the profile, one field at a time, as an engineer
// edits it; a change that touches every stage (the pose limits' knee) is among them. The same
// computation with nothing reused (a take just loaded) is timed too, as is previewChecks, the full
// budget check the editor runs apart, which has no such target.
// `BENCH_PREVIEW_ROUNDS` sets how many times the walk is repeated (default 3).
import { cpus, loadavg } from 'node:os';
import { defaultCueingProfile } from '../../../shared/schemas/cueing-profile';
import type { CueingProfile } from '../../../shared/schemas/cueing-profile';
import { DEMO_BUDGET } from '../../../shared/schemas/budget';
import { demoHexapodBase } from '../../../shared/schemas/motion-base';
import { computeProfilePreview, preparePreviewTake, previewChecks } from '../../../shared/motion/preview';
import type { PreviewTake } from '../../../shared/motion/preview';
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

/** One edit of one field, as the form makes it; `round` varies the value so no two rounds repeat. */
const EDITS: { field: string; apply: (p: CueingProfile, round: number) => void }[] = [
  { field: 'tilt.angleLimit_deg', apply: (p, r) => (p.tilt.angleLimit_deg = 8 - r * 0.5) },
  { field: 'tilt.rateLimit_degps', apply: (p, r) => (p.tilt.rateLimit_degps = 2.5 + r * 0.2) },
  { field: 'tilt.lowPassFrequency_radps', apply: (p, r) => (p.tilt.lowPassFrequency_radps = 4 + r * 0.3) },
  {
    field: 'translational.x.naturalFrequency_radps',
    apply: (p, r) => (p.translational.x.naturalFrequency_radps = 2.2 + r * 0.1),
  },
  { field: 'translational.y.damping', apply: (p, r) => (p.translational.y.damping = 0.9 - r * 0.05) },
  {
    field: 'translational.z.breakFrequency_radps',
    apply: (p, r) => {
      const z = p.translational.z;
      if (z.order === 3) z.breakFrequency_radps = 0.6 + r * 0.05;
    },
  },
  {
    field: 'rotational.x.frequency_radps',
    apply: (p, r) => (p.rotational.x.frequency_radps = 0.8 + r * 0.1),
  },
  {
    field: 'rotational.z.damping',
    apply: (p, r) => {
      const z = p.rotational.z;
      if (z.order === 2) z.damping = 0.9 - r * 0.05;
    },
  },
  { field: 'scale.surge', apply: (p, r) => (p.scale.surge = 0.55 - r * 0.02) },
  { field: 'scale.heave', apply: (p, r) => (p.scale.heave = 0.45 - r * 0.02) },
  { field: 'scale.yaw', apply: (p, r) => (p.scale.yaw = 0.5 - r * 0.02) },
  {
    field: 'inputLimit.specificForce_mps2.limit',
    apply: (p, r) => (p.inputLimit.specificForce_mps2.limit = 3.5 - r * 0.1),
  },
  {
    field: 'inputLimit.angularRate_radps.knee',
    apply: (p, r) => (p.inputLimit.angularRate_radps.knee = 0.75 - r * 0.02),
  },
  { field: 'poseLimit.x_m', apply: (p, r) => (p.poseLimit.x_m = 0.22 - r * 0.01) },
  { field: 'poseLimit.roll_deg', apply: (p, r) => (p.poseLimit.roll_deg = 16 - r) },
  { field: 'poseLimit.knee (every stage)', apply: (p, r) => (p.poseLimit.knee = 0.75 - r * 0.02) },
];

interface Timing {
  wall: number;
  cpu: number;
}

/** Wall and CPU time (ms) of f; CPU time is this process's, all threads (the garbage collector's too). */
function timed<T>(f: () => T): { value: T; t: Timing } {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const value = f();
  const wall = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return { value, t: { wall, cpu: (c.user + c.system) / 1000 } };
}

/** The nearest-rank percentile p (0..100) of values. */
function percentile(values: readonly number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil((p / 100) * s.length) - 1))] as number;
}

function stats(times: readonly Timing[]): string {
  const w = times.map((t) => t.wall);
  const c = times.map((t) => t.cpu);
  const f = (v: number) => v.toFixed(1);
  return (
    `wall median ${f(percentile(w, 50))} ms, p95 ${f(percentile(w, 95))} ms, max ${f(Math.max(...w))} ms; ` +
    `CPU median ${f(percentile(c, 50))} ms, p95 ${f(percentile(c, 95))} ms (${times.length} changes)`
  );
}

const load = () =>
  `load average ${loadavg()
    .map((l) => l.toFixed(2))
    .join(' / ')} (1 / 5 / 15 min) on ${cpus().length} cores`;

const sections: BenchSection[] = [
  {
    name: 'profile-preview',
    run(log) {
      const rounds = Math.max(1, Number(process.env.BENCH_PREVIEW_ROUNDS ?? 3));
      const track = benchTake();
      const base = demoHexapodBase;
      const ramp = { duration_s: 3, profile: 'quintic' as const };
      const settings = { base, ramp, strokeMargin_m: DEMO_BUDGET.strokeMargin_m };
      log(`before: ${load()}`);
      const prep = timed(() => preparePreviewTake(track, base.controllerRate_hz));
      const take = prep.value;
      log(
        `take of ${N} samples (10 min at ${RATE_HZ} Hz) prepared (resampled) once when loaded: ` +
          `${prep.t.wall.toFixed(1)} ms wall, ${prep.t.cpu.toFixed(1)} ms CPU`,
      );
      // The editor's first preview of a loaded take computes every stage.
      const first = timed(() =>
        structuredClone(computeProfilePreview(take, { ...settings, profile: defaultCueingProfile() })),
      );
      log(
        `first preview on the loaded take (every stage): ${first.t.wall.toFixed(1)} ms wall, ${first.t.cpu.toFixed(1)} ms CPU`,
      );

      // An editing session: one field after another, each change kept, as the form sends them.
      const profile = defaultCueingProfile();
      const times: Timing[] = [];
      const byField = new Map<string, Timing[]>();
      let stroke = 0;
      for (let r = 0; r < rounds; r++) {
        for (const edit of EDITS) {
          edit.apply(profile, r);
          const p = structuredClone(profile); // the request's copy, as postMessage makes it
          const { value, t } = timed(() =>
            structuredClone(computeProfilePreview(take, { ...settings, profile: p })),
          );
          times.push(t);
          byField.set(edit.field, [...(byField.get(edit.field) ?? []), t]);
          stroke = Math.max(stroke, value.peaks.strokeUse);
        }
      }
      log(
        `after a change (the Web Worker's computeProfilePreview and the answer's copy): ${stats(times)} (target <= 100 ms)`,
      );
      const worst = [...byField].map(([field, ts]) => ({
        field,
        wall: percentile(
          ts.map((t) => t.wall),
          50,
        ),
        cpu: percentile(
          ts.map((t) => t.cpu),
          50,
        ),
      }));
      worst.sort((a, b) => b.cpu - a.cpu);
      log(
        `  slowest fields (median CPU): ${worst
          .slice(0, 4)
          .map((w) => `${w.field} ${w.cpu.toFixed(1)} ms`)
          .join(', ')}; fastest: ${worst
          .slice(-2)
          .map((w) => `${w.field} ${w.cpu.toFixed(1)} ms`)
          .join(', ')}`,
      );

      // Nothing reused: every change as if the take had just been loaded (the upper bound of any change).
      const bare: PreviewTake = { ...take };
      delete bare.cache;
      const full: Timing[] = [];
      for (let r = 0; r < Math.max(2, rounds); r++) {
        for (const edit of EDITS.slice(0, 4)) {
          edit.apply(profile, r);
          const p = structuredClone(profile);
          full.push(timed(() => structuredClone(computeProfilePreview(bare, { ...settings, profile: p }))).t);
        }
      }
      log(`every stage, nothing reused: ${stats(full)}`);
      log(`worst stroke use seen ${stroke.toFixed(3)}; after: ${load()}`);

      const checkTimes: Timing[] = [];
      for (let i = 0; i < 2; i++) {
        checkTimes.push(
          timed(() =>
            previewChecks(track, { ...settings, profile: defaultCueingProfile(), budget: DEMO_BUDGET }),
          ).t,
        );
      }
      log(`previewChecks (processTrack, every budget check, run apart, no target): ${stats(checkTimes)}`);
    },
  },
];

export default sections;
