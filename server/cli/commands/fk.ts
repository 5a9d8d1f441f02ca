// `legwork fk`: pose offsets from a leg-length track, by continuity from neutral.

import { KinematicsError } from '../../../shared/motion/base-geometry';
import { hexapodForward, hexapodGeometry } from '../../../shared/motion/hexapod';
import { planar3Forward, planar3Geometry } from '../../../shared/motion/planar3';
import { trackColumnNames } from '../../../shared/motion/track-reader';
import { parseCommandOptions } from '../args';
import type { CliIo } from '../io';
import { CAUTION, CliInputError, readBaseAndTrack, warnOutsideStroke, writeCsv } from '../io';

/** One line for `legwork --help`. */
export const summary = 'pose offsets from a leg-length track (forward kinematics, continuity from neutral)';

/** `legwork fk --help`, with the caution. */
export const help = `Usage: legwork fk --base BASE.json --in LEGS.csv[.gz] [--out POSE.csv]

Forward kinematics: reads a motion base (hexapod or planar3) and a leg-length track
(time_s, leg1 .. leg6 with unit suffixes; planar3: leg1 .. leg3) and writes the pose offsets
from neutral at the same times: time_s, x_m, y_m, z_m, roll_rad, pitch_rad, yaw_rad
(planar3: time_s, x_m, y_m, yaw_rad). The first sample starts from the neutral pose and each
sample from the one before, so the output follows one assembly mode; when the legs change by more
than 5 mm between samples (a coarse file) they are followed in sub-steps. A sample that no
continuous path reaches stops the command with exit 2 and an error naming its line.

Options:
  --base FILE   motion base JSON (docs/motion-conventions.md section 7)
  --in FILE     leg-length track CSV, optionally gzipped
  --out FILE    write the CSV here instead of stdout
  -h, --help    this text

Exit codes: 0 done, 2 bad input or usage.

${CAUTION}
`;

/** Turns a leg-length track into pose offsets (m, rad) at the same times; resolves to the exit code, throws CliInputError on bad input. */
export async function run(argv: string[], io: CliIo): Promise<number> {
  const args = parseCommandOptions(argv, ['base', 'in', 'out'], { base: 'FILE', in: 'FILE' });
  if (!args) {
    io.stdout(help);
    return 0;
  }
  const { base, track } = await readBaseAndTrack(args.base, args.in, 'legs');
  warnOutsideStroke(io, args.in, track, track.columns, base);
  let columns: Float64Array[];
  try {
    if (base.kind === 'hexapod') {
      const p = hexapodForward(hexapodGeometry(base), track.columns, { time_s: track.time_s });
      columns = [p.x_m, p.y_m, p.z_m, p.roll_rad, p.pitch_rad, p.yaw_rad];
    } else {
      const p = planar3Forward(planar3Geometry(base), track.columns, { time_s: track.time_s });
      columns = [p.x_m, p.y_m, p.yaw_rad];
    }
  } catch (e) {
    if (e instanceof KinematicsError) {
      const line = track.lines?.[e.sampleIndex];
      throw new CliInputError(`${args.in}${line === undefined ? '' : ` line ${line}`}: ${e.message}`);
    }
    throw e;
  }
  await writeCsv(
    io,
    args.out,
    ['time_s', ...trackColumnNames('pose', base.kind)],
    [track.time_s, ...columns],
  );
  return 0;
}
