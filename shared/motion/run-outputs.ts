// A run's outputs, built once: from a pipeline result and where its inputs came from, the package
// files (legs, pose, findings, spectra, report), the manifest's parameters, the summary stored with the
// run and the chart series. The worker and `legwork process` both call buildRunOutputs and write the
// result through an output sink (server/pipeline/run-outputs.ts), which adds the SHA-256 and size of
// each file to the manifest. Pure: no I/O, no hashing (that needs node:crypto), no clock.
import type { MotionBase } from '../schemas/motion-base';
import type { RunSeries } from '../schemas/run-series';
import type { PackageFileName, StoredRunSummary } from '../schemas/run-outputs';
import { PACKAGE_FILES } from '../schemas/run-outputs';
import { RIDER_LOWPASS_HZ } from './checks';
import type { ProcessResult } from './process';
import { sig } from './process';
import { ANTI_ALIAS_CUTOFF } from './band-limit';
import { REPORT_CAUTION, buildReport } from './report';
import { buildRunSeries } from './run-series';
import { fixedColumnsCsv, fixedColumnsCsvBytes } from './fixed-csv';
import type { Track } from './track-reader';
import type { FilmSync } from '../schemas/film-sync';
import type { ControllerOutput } from '../schemas/controller-output';
import { FRAME_RATES } from './timecode';

/**
 * The film sync as the manifests carry it: the rate's id, its exact frames per second (num/den), the
 * picture's first timecode and the motion's offset against the picture in frames and in seconds.
 */
export function filmSyncManifest(f: FilmSync) {
  const rate = FRAME_RATES[f.frameRate];
  return {
    frameRate: f.frameRate,
    frameRateLabel: rate.label,
    frameRate_num: rate.num,
    frameRate_den: rate.den,
    dropFrame: rate.dropFrame,
    startTimecode: f.startTimecode,
    offset_frames: f.offset_frames,
    offset_s: (f.offset_frames * rate.den) / rate.num,
    offsetSense: 'positive: the motion plays later than the picture',
  };
}

/** CSV text of the pose offsets (docs/motion-conventions.md section 3 pose columns, SI units). */
export function poseCsv(r: Pick<ProcessResult, 'time_s' | 'pose' | 'baseKind'>): string {
  return fixedColumnsCsv(...poseTable(r));
}

/** CSV text of the leg lengths (docs/motion-conventions.md section 3 legs columns, m). */
export function legsCsv(r: Pick<ProcessResult, 'time_s' | 'legs'>): string {
  return fixedColumnsCsv(...legsTable(r));
}

/** CSV text of each seat's specific force, x, y and z per seat (m/s^2, platform frame, micro-m/s^2). */
export function seatForceCsv(r: Pick<ProcessResult, 'time_s' | 'seatForce_mps2'>): string {
  return fixedColumnsCsv(...seatForceTable(r));
}

/** poseCsv, legsCsv and seatForceCsv as bytes in pieces (fixedColumnsCsvBytes): the same characters. */
export function motionCsvParts(
  r: Pick<ProcessResult, 'time_s' | 'pose' | 'baseKind' | 'legs' | 'seatForce_mps2'>,
): Record<'legs.csv' | 'pose.csv' | 'seat_force.csv', Uint8Array[]> {
  return {
    'legs.csv': fixedColumnsCsvBytes(...legsTable(r)),
    'pose.csv': fixedColumnsCsvBytes(...poseTable(r)),
    'seat_force.csv': fixedColumnsCsvBytes(...seatForceTable(r)),
  };
}

/** The arguments of fixedColumnsCsv for a file (digits as in columnsCsv below). */
type Table = [header: string, time_s: Float64Array, cols: Float64Array[], timeDigits: number, digits: number];

function poseTable(r: Pick<ProcessResult, 'time_s' | 'pose' | 'baseKind'>): Table {
  const p = r.pose;
  const cols =
    r.baseKind === 'hexapod'
      ? [p.x_m, p.y_m, p.z_m, p.roll_rad, p.pitch_rad, p.yaw_rad]
      : [p.x_m, p.y_m, p.yaw_rad];
  const header =
    r.baseKind === 'hexapod' ? 'time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad' : 'time_s,x_m,y_m,yaw_rad';
  return [header, r.time_s, cols, 6, 9];
}

function legsTable(r: Pick<ProcessResult, 'time_s' | 'legs'>): Table {
  const header = ['time_s', ...r.legs.map((_, i) => `leg${i + 1}_m`)].join(',');
  return [header, r.time_s, r.legs, 6, 9];
}

function seatForceTable(r: Pick<ProcessResult, 'time_s' | 'seatForce_mps2'>): Table {
  const header = [
    'time_s',
    ...r.seatForce_mps2.flatMap((_, s) => ['x', 'y', 'z'].map((a) => `seat${s + 1}_f${a}_mps2`)),
  ].join(',');
  return [header, r.time_s, r.seatForce_mps2.flat(), 6, 6];
}

/** CSV text of each leg's axial force (N, compression positive, to the millinewton). */
export function legForceCsv(time_s: Float64Array, legForce_N: readonly Float64Array[]): string {
  const header = ['time_s', ...legForce_N.map((_, i) => `leg${i + 1}_N`)].join(',');
  return columnsCsv(header, time_s, legForce_N, 3);
}

// Nine decimals (nanometres, nanoradians) keep second differences of a re-read file at 1 kHz far
// below any limit. Time has six (microseconds); a tiny negative value is written as plain zero.
function columnsCsv(header: string, time_s: Float64Array, cols: readonly Float64Array[], digits = 9): string {
  return fixedColumnsCsv(header, time_s, cols, 6, digits);
}

/** A file named and hashed by the caller (hashing needs I/O or node:crypto, which shared/ has not). */
export interface SourceFile {
  /** Base name, as shown in the manifest and the report. */
  file: string;
  sha256: string;
  size_bytes?: number;
  /** The name people know it by (a studio profile's name and version), where it differs from the file's. */
  label?: string;
}

/** Where a run's inputs came from, for the manifest and the report. */
export interface PackageSource {
  input: SourceFile;
  /** The parsed input track (before resampling): rows and time span. */
  track: Pick<Track, 'kind' | 'layout' | 'length' | 'time_s'>;
  base: SourceFile;
  /** Absent when the default profile was used or the track was not cued. */
  profile?: SourceFile;
  /** Absent when the demo budget was used. */
  budget?: SourceFile;
  /** The touch-up file (`legwork process --touchup`); absent when none or when it came with the run. */
  touchup?: SourceFile;
  /** The venue controller settings the run was made for (ramps, encoder), when given. */
  controller?: ControllerOutput;
  softwareVersion: string;
  /** The picture the run plays against (the take's film sync with the run's offset); null or absent: none. */
  filmSync?: FilmSync | null;
  /** Set by the worker: which run, take and venue the package belongs to. */
  run?: { id: string; take: { id: string; number: number }; venue: { id: string; name: string } };
}

/** One file of a run's outputs: its name, content type and text. */
export interface OutputFile {
  name: string;
  contentType: string;
  /** Text (written as UTF-8), or the file's bytes in pieces when they were made elsewhere (see buildRunOutputs). */
  content: string | readonly Uint8Array[];
}

/** Everything a run leaves behind, in memory; the sink writer hashes and stores it. */
export interface RunOutputs {
  /** The package files but the manifest, in PACKAGE_FILES order. */
  files: OutputFile[];
  /** manifest.json without its `files` list (the writer adds each file's SHA-256 and size). */
  manifest: Record<string, unknown>;
  /** The run's summary without its `files` list (the writer returns the entries to add). */
  summary: Omit<StoredRunSummary, 'files'>;
  /** The chart series, every band on the time axis' length (built on first read). */
  series: RunSeries;
}

const contentTypeOf = (name: PackageFileName): string =>
  (PACKAGE_FILES.find((f) => f.name === name) as { contentType: string }).contentType;

/**
 * Builds every output of a run from the pipeline result (see the file comment). `prebuilt` holds
 * files whose bytes the caller already made from the same result with the same functions (the CSV
 * files, on a second thread); they are taken as they are.
 */
export function buildRunOutputs(
  result: ProcessResult,
  input: Track,
  base: MotionBase,
  source: PackageSource,
  prebuilt: Partial<Record<PackageFileName, readonly Uint8Array[]>> = {},
): RunOutputs {
  const n = source.track.length;
  const start_s = source.track.time_s[0] as number;
  const end_s = source.track.time_s[n - 1] as number;
  const spectra = result.spectra;
  const report = buildReport(result.findings, {
    inputFile: source.input.file,
    inputKind: source.track.kind,
    inputRows: n,
    start_s,
    end_s,
    baseName: base.name ?? source.base.file,
    baseKind: base.kind,
    seats: base.seats_m.length,
    rate_hz: result.rate_hz,
    // The name the run page shows (the studio's profile name and version), so screen and report agree.
    profileName: result.profile ? (source.profile?.label ?? result.profile.name) : null,
    budget: result.budget,
    budgetIsDemo: result.budgetIsDemo,
    softwareVersion: source.softwareVersion,
    ...(spectra
      ? {
          sicknessBandShare: {
            x: spectra.axes.x.bandShare,
            y: spectra.axes.y.bandShare,
            z: spectra.axes.z.bandShare,
          },
        }
      : {}),
  });
  const manifest = {
    format: 'legwork-package',
    formatVersion: 1,
    software: { name: 'legwork', version: source.softwareVersion },
    caution: REPORT_CAUTION,
    result: { within: result.findings.within, exitCode: result.exitCode },
    input: {
      ...source.input,
      kind: source.track.kind,
      layout: source.track.layout,
      rows: n,
      start_s,
      end_s,
      meanRate_hz: n > 1 && end_s > start_s ? (n - 1) / (end_s - start_s) : null,
    },
    rates: {
      controller_hz: result.rate_hz,
      samples: result.time_s.length,
      resampling:
        (source.track.kind === 'vehicle'
          ? 'linear interpolation onto a fine grid'
          : 'cubic Hermite interpolation (three-point slopes) onto a fine grid') +
        `, then an anti-alias Kaiser-windowed sinc low-pass (cut-off ${sig(ANTI_ALIAS_CUTOFF * result.rate_hz)} Hz) read at the controller instants`,
      riderLowPass: `4-pole Butterworth, ${RIDER_LOWPASS_HZ} Hz (common practice)`,
      weighting: result.findings.comfort?.weightingNote ?? null,
    },
    base: { ...source.base, parameters: base },
    profile: result.profile
      ? { ...(source.profile ?? {}), default: source.profile === undefined, parameters: result.profile }
      : null,
    budget: { ...(source.budget ?? {}), demo: result.budgetIsDemo, parameters: result.budget },
    touchup: result.touchup ? { ...(source.touchup ?? {}), parameters: result.touchup } : null,
    ramp: result.ramp,
    ...(source.controller ? { controller: source.controller } : {}),
    filmSync: source.filmSync ? filmSyncManifest(source.filmSync) : null,
    notes: result.notes,
    ...(source.run ? { run: source.run } : {}),
  };
  const file = (name: PackageFileName, content: string | (() => string)): OutputFile => ({
    name,
    contentType: contentTypeOf(name),
    content: prebuilt[name] ?? (typeof content === 'string' ? content : content()),
  });
  const n_out = result.time_s.length;
  const summary: Omit<StoredRunSummary, 'files'> = {
    within: result.findings.within,
    exitCode: result.exitCode,
    uses: result.findings.uses,
    findings: result.findings.findings,
    comfort: result.findings.comfort ?? null,
    notes: result.notes,
    rate_hz: result.rate_hz,
    samples: n_out,
    duration_s: n_out > 0 ? (result.time_s[n_out - 1] as number) - (result.time_s[0] as number) : 0,
    budgetIsDemo: result.budgetIsDemo,
    ...(result.ramp ? { ramp: result.ramp } : {}),
  };
  // The chart series are built when first read: `legwork process` writes no series.json.
  let series: RunSeries | undefined;
  return {
    files: [
      file('legs.csv', () => legsCsv(result)),
      file('pose.csv', () => poseCsv(result)),
      file('seat_force.csv', () => seatForceCsv(result)),
      ...(result.legForce_N ? [file('leg_force.csv', legForceCsv(result.time_s, result.legForce_N))] : []),
      file('findings.json', `${JSON.stringify(result.findings, null, 2)}\n`),
      file('spectra.json', `${JSON.stringify(spectra)}\n`),
      file('report.txt', report),
    ],
    manifest,
    summary,
    get series() {
      series ??= buildRunSeries(result, input, base);
      return series;
    },
  };
}
