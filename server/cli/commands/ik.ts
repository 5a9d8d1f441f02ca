// `legwork ik`: leg lengths at the input times of a pose track, for a hexapod or a planar3 base.

import { hexapodGeometry, hexapodInverse } from '../../../shared/motion/hexapod';
import { planar3Geometry, planar3Inverse } from '../../../shared/motion/planar3';
import { trackColumn, trackColumnNames } from '../../../shared/motion/track-reader';
import { parseCommandOptions } from '../args';
import type { CliIo } from '../io';
import { CAUTION, readBaseAndTrack, warnOutsideStroke, writeCsv } from '../io';

/** One line for `legwork --help`. */
export const summary = 'leg lengths at the input times of a pose track (inverse kinematics)';

/** `legwork ik --help`, with the caution. */
export const help = `Usage: legwork ik --base BASE.json --in POSE.csv[.gz] [--out LEGS.csv]

Inverse kinematics: reads a motion base (hexapod or planar3) and a pose track (offsets from
neutral: time_s, x, y, z, roll, pitch, yaw with unit suffixes; planar3: time_s, x, y, yaw) and
writes the leg lengths at the same times: time_s, leg1_m .. leg6_m (planar3: leg1_m .. leg3_m).
Lengths outside the base's stroke are still written, with a warning on stderr.

Options:
  --base FILE   motion base JSON (docs/motion-conventions.md section 7)
  --in FILE     pose track CSV, optionally gzipped
  --out FILE    write the CSV here instead of stdout
  -h, --help    this text

Exit codes: 0 done, 2 bad input or usage.

${CAUTION}
`;

/** Turns a pose track into leg lengths (m) at the same times; resolves to the exit code, throws CliInputError on bad input. */
export async function run(argv: string[], io: CliIo): Promise<number> {
  const args = parseCommandOptions(argv, ['base', 'in', 'out'], { base: 'FILE', in: 'FILE' });
  if (!args) {
    io.stdout(help);
    return 0;
  }
  const { base, track } = await readBaseAndTrack(args.base, args.in, 'pose');
  const col = (name: string): Float64Array => trackColumn(track, name);
  let legs: Float64Array[];
  if (base.kind === 'hexapod') {
    legs = hexapodInverse(hexapodGeometry(base), {
      x_m: col('x_m'),
      y_m: col('y_m'),
      z_m: col('z_m'),
      roll_rad: col('roll_rad'),
      pitch_rad: col('pitch_rad'),
      yaw_rad: col('yaw_rad'),
    });
  } else {
    legs = planar3Inverse(planar3Geometry(base), {
      x_m: col('x_m'),
      y_m: col('y_m'),
      yaw_rad: col('yaw_rad'),
    });
  }
  warnOutsideStroke(io, args.in, track, legs, base);
  await writeCsv(io, args.out, ['time_s', ...trackColumnNames('legs', base.kind)], [track.time_s, ...legs]);
  return 0;
}
