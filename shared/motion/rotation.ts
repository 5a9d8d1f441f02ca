// Orientation convention (docs/motion-conventions.md section 1): roll about x, pitch about y, yaw about z,
// applied about the fixed axes in that order, so R = Rz(yaw) * Ry(pitch) * Rx(roll).

/** A 3x3 rotation matrix, row-major: [r00, r01, r02, r10, ..., r22]. */
export type Mat3 = Float64Array;

/** Writes R = Rz(yaw) Ry(pitch) Rx(roll) (angles in rad) row-major into `out` at `offset`. */
export function rotationInto(roll: number, pitch: number, yaw: number, out: Float64Array, offset = 0): void {
  rotationFromTrigInto(
    Math.cos(roll),
    Math.sin(roll),
    Math.cos(pitch),
    Math.sin(pitch),
    Math.cos(yaw),
    Math.sin(yaw),
    out,
    offset,
  );
}

/**
 * rotationInto from the cosines and sines of roll, pitch and yaw, for loops that need them anyway (the
 * same products, so the same matrix to the bit).
 */
export function rotationFromTrigInto(
  cr: number,
  sr: number,
  cp: number,
  sp: number,
  cy: number,
  sy: number,
  out: Float64Array,
  offset = 0,
): void {
  out[offset] = cy * cp;
  out[offset + 1] = cy * sp * sr - sy * cr;
  out[offset + 2] = cy * sp * cr + sy * sr;
  out[offset + 3] = sy * cp;
  out[offset + 4] = sy * sp * sr + cy * cr;
  out[offset + 5] = sy * sp * cr - cy * sr;
  out[offset + 6] = -sp;
  out[offset + 7] = cp * sr;
  out[offset + 8] = cp * cr;
}

/** R = Rz(yaw) Ry(pitch) Rx(roll) for angles in rad, as a new row-major Float64Array(9). */
export function rotation(roll: number, pitch: number, yaw: number): Mat3 {
  const out = new Float64Array(9);
  rotationInto(roll, pitch, yaw, out, 0);
  return out;
}

/**
 * Euler-rate matrix E for this angle order: w = E * [droll, dpitch, dyaw], with w the angular
 * velocity in the base (fixed) frame, in rad/s. Written row-major into `out`.
 */
export function eulerRateToBaseOmegaInto(pitch: number, yaw: number, out: Float64Array): void {
  const cp = Math.cos(pitch);
  const sp = Math.sin(pitch);
  const cy = Math.cos(yaw);
  const sy = Math.sin(yaw);
  out[0] = cy * cp;
  out[1] = -sy;
  out[2] = 0;
  out[3] = sy * cp;
  out[4] = cy;
  out[5] = 0;
  out[6] = -sp;
  out[7] = 0;
  out[8] = 1;
}

/**
 * Inverse of the body-frame Euler-rate relation: angle rates [droll, dpitch, dyaw] (rad/s) from the
 * body-frame angular velocity (p, q, r) in rad/s. Singular at pitch = +-90 deg, far outside any
 * motion base's range. Writes into `out[0..2]`.
 */
export function bodyOmegaToEulerRatesInto(
  roll: number,
  pitch: number,
  p: number,
  q: number,
  r: number,
  out: Float64Array,
): void {
  const cr = Math.cos(roll);
  const sr = Math.sin(roll);
  const cp = Math.cos(pitch);
  const tp = Math.tan(pitch);
  out[0] = p + (q * sr + r * cr) * tp;
  out[1] = q * cr - r * sr;
  out[2] = (q * sr + r * cr) / cp;
}
