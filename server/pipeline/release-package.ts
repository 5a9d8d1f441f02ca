// Builds a release package: one zip with the run's stored files, the controller's files (positions in
// mm as CSV and as little-endian float32 frames), leg speed and acceleration series at the controller
// rate, a printable report.html, and manifest.json written last with every other file's SHA-256 and
// size. Equal input gives equal bytes: entries carry one fixed time and are written in a fixed order.
import { createHash } from 'node:crypto';
import yazl from 'yazl';
import { CHECK_LABELS, TIER_LABELS, checkUnit, subjectLabel } from '../../shared/labels';
import {
  actuatorPositions_mm,
  ControllerOutputError,
  controllerCsv,
  encoderCounts,
  float32Frames,
  frameLayout,
  int32Frames,
} from '../../shared/motion/controller-output';
import type { ControllerOutput } from '../../shared/schemas/controller-output';
import type { Touchup } from '../../shared/schemas/touchup';
import { REPORT_CAUTION } from '../../shared/motion/report';
import type { Finding } from '../../shared/schemas/findings';
import type { MotionBase } from '../../shared/schemas/motion-base';
import {
  MANIFEST_NAME,
  packageManifestSchema,
  type PackageManifest,
} from '../../shared/schemas/package-manifest';
import type { Person, Review } from '../../shared/schemas/review';
import type { ManifestFile, StoredRunSummary } from '../../shared/schemas/run-outputs';

export interface VersionRef {
  id: string;
  name: string;
  version: number;
}

export interface ReleasePackageInput {
  release: { id: string; releasedBy: Person; releasedAt: string };
  reviews: Review[];
  run: { id: string; state: string; summary: StoredRunSummary };
  track: { id: string; title: string };
  take: { id: string; number: number; sha256: string; filename: string };
  venue: { id: string; name: string; timeZone: string };
  /** The geometry the run was computed with, its name and the SHA-256 of its JSON. */
  motionBase: { id: string; name: string; sha256: string; base: MotionBase };
  /** Null for a pose or legs take (not cued). */
  cueing: VersionRef | null;
  budget: VersionRef;
  softwareVersion: string;
  /** The take's film sync settings, when it has them. */
  filmSync?: Record<string, unknown> | null;
  /** The venue controller settings the run was made with (its parameters); absent: millimetres only. */
  controller?: ControllerOutput | null;
  /** The touch-up applied to the take before cueing (the run's parameters), when there was one. */
  touchup?: Touchup | null;
  /** Reads one of the run's stored files (legs.csv, pose.csv, findings.json, spectra.json, report.txt). */
  readRunFile(name: string): Promise<Buffer>;
}

export interface BuiltPackage {
  zip: Buffer;
  sha256: string;
  sizeBytes: number;
  files: ManifestFile[];
  name: string;
}

/** The run's stored files copied into the package as they are. */
export const COPIED_RUN_FILES = [
  'legs.csv',
  'pose.csv',
  'findings.json',
  'spectra.json',
  'report.txt',
] as const;
export const CONTROLLER_CSV = 'controller/positions_mm.csv';
export const CONTROLLER_BIN = 'controller/positions_f32le.bin';
export const COUNTS_CSV = 'controller/counts.csv';
export const COUNTS_BIN = 'controller/counts_i32le.bin';
export const LEG_SPEED_CSV = 'series/leg_speed.csv';
export const LEG_ACCEL_CSV = 'series/leg_accel.csv';
export const SEAT_FORCE_CSV = 'series/seat_force.csv';
export const LEG_FORCE_CSV = 'series/leg_force.csv';

/**
 * Series the run computed and the package carries as they are, when the run has them (runs made
 * before they were stored have neither; leg forces need a payload on the base).
 */
export const RUN_SERIES_FILES = [
  {
    run: 'seat_force.csv',
    file: SEAT_FORCE_CSV,
    unit: 'm/s^2',
    describes:
      'specific force at each seat (x forward, y left, z up, platform frame), before the rider low-pass; at rest fz = +9.80665',
  },
  {
    run: 'leg_force.csv',
    file: LEG_FORCE_CSV,
    unit: 'N',
    describes: 'axial force of each leg from the platform and payload inverse dynamics, compression positive',
  },
] as const;
export const REPORT_HTML = 'report.html';

/** The fixed modification time of every entry (zip times have 2 s resolution and no zone). */
const ENTRY_TIME = new Date(Date.UTC(2000, 0, 1, 0, 0, 0));

/** The one HTML escape of the report: &, <, >, " and ' as entities. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

/** Lower-case ASCII slug of a name for the package's file name ("Canyon Run!" -> "canyon-run"). */
export function slug(text: string): string {
  const s = text
    .normalize('NFKD')
    .replace(/[^\x20-\x7e]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40)
    .replace(/-+$/, '');
  return s || 'untitled';
}

/** The package's file name: <track>-take<N>-<venue>-r<first 8 of the release id>.zip. */
export function packageName(
  input: Pick<ReleasePackageInput, 'track' | 'take' | 'venue' | 'release'>,
): string {
  const short = input.release.id.replace(/-/g, '').slice(0, 8);
  return `${slug(input.track.title)}-take${input.take.number}-${slug(input.venue.name)}-r${short}.zip`;
}

export class PackageInputError extends Error {}

/** Parses legs.csv (time_s, leg1_m ..): the time column and one column per leg. */
export function parseLegsCsv(text: string): { time_s: Float64Array; legs: Float64Array[] } {
  const lines = text.split(/\r?\n/).filter((l) => l.trim() !== '');
  const header = (lines[0] ?? '').split(',').map((h) => h.trim());
  if (
    header[0] !== 'time_s' ||
    header.length < 2 ||
    !header.slice(1).every((h, i) => h === `leg${i + 1}_m`)
  ) {
    throw new PackageInputError(`legs.csv line 1: expected "time_s,leg1_m,..", got "${lines[0] ?? ''}"`);
  }
  const n = lines.length - 1;
  const time_s = new Float64Array(n);
  const legs = header.slice(1).map(() => new Float64Array(n));
  for (let i = 0; i < n; i++) {
    const cells = (lines[i + 1] as string).split(',');
    if (cells.length !== header.length) {
      throw new PackageInputError(
        `legs.csv line ${i + 2}: ${cells.length} values, expected ${header.length}`,
      );
    }
    for (let j = 0; j < cells.length; j++) {
      const v = Number(cells[j]);
      if (!Number.isFinite(v)) {
        throw new PackageInputError(`legs.csv line ${i + 2} column ${j + 1}: "${cells[j]}" is not a number`);
      }
      if (j === 0) time_s[i] = v;
      else (legs[j - 1] as Float64Array)[i] = v;
    }
  }
  return { time_s, legs };
}

/** Finite-difference derivative at a uniform step: central inside, one-sided at the ends. */
export function derivative(x: Float64Array, dt: number): Float64Array {
  const n = x.length;
  const out = new Float64Array(n);
  if (n < 2) return out;
  out[0] = ((x[1] as number) - (x[0] as number)) / dt;
  out[n - 1] = ((x[n - 1] as number) - (x[n - 2] as number)) / dt;
  for (let i = 1; i < n - 1; i++) out[i] = ((x[i + 1] as number) - (x[i - 1] as number)) / (2 * dt);
  return out;
}

function seriesCsv(time_s: Float64Array, columns: Float64Array[], suffix: string, digits: number): string {
  const header = ['time_s', ...columns.map((_, i) => `leg${i + 1}_${suffix}`)];
  const lines = [header.join(',')];
  for (let i = 0; i < time_s.length; i++) {
    lines.push(
      [(time_s[i] as number).toFixed(6), ...columns.map((c) => (c[i] as number).toFixed(digits))].join(','),
    );
  }
  return `${lines.join('\n')}\n`;
}

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

/** Inline SVG of each leg's stroke use (0 = fully retracted, 100 % = fully extended) with findings marked. */
function strokeChart(
  time_s: Float64Array,
  positions_mm: Float64Array[],
  stroke_mm: number,
  findings: Finding[],
): string {
  const W = 720;
  const H = 220;
  const pad = 36;
  const t0 = time_s[0] ?? 0;
  const t1 = time_s[time_s.length - 1] ?? 1;
  const span = t1 - t0 || 1;
  const x = (t: number) => pad + ((t - t0) / span) * (W - 2 * pad);
  const y = (pct: number) => H - pad - (Math.max(0, Math.min(110, pct)) / 110) * (H - 2 * pad);
  const step = Math.max(1, Math.floor(time_s.length / 600));
  const marks = findings
    .map((f) => {
      const a = x(Math.max(t0, f.start_s));
      const b = Math.max(a + 1, x(Math.min(t1, f.end_s)));
      return `<rect x="${a.toFixed(1)}" y="${pad}" width="${(b - a).toFixed(1)}" height="${H - 2 * pad}" class="${f.severity === 'hard' ? 'mark-hard' : 'mark-comfort'}"><title>${escapeHtml(CHECK_LABELS[f.check])}</title></rect>`;
    })
    .join('');
  const lines = positions_mm
    .map((p, j) => {
      const pts: string[] = [];
      for (let i = 0; i < p.length; i += step) {
        pts.push(
          `${x(time_s[i] as number).toFixed(1)},${y(((p[i] as number) / stroke_mm) * 100).toFixed(1)}`,
        );
      }
      return `<polyline class="leg leg${j % 6}" points="${pts.join(' ')}"/>`;
    })
    .join('');
  const grid = [0, 50, 100]
    .map(
      (v) =>
        `<line x1="${pad}" x2="${W - pad}" y1="${y(v)}" y2="${y(v)}" class="grid"/><text x="2" y="${y(v) + 4}">${v} %</text>`,
    )
    .join('');
  return `<svg viewBox="0 0 ${W} ${H}" width="100%" role="img" aria-label="Leg stroke use over time">${grid}${marks}${lines}<text x="${pad}" y="${H - 8}">${t0.toFixed(1)} s</text><text x="${W - pad - 40}" y="${H - 8}">${t1.toFixed(1)} s</text></svg>`;
}

function fmtNum(v: number): string {
  return Math.abs(v) >= 100 ? v.toFixed(0) : Math.abs(v) >= 1 ? v.toFixed(2) : v.toPrecision(3);
}

/** The report's film sync row (the picture's rate, first timecode, the motion's offset), or nothing. */
function filmSyncRow(sync: ReleasePackageInput['filmSync']): string {
  if (!sync) return '';
  const label = String(sync.frameRateLabel ?? sync.frameRate ?? '');
  const offset = Number(sync.offset_frames ?? 0);
  return `<tr><th>Film sync</th><td>${escapeHtml(label)}, picture starts ${escapeHtml(String(sync.startTimecode ?? ''))}, motion ${offset >= 0 ? '+' : ''}${offset} frame(s) against the picture</td></tr>
`;
}

/** The printable, self-contained safety report: inline CSS and SVG, no external resources. */
export function buildReportHtml(
  input: ReleasePackageInput,
  time_s: Float64Array,
  positions_mm: Float64Array[],
  budgetRows: { key: string; value: string }[],
): string {
  const e = escapeHtml;
  const s = input.run.summary;
  const base = input.motionBase.base;
  const stroke_mm = (base.leg.max_m - base.leg.min_m) * 1000;
  const findings = s.findings
    .map(
      (f) =>
        `<tr><td>${e(CHECK_LABELS[f.check])}</td><td>${e(TIER_LABELS[f.severity])}</td><td>${e(subjectLabel(f.subject))}</td><td>${f.start_s.toFixed(2)}–${f.end_s.toFixed(2)} s</td><td>${e(fmtNum(f.value))} / ${e(fmtNum(f.limit))} ${e(checkUnit(f.check))}</td></tr>`,
    )
    .join('');
  const reviews = input.reviews
    .map(
      (r) =>
        `<tr><td>${e(r.decision === 'clear' ? 'Cleared' : 'Held')}</td><td>${e(r.reviewer.name)}</td><td>${e(r.createdAt)}</td><td>${e(r.budgetVersion.name)} v${r.budgetVersion.version}</td><td>${e(r.reason)}</td></tr>`,
    )
    .join('');
  const budget = budgetRows.map((b) => `<tr><td>${e(b.key)}</td><td>${e(b.value)}</td></tr>`).join('');
  const ramp = s.ramp
    ? `${s.ramp.in_s} s in and ${s.ramp.out_s} s out, ${s.ramp.profile === 'quintic' ? 'quintic from rest (position, speed and acceleration meet the show)' : 'raised cosine (position meets the show)'}; the files start and end at neutral at rest, and the ramps were checked with the show`
    : "none: the files start and end at the show's own first and last positions";
  const enc = input.controller?.encoder;
  const encoderRow = enc
    ? `${e(COUNTS_CSV)} and ${e(COUNTS_BIN)}: round(mm x ${enc.countsPerMm} + ${enc.zeroOffset_counts})`
    : 'none (millimetres only)';
  const tu = input.touchup;
  const touchupSection = tu
    ? `<h2>Touch-up of the take</h2>
<p>Applied to the take before cueing, by the worker and by <code>legwork process --touchup</code> alike.</p>
<table><tr><th>Time offset</th><td>${tu.offset_s} s</td></tr><tr><th>Trim</th><td>in ${tu.trimIn_s === undefined ? 'none' : `${tu.trimIn_s} s`}, out ${tu.trimOut_s === undefined ? 'none' : `${tu.trimOut_s} s`}</td></tr>
<tr><th>Fades</th><td>in ${tu.fadeIn_s} s, out ${tu.fadeOut_s} s</td></tr>
<tr><th>Gain</th><td>${e(
        Object.entries(tu.gain)
          .map(([k, v]) => `${k} x ${v}`)
          .join(', ') || 'none',
      )}</td></tr>
<tr><th>Smoothing</th><td>${e(
        Object.entries(tu.smoothing_hz)
          .map(([k, v]) => `${k} ${v} Hz`)
          .join(', ') || 'none',
      )}</td></tr></table>
`
    : '';
  const park = base.park
    ? `<p>The motion base's park sequence as given: ${e(base.park)}</p>`
    : '<p><strong>No park or emergency-stop sequence is given for this motion base.</strong> Obtain it from the ride maker before running this track.</p>';
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${e(input.track.title)} — take ${input.take.number} — ${e(input.venue.name)}</title>
<style>
body{font:14px/1.45 system-ui,sans-serif;color:#1b1b1b;margin:2rem;max-width:60rem}
h1{font-size:1.4rem}h2{font-size:1.1rem;margin-top:1.6rem;border-bottom:1px solid #999}
table{border-collapse:collapse;width:100%}td,th{border:1px solid #bbb;padding:.25rem .4rem;text-align:left;vertical-align:top}
.caution{border:2px solid #8a1c1c;padding:.6rem .8rem;background:#fff4f2}
svg text{font-size:10px;fill:#333}.grid{stroke:#ccc}.leg{fill:none;stroke-width:1}
.leg0{stroke:#1f4e79}.leg1{stroke:#7a3e00}.leg2{stroke:#2e6b2e}.leg3{stroke:#6b2e6b}.leg4{stroke:#00606b}.leg5{stroke:#555}
.mark-hard{fill:#c0392b;opacity:.25}.mark-comfort{fill:#e0a800;opacity:.25}
@media print{body{margin:0;font-size:11pt}.caution{background:none}h2{break-after:avoid}table,svg{break-inside:avoid}}
</style></head><body>
<h1>Safety report: ${e(input.track.title)}, take ${input.take.number}, for ${e(input.venue.name)}</h1>
<div class="caution"><p>${e(REPORT_CAUTION).replace(/\n/g, ' ')}</p>
<p>This package supports the ride engineer's judgement. It does not replace the applicable codes and standards (for amusement rides, for example ASTM F2291 and EN 13814 / ISO 17842, as applicable) or the ride manufacturer's instructions.</p></div>
<h2>Release</h2>
<table><tr><th>Released by</th><td>${e(input.release.releasedBy.name)}</td></tr><tr><th>Released at</th><td>${e(input.release.releasedAt)}</td></tr>
<tr><th>Take</th><td>${e(input.take.filename)} (SHA-256 ${e(input.take.sha256)})</td></tr>
<tr><th>Motion base</th><td>${e(input.motionBase.name)} (geometry SHA-256 ${e(input.motionBase.sha256)})</td></tr>
<tr><th>Cueing profile</th><td>${input.cueing ? `${e(input.cueing.name)} v${input.cueing.version}` : 'none (the take is a pose or legs track)'}</td></tr>
<tr><th>Budget</th><td>${e(input.budget.name)} v${input.budget.version}</td></tr>
${filmSyncRow(input.filmSync)}<tr><th>Ramps</th><td>${e(ramp)}</td></tr>
<tr><th>Encoder counts</th><td>${encoderRow}</td></tr>
<tr><th>Software</th><td>Legwork ${e(input.softwareVersion)}</td></tr>
<tr><th>Verdict</th><td>${s.within ? 'Within budget' : 'Over budget'}, ${s.samples} samples at ${s.rate_hz} Hz, ${s.duration_s.toFixed(1)} s</td></tr></table>
${touchupSection}<h2>Leg stroke use over time</h2>
${strokeChart(time_s, positions_mm, stroke_mm, s.findings)}
<h2>Findings</h2>
${findings ? `<table><tr><th>Check</th><th>Tier</th><th>Where</th><th>When</th><th>Value / limit</th></tr>${findings}</table>` : '<p>No findings: every check is under its limit.</p>'}
<h2>Budget</h2>
<table><tr><th>Limit</th><th>Value</th></tr>${budget}</table>
<h2>Reviews</h2>
${reviews ? `<table><tr><th>Decision</th><th>Reviewer</th><th>When</th><th>Budget</th><th>Reason</th></tr>${reviews}</table>` : '<p>No reviews.</p>'}
<h2>Park and emergency stop</h2>
<p>What the controller does on an abort or emergency stop is the ride maker's responsibility; this package carries the show and its ramps only. ${s.ramp ? 'The controller files start and end at neutral at rest: the park sequence below runs before the first frame and after the last.' : 'The controller files start and end at the positions in them; the run was made without ramps from neutral.'}</p>
${park}
</body></html>
`;
}

/** Builds the release package zip; equal input gives equal bytes. */
export async function buildReleasePackage(
  input: ReleasePackageInput & { budgetRows?: { key: string; value: string }[] },
): Promise<BuiltPackage> {
  const entries: { name: string; data: Buffer }[] = [];
  for (const name of COPIED_RUN_FILES) entries.push({ name, data: await input.readRunFile(name) });
  const base = input.motionBase.base;
  const { time_s, legs } = parseLegsCsv((entries[0] as { data: Buffer }).data.toString('utf8'));
  const positions = actuatorPositions_mm(legs, base.leg.min_m);
  const rate = base.controllerRate_hz;
  const dt = 1 / rate;
  const speed = legs.map((l) => derivative(l, dt));
  const accel = speed.map((v) => derivative(v, dt));
  const columns = positions.map((_, i) => `leg${i + 1}_mm`);
  const layout = frameLayout(CONTROLLER_BIN, columns, time_s.length, rate);
  const enc = input.controller?.encoder;
  const counts = enc ? encoderCounts(positions, enc) : null;
  let countsBin: Uint8Array | null = null;
  if (counts) {
    try {
      countsBin = int32Frames(counts);
    } catch (err) {
      if (err instanceof ControllerOutputError) throw new PackageInputError(err.message);
      throw err;
    }
  }
  const countsLayout = counts
    ? frameLayout(
        COUNTS_BIN,
        columns.map((_, i) => `leg${i + 1}_counts`),
        time_s.length,
        rate,
        'counts',
      )
    : null;
  const rampSummary = input.run.summary.ramp;
  const rampFrames = rampSummary
    ? {
        ...rampSummary,
        showStartFrame: Math.round(rampSummary.in_s * rate),
        showEndFrame: time_s.length - 1 - Math.round(rampSummary.out_s * rate),
      }
    : null;
  const series: PackageManifest['series'] = [
    {
      file: LEG_SPEED_CSV,
      unit: 'm/s',
      rate_hz: rate,
      describes: "each leg's speed",
      columns: columns.map((_, i) => `leg${i + 1}_mps`),
    },
    {
      file: LEG_ACCEL_CSV,
      unit: 'm/s^2',
      rate_hz: rate,
      describes: "each leg's acceleration",
      columns: columns.map((_, i) => `leg${i + 1}_mps2`),
    },
  ];
  const stored = new Set(input.run.summary.files.map((f) => f.name));
  const copiedSeries: { name: string; data: Buffer }[] = [];
  for (const f of RUN_SERIES_FILES) {
    if (!stored.has(f.run)) continue;
    const data = await input.readRunFile(f.run);
    const header = data.subarray(0, Math.max(0, data.indexOf(10))).toString('utf8');
    copiedSeries.push({ name: f.file, data });
    series.push({
      file: f.file,
      unit: f.unit,
      rate_hz: rate,
      describes: f.describes,
      columns: header.split(',').slice(1),
    });
  }
  entries.push(
    {
      name: REPORT_HTML,
      data: Buffer.from(buildReportHtml(input, time_s, positions, input.budgetRows ?? []), 'utf8'),
    },
    { name: CONTROLLER_CSV, data: Buffer.from(controllerCsv(time_s, positions), 'utf8') },
    { name: CONTROLLER_BIN, data: Buffer.from(float32Frames(positions)) },
    ...(counts && countsBin
      ? [
          { name: COUNTS_CSV, data: Buffer.from(controllerCsv(time_s, positions, counts), 'utf8') },
          { name: COUNTS_BIN, data: Buffer.from(countsBin) },
        ]
      : []),
    { name: LEG_SPEED_CSV, data: Buffer.from(seriesCsv(time_s, speed, 'mps', 6), 'utf8') },
    { name: LEG_ACCEL_CSV, data: Buffer.from(seriesCsv(time_s, accel, 'mps2', 5), 'utf8') },
    ...copiedSeries,
  );
  const files: ManifestFile[] = entries.map((f) => ({
    name: f.name,
    sha256: sha256(f.data),
    size_bytes: f.data.length,
  }));
  const manifest: PackageManifest = packageManifestSchema.parse({
    format: 'legwork-release-package',
    formatVersion: 1,
    softwareVersion: input.softwareVersion,
    release: input.release,
    run: { id: input.run.id, state: input.run.state },
    track: input.track,
    take: input.take,
    venue: input.venue,
    motionBase: { id: input.motionBase.id, name: input.motionBase.name, sha256: input.motionBase.sha256 },
    cueing: input.cueing,
    budget: input.budget,
    filmSync: input.filmSync ?? null,
    reviews: input.reviews,
    controller: {
      csv: CONTROLLER_CSV,
      binary: layout,
      ...(enc && countsLayout
        ? {
            counts: {
              csv: COUNTS_CSV,
              binary: countsLayout,
              countsPerMm: enc.countsPerMm,
              zeroOffset_counts: enc.zeroOffset_counts,
            },
          }
        : {}),
      ...(rampFrames ? { ramp: rampFrames } : {}),
    },
    series,
    files,
  });
  entries.push({ name: MANIFEST_NAME, data: Buffer.from(`${JSON.stringify(manifest, null, 2)}\n`, 'utf8') });

  const zip = new yazl.ZipFile();
  for (const f of entries) zip.addBuffer(f.data, f.name, { mtime: ENTRY_TIME, mode: 0o100644 });
  zip.end();
  const chunks: Buffer[] = [];
  const out = await new Promise<Buffer>((resolve, reject) => {
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c));
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on('error', reject);
  });
  return { zip: out, sha256: sha256(out), sizeBytes: out.length, files, name: packageName(input) };
}
