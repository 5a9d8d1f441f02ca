// The yardstick of the `legwork-vs-plain` bench section: a plain script that only reads a track CSV,
// does naive inverse kinematics per row (a rotation matrix R = Rz(yaw) Ry(pitch) Rx(roll), then each
// leg's vector p + R P_i - B_i and its length) and writes the leg lengths as CSV. No resampling, no
// cueing, no checks. The six numbers after time_s are read as a pose (x, y, z in m, roll, pitch, yaw in
// rad) whatever the header calls them: the work per row is the same.
//
// Usage: node tests/bench/plain-ik.mjs TRACK.csv BASE.json LEGS.csv
import { readFileSync, writeFileSync } from 'node:fs';

const [inPath, basePath, outPath] = process.argv.slice(2);
if (!inPath || !basePath || !outPath) {
  process.stderr.write('usage: node plain-ik.mjs TRACK.csv BASE.json LEGS.csv\n');
  process.exit(2);
}
const base = JSON.parse(readFileSync(basePath, 'utf8'));
const B = base.baseJoints_m;
const P = base.platformJoints_m;
const h0 = base.neutralHeight_m;
const lines = readFileSync(inPath, 'utf8').split('\n');
const out = [['time_s', ...B.map((_, i) => `leg${i + 1}_m`)].join(',')];
for (let r = 1; r < lines.length; r++) {
  const line = lines[r];
  if (line.trim() === '') continue;
  const [t, x, y, z, roll, pitch, yaw] = line.split(',').map(Number);
  const cr = Math.cos(roll);
  const sr = Math.sin(roll);
  const cp = Math.cos(pitch);
  const sp = Math.sin(pitch);
  const cy = Math.cos(yaw);
  const sy = Math.sin(yaw);
  const R = [
    [cy * cp, cy * sp * sr - sy * cr, cy * sp * cr + sy * sr],
    [sy * cp, sy * sp * sr + cy * cr, sy * sp * cr - cy * sr],
    [-sp, cp * sr, cp * cr],
  ];
  const p = [x, y, z + h0];
  const legs = [];
  for (let i = 0; i < B.length; i++) {
    const v = [0, 1, 2].map(
      (a) => p[a] + R[a][0] * P[i][0] + R[a][1] * P[i][1] + R[a][2] * P[i][2] - B[i][a],
    );
    legs.push(Math.sqrt(v[0] * v[0] + v[1] * v[1] + v[2] * v[2]));
  }
  out.push(`${t},${legs.join(',')}`);
}
writeFileSync(outPath, `${out.join('\n')}\n`);
