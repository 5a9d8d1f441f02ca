import { describe, expect, it } from 'vitest';
import { Euler, Matrix4 } from 'three';
import { matrix, multiply, rotationMatrix } from 'mathjs';
import type { Matrix } from 'mathjs';
import { rotation } from '../../../shared/motion/rotation';
import { makeRng } from '../../factories/motion';

function randomAngles(rng: () => number): [number, number, number] {
  return [(rng() - 0.5) * 2 * Math.PI, (rng() - 0.5) * 0.98 * Math.PI, (rng() - 0.5) * 2 * Math.PI];
}

function apply(R: Float64Array, v: [number, number, number]): [number, number, number] {
  return [
    R[0]! * v[0] + R[1]! * v[1] + R[2]! * v[2],
    R[3]! * v[0] + R[4]! * v[1] + R[5]! * v[2],
    R[6]! * v[0] + R[7]! * v[1] + R[8]! * v[2],
  ];
}

describe('rotation R = Rz(yaw) Ry(pitch) Rx(roll)', () => {
  it('matches three.js makeRotationFromEuler with order ZYX on random angles', () => {
    // Source: three.js Matrix4.makeRotationFromEuler; Euler order 'ZYX' is Rz * Ry * Rx (three.js docs, Euler.order).
    const rng = makeRng(7);
    for (let k = 0; k < 200; k++) {
      const [roll, pitch, yaw] = randomAngles(rng);
      const m = new Matrix4().makeRotationFromEuler(new Euler(roll, pitch, yaw, 'ZYX')).elements; // column-major
      const R = rotation(roll, pitch, yaw);
      for (let r = 0; r < 3; r++)
        for (let c = 0; c < 3; c++) expect(R[3 * r + c]).toBeCloseTo(m[4 * c + r]!, 14);
    }
  });

  it('matches the mathjs composition rotationMatrix(yaw, z) * rotationMatrix(pitch, y) * rotationMatrix(roll, x)', () => {
    // Source: mathjs rotationMatrix (right-handed rotation about an axis), composed independently of our code.
    const rng = makeRng(8);
    for (let k = 0; k < 200; k++) {
      const [roll, pitch, yaw] = randomAngles(rng);
      const M = multiply(
        multiply(rotationMatrix(yaw, matrix([0, 0, 1])), rotationMatrix(pitch, matrix([0, 1, 0]))),
        rotationMatrix(roll, matrix([1, 0, 0])),
      ) as Matrix;
      const m = M.toArray() as number[][];
      const R = rotation(roll, pitch, yaw);
      for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) expect(R[3 * r + c]).toBeCloseTo(m[r]![c]!, 14);
    }
  });

  it('puts the nose (+x) down for a positive pitch', () => {
    // Source: docs/motion-conventions.md section 1 (x forward, z up; positive pitch is nose down).
    const nose = apply(rotation(0, 0.2, 0), [1, 0, 0]);
    expect(nose[2]).toBeLessThan(0);
    expect(nose[2]).toBeCloseTo(-Math.sin(0.2), 15);
  });

  it('lowers the right side (-y) for a positive roll', () => {
    // Source: docs/motion-conventions.md section 1 (y left, so the right side is -y; positive roll lowers it).
    const right = apply(rotation(0.2, 0, 0), [0, -1, 0]);
    expect(right[2]).toBeLessThan(0);
    expect(right[2]).toBeCloseTo(-Math.sin(0.2), 15);
  });
});
