// `legwork cue`: classical washout of a vehicle track into platform pose offsets (docs/motion-conventions.md section 4).

import { resampleTrack } from '../../../shared/motion/resample';
import { trackColumn, trackColumnNames } from '../../../shared/motion/track-reader';
import { CueingError, cueClassical } from '../../../shared/motion/washout';
import { defaultCueingProfile } from '../../../shared/schemas/cueing-profile';
import { parseCommandOptions } from '../args';
import type { CliIo } from '../io';
import { CAUTION, CliInputError, readProfileFile, readTrackFile, writeCsv } from '../io';
import { trackName } from '../../../shared/motion/track-names';

/** Processing rate when --rate is not given: the controller rate of the demo motion base. */
export const DEFAULT_CUE_RATE_HZ = 100;
const MAX_RATE_HZ = 10_000;

const POSE_COLUMNS = ['time_s', 'x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'];

export const summary =
  'classical washout of a vehicle track into pose offsets (default profile when none given)';

export const help = `Usage: legwork cue [--profile PROFILE.json] [--rate HZ] --in VEHICLE.csv[.gz] [--out POSE.csv]

Motion cueing by the classical washout (Reid and Nahon): reads a vehicle track (time_s, fx, fy, fz
as specific force at the rider reference point in vehicle axes, at rest (0, 0, +1 g); wx, wy, wz
body angular velocity; unit suffixes as in the track format), resamples it to the processing rate
by linear interpolation, and writes the platform pose offsets from neutral at that rate:
time_s, x_m, y_m, z_m, roll_rad, pitch_rad, yaw_rad.

The profile sets the scale factors and input limits, the translational high-pass per axis, tilt
coordination (tilt rate limit, tilt angle limit), the rotational high-pass per axis, the rider
reference point and the soft pose limits the output never leaves. Without --profile the built-in
default profile is used; its values are common practice, not a standard, and must be tuned and
approved for each ride.

Options:
  --profile FILE  cueing profile JSON (version 1); sections left out take the default values
  --rate HZ       processing and output rate in Hz (default ${DEFAULT_CUE_RATE_HZ}, a common controller rate)
  --in FILE       vehicle track CSV, optionally gzipped
  --out FILE      write the CSV here instead of stdout
  -h, --help      this text

Exit codes: 0 done, 2 bad input or usage (the message names the file, field, line and column).

${CAUTION}
`;

interface CueArgs {
  profile: string | undefined;
  rate_hz: number;
  input: string;
  out: string | undefined;
  help: boolean;
}

function parseCueArgs(argv: string[]): CueArgs {
  const values = parseCommandOptions(argv, ['profile', 'rate', 'in', 'out'], { in: 'FILE' });
  if (!values) return { profile: undefined, rate_hz: 0, input: '', out: undefined, help: true };
  let rate_hz = DEFAULT_CUE_RATE_HZ;
  if (values.rate !== undefined) {
    rate_hz = /^\s*[+]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?\s*$/.test(values.rate)
      ? Number(values.rate)
      : Number.NaN;
    if (!(rate_hz > 0) || rate_hz > MAX_RATE_HZ) {
      throw new CliInputError(
        `Option --rate: "${values.rate}" is not a rate in Hz between 0 and ${MAX_RATE_HZ}`,
      );
    }
  }
  return { profile: values.profile, rate_hz, input: values.in, out: values.out, help: false };
}

/** Runs `legwork cue` (see `help`); resolves to the exit code. */
export async function run(argv: string[], io: CliIo): Promise<number> {
  const args = parseCueArgs(argv);
  if (args.help) {
    io.stdout(help);
    return 0;
  }
  const profile =
    args.profile === undefined ? defaultCueingProfile() : (await readProfileFile(args.profile)).profile;
  const track = await readTrackFile(args.input);
  if (track.kind !== 'vehicle') {
    const expected = ['time_s', ...trackColumnNames('vehicle', 'vehicle')].join(', ');
    throw new CliInputError(
      `${args.input} line 1: expected a vehicle track (${expected}, or their _g / _degps variants), found a ` +
        `${trackName(track.kind, track.layout)}. \`cue\` turns vehicle motion into platform poses; a pose ` +
        'track is already cued and goes straight to `ik` or `check`.',
    );
  }
  const rs = resampleTrack(track, args.rate_hz);
  let pose;
  try {
    pose = cueClassical(
      {
        rate_hz: args.rate_hz,
        fx_mps2: trackColumn(rs, 'fx_mps2'),
        fy_mps2: trackColumn(rs, 'fy_mps2'),
        fz_mps2: trackColumn(rs, 'fz_mps2'),
        wx_radps: trackColumn(rs, 'wx_radps'),
        wy_radps: trackColumn(rs, 'wy_radps'),
        wz_radps: trackColumn(rs, 'wz_radps'),
      },
      profile,
    ).pose;
  } catch (e) {
    if (e instanceof CueingError) {
      const source = args.profile ?? 'default profile';
      const hint = /Nyquist/.test(e.message) ? ` (raise --rate, now ${args.rate_hz} Hz)` : '';
      throw new CliInputError(
        `${/^cueing profile/.test(e.message) ? `${source}: ` : `${args.input}: `}${e.message}${hint}`,
      );
    }
    throw e;
  }
  await writeCsv(io, args.out, POSE_COLUMNS, [
    rs.time_s,
    pose.x_m,
    pose.y_m,
    pose.z_m,
    pose.roll_rad,
    pose.pitch_rad,
    pose.yaw_rad,
  ]);
  return 0;
}
