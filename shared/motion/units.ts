/** Standard gravity in m/s^2 (3rd CGPM, 1901). */
export const G0_MPS2 = 9.80665;
export const DEG_PER_RAD = 180 / Math.PI;
export const RAD_PER_DEG = Math.PI / 180;

/** Degrees to radians. */
export const degToRad = (deg: number): number => deg * RAD_PER_DEG;
/** Radians to degrees. */
export const radToDeg = (rad: number): number => rad * DEG_PER_RAD;
