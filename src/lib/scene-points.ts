// Reading points out of the flat xyz arrays the 3-D views draw from (three.js buffer attributes and
// the Float64Arrays of the preview geometry), shared by the run's and the venue editor's views.

/** Point `i` of a flat xyz array, (0, 0, 0) where it is short. */
export function pointAt(xyz: ArrayLike<number>, i: number): readonly [number, number, number] {
  return [xyz[3 * i] ?? 0, xyz[3 * i + 1] ?? 0, xyz[3 * i + 2] ?? 0];
}

/** The mean of the first `n` points of a buffer attribute (the platform's centroid as drawn). */
export function centroidOf(
  points: { getX: (i: number) => number; getY: (i: number) => number; getZ: (i: number) => number },
  n: number,
): [number, number, number] {
  let cx = 0;
  let cy = 0;
  let cz = 0;
  for (let i = 0; i < n; i++) {
    cx += points.getX(i) / n;
    cy += points.getY(i) / n;
    cz += points.getZ(i) / n;
  }
  return [cx, cy, cz];
}
