// Numerical continuation of forward kinematics along a leg-length path, shared by the hexapod and
// the planar stage: the usual way to keep one assembly mode between two samples that are far apart
// in leg space (Merlet, "Parallel Robots", 2nd ed. 2006, ch. 4).

/** Largest change of any leg (m) that forward kinematics takes in one Newton solve; larger changes are sub-stepped. */
export const FK_SUBSTEP_M = 0.005;
/** Largest change of any pose coordinate (m or rad) accepted from one Newton solve as the same assembly mode. */
export const FK_MAX_POSE_STEP = 0.02;
/** Smallest sub-step, as a fraction of the leg change between two samples, before giving up. */
const FK_MIN_FRACTION = 1 / (1 << 20);

/** Largest absolute difference of two poses' coordinates (m or rad). */
export function poseStep(a: Float64Array, b: Float64Array): number {
  let d = 0;
  for (let k = 0; k < a.length; k++) d = Math.max(d, Math.abs((a[k] as number) - (b[k] as number)));
  return d;
}

/** Largest absolute change between two leg-length rows (m); Infinity when any is not a number. */
export function legChange(a: Float64Array, b: Float64Array): number {
  let d = 0;
  for (let i = 0; i < a.length; i++) {
    const x = Math.abs((a[i] as number) - (b[i] as number));
    if (!(x <= d)) d = x;
  }
  return d;
}

/**
 * Follows the leg lengths from `fromLegs` (pose `q`, overwritten with the result) to `toLegs` along
 * the straight line between them in leg space: Newton from sub-step to sub-step, each sub-step
 * changing no leg by more than FK_SUBSTEP_M and moving the pose by at most FK_MAX_POSE_STEP (a larger
 * move is another assembly mode, so the sub-step is halved). `solve(target, trial)` refines `trial`
 * in place to the pose with leg lengths `target` and says whether it converged. Returns false when no
 * continuous path was found (a singular pose or an unreachable stretch between).
 */
export function followLegPath(
  fromLegs: Float64Array,
  toLegs: Float64Array,
  q: Float64Array,
  solve: (target: Float64Array, trial: Float64Array) => boolean,
  scratch: { target: Float64Array; trial: Float64Array },
): boolean {
  const legs = fromLegs.length;
  let dmax = 0;
  for (let i = 0; i < legs; i++)
    dmax = Math.max(dmax, Math.abs((toLegs[i] as number) - (fromLegs[i] as number)));
  const nominal = dmax > 0 ? Math.min(1, FK_SUBSTEP_M / dmax) : 1;
  let done = 0;
  let step = nominal;
  const { target, trial } = scratch;
  while (done < 1) {
    const h = Math.min(step, 1 - done);
    const f = done + h >= 1 - 1e-12 ? 1 : done + h;
    for (let i = 0; i < legs; i++) {
      const a = fromLegs[i] as number;
      target[i] = f === 1 ? (toLegs[i] as number) : a + f * ((toLegs[i] as number) - a);
    }
    trial.set(q);
    if (solve(target, trial) && poseStep(trial, q) <= FK_MAX_POSE_STEP) {
      q.set(trial);
      done = f;
      step = Math.min(nominal, 2 * h);
    } else {
      step = h / 2;
      if (step < FK_MIN_FRACTION) return false;
    }
  }
  return true;
}
