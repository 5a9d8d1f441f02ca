// Actuator forces of a hexapod from the rigid-body inverse dynamics of its platform (legs massless):
// Newton-Euler on the platform and its payload (riders included), then the six leg forces along the
// leg unit vectors from the wrench through the Jacobian transpose.
//
// Per sample, base frame, c = R r_c the centre of mass from the platform origin O:
//   a_c = a_O + alpha x c + w x (w x c)                      (rigid-body kinematics)
//   F   = m (a_c - g),  g = (0, 0, -g0)                      (Newton; what the legs must supply)
//   M_c = I alpha + w x (I w),  I = R I_p R^T                (Euler about the centre of mass)
//   M_O = M_c + c x F                                        (the same wrench about O)
//   J^T f = [F; M_O]                                         (statics of the parallel legs)
// with J the twist Jacobian of hexapodJacobianInto (row i = [u_i, (R P_i) x u_i]), since a leg pushing
// with f_i along u_i (base to platform) exerts f_i u_i at the joint R P_i from O. f_i > 0 is
// compression (the leg pushes the platform up), f_i < 0 tension.
//
// Closed form used by the tests: at neutral and at rest, with the centre of mass on the axis of a
// symmetric layout, the horizontal parts and the moments cancel pair by pair, so each leg carries
// f = m g0 / (6 cos(beta)), beta the leg's angle to the vertical (cos(beta) = u_z); a pure vertical
// acceleration a of the same pose scales every f by (g0 + a) / g0.
import { solveInPlace } from './base-geometry';
import type { HexapodGeometry } from './hexapod';
import { hexapodJacobianInto } from './hexapod';
import type { PlatformMotion } from './seat-force';
import { G0_MPS2 } from './units';

/** Payload of a platform in its own frame: mass (kg), centre of mass (m) and inertia about it (kg m^2). */
export interface PlatformPayload {
  mass_kg: number;
  centreOfMass_m: readonly [number, number, number] | readonly number[];
  /** Inertia tensor about the centre of mass in platform axes, [Ixx, Iyy, Izz, Ixy, Ixz, Iyz]. */
  inertia_kgm2: readonly [number, number, number, number, number, number] | readonly number[];
}

/** Thrown when the legs cannot hold the platform at a sample (a singular Jacobian). */
export class LegForceError extends Error {
  override name = 'LegForceError';
  constructor(
    readonly sampleIndex: number,
    message: string,
  ) {
    super(message);
  }
}

/**
 * Each leg's axial force (N, compression positive) along a track: six columns of motion.length.
 * `pose` gives the pose offsets (m, rad) on the same grid as `motion` (rotation, a_O, w, alpha).
 */
export function hexapodLegForces(
  g: HexapodGeometry,
  pose: {
    x_m: Float64Array;
    y_m: Float64Array;
    z_m: Float64Array;
    roll_rad: Float64Array;
    pitch_rad: Float64Array;
    yaw_rad: Float64Array;
  },
  motion: Pick<PlatformMotion, 'length' | 'rotation' | 'accel_mps2' | 'omega_radps' | 'alpha_radps2'>,
  payload: PlatformPayload,
): Float64Array[] {
  const n = motion.length;
  const out = Array.from({ length: 6 }, () => new Float64Array(n));
  const J = new Float64Array(36);
  const A = new Float64Array(36);
  const w = new Float64Array(6);
  const m = payload.mass_kg;
  const [rx, ry, rz] = payload.centreOfMass_m as [number, number, number];
  const [ixx, iyy, izz, ixy, ixz, iyz] = payload.inertia_kgm2 as [
    number,
    number,
    number,
    number,
    number,
    number,
  ];
  const Ip = [ixx, ixy, ixz, ixy, iyy, iyz, ixz, iyz, izz];
  const Iw = new Float64Array(9);
  const RI = new Float64Array(9);
  const { rotation: Rs, accel_mps2: acc, omega_radps: om, alpha_radps2: al } = motion;
  for (let s = 0; s < n; s++) {
    const r = 9 * s;
    const v = 3 * s;
    const R = (i: number) => Rs[r + i] as number;
    // c = R r_c
    const cx = R(0) * rx + R(1) * ry + R(2) * rz;
    const cy = R(3) * rx + R(4) * ry + R(5) * rz;
    const cz = R(6) * rx + R(7) * ry + R(8) * rz;
    const wx = om[v] as number;
    const wy = om[v + 1] as number;
    const wz = om[v + 2] as number;
    const ax = al[v] as number;
    const ay = al[v + 1] as number;
    const az = al[v + 2] as number;
    // w x c, then w x (w x c) and alpha x c
    const wcx = wy * cz - wz * cy;
    const wcy = wz * cx - wx * cz;
    const wcz = wx * cy - wy * cx;
    const acx = (acc[v] as number) + (ay * cz - az * cy) + (wy * wcz - wz * wcy);
    const acy = (acc[v + 1] as number) + (az * cx - ax * cz) + (wz * wcx - wx * wcz);
    const acz = (acc[v + 2] as number) + (ax * cy - ay * cx) + (wx * wcy - wy * wcx);
    const Fx = m * acx;
    const Fy = m * acy;
    const Fz = m * (acz + G0_MPS2);
    // I = R I_p R^T
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        RI[3 * i + j] =
          R(3 * i) * (Ip[j] as number) +
          R(3 * i + 1) * (Ip[3 + j] as number) +
          R(3 * i + 2) * (Ip[6 + j] as number);
      }
    }
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        Iw[3 * i + j] =
          (RI[3 * i] as number) * R(3 * j) +
          (RI[3 * i + 1] as number) * R(3 * j + 1) +
          (RI[3 * i + 2] as number) * R(3 * j + 2);
      }
    }
    const I = (i: number) => Iw[i] as number;
    const Iwx = I(0) * wx + I(1) * wy + I(2) * wz;
    const Iwy = I(3) * wx + I(4) * wy + I(5) * wz;
    const Iwz = I(6) * wx + I(7) * wy + I(8) * wz;
    const Mx = I(0) * ax + I(1) * ay + I(2) * az + (wy * Iwz - wz * Iwy) + (cy * Fz - cz * Fy);
    const My = I(3) * ax + I(4) * ay + I(5) * az + (wz * Iwx - wx * Iwz) + (cz * Fx - cx * Fz);
    const Mz = I(6) * ax + I(7) * ay + I(8) * az + (wx * Iwy - wy * Iwx) + (cx * Fy - cy * Fx);
    hexapodJacobianInto(
      g,
      pose.x_m[s] as number,
      pose.y_m[s] as number,
      pose.z_m[s] as number,
      pose.roll_rad[s] as number,
      pose.pitch_rad[s] as number,
      pose.yaw_rad[s] as number,
      J,
    );
    // A = J^T
    for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) A[6 * j + i] = J[6 * i + j] as number;
    w[0] = Fx;
    w[1] = Fy;
    w[2] = Fz;
    w[3] = Mx;
    w[4] = My;
    w[5] = Mz;
    if (!solveInPlace(A, w, 6)) {
      throw new LegForceError(s, `the legs cannot hold the platform at sample ${s}: singular Jacobian`);
    }
    for (let i = 0; i < 6; i++) (out[i] as Float64Array)[s] = w[i] as number;
  }
  return out;
}
