// The plain-language report of a package (report.txt): what was run, what was found, how much of the
// budget each check used, and the cautions (docs/motion-conventions.md section 8). Pure text from the pipeline result.
import type { Budget } from '../schemas/budget';
import type { CheckResult, Finding } from '../schemas/findings';
import { CHECK_UNIT } from '../schemas/findings';
import { CHECK_LABELS, checkUnit } from '../labels';

/** The cautions every delivered package carries, in plain words. */
export const REPORT_CAUTION = [
  'CAUTION. Motion systems can injure riders and staff. Legwork supports, and never replaces, the ride',
  "manufacturer's engineering, the applicable codes and standards (for example ASTM F2291, or EN 13814 /",
  'ISO 17842-1 where they apply), the local authority, and the sign-off of a qualified person.',
  'The budget numbers used below are whatever the venue entered; Legwork does not check them against any',
  'code or standard. A run within this budget is not thereby safe to ride.',
].join('\n');

/** What the report says about the run besides the checks (names, files, rates). */
export interface ReportContext {
  inputFile: string;
  inputKind: string;
  inputRows: number;
  start_s: number;
  end_s: number;
  baseName: string;
  baseKind: string;
  seats: number;
  rate_hz: number;
  /** Cueing profile name, or null when the input was already a pose or legs track. */
  profileName: string | null;
  budget: Budget;
  budgetIsDemo: boolean;
  softwareVersion: string;
  /** Share of each axis's rider-force power in the 0.1-0.5 Hz band (0..1), when spectra exist. */
  sicknessBandShare?: { x: number; y: number; z: number };
}

const CHECK_WORDS: Readonly<Record<Finding['check'], string>> = CHECK_LABELS;

const fmt = (v: number, digits = 4) => Number(v.toPrecision(digits)).toString();
const pct = (r: number) => `${(Math.floor(r * 1000) / 10).toFixed(1)} %`;

/** ISO 2631-1 Annex C comfort wording for a weighted r.m.s. in m/s^2 (the standard's ranges overlap; from memory). */
export function comfortWording(aw_mps2: number): string {
  if (aw_mps2 < 0.315) return 'not uncomfortable';
  if (aw_mps2 < 0.63) return 'a little uncomfortable';
  if (aw_mps2 < 1) return 'fairly uncomfortable';
  if (aw_mps2 < 1.6) return 'uncomfortable';
  if (aw_mps2 < 2.5) return 'very uncomfortable';
  return 'extremely uncomfortable';
}

function describeFinding(f: Finding, budget: Budget): string {
  const span = `${f.start_s.toFixed(2)}-${f.end_s.toFixed(2)} s`;
  const what = CHECK_WORDS[f.check];
  let detail: string;
  if (f.check === 'envelope' && f.axis !== undefined && f.row !== undefined) {
    const row = budget.envelope[f.axis][f.row];
    const band = row ? `[${row[1]}, ${row[2]}] g` : 'the band';
    detail =
      row && row[0] === 0
        ? `${f.axis} reached ${fmt(f.value)} g, past the absolute bound ${fmt(f.limit)} g of ${band}`
        : `${f.axis} stayed outside ${band} for ${fmt(f.value)} s; the row allows less than ${fmt(f.limit)} s`;
  } else if (f.check === 'startEnd' && f.quantity !== undefined && f.unit !== undefined) {
    detail = `|${f.quantity}| was ${fmt(f.value)} ${f.unit} at the ${f.subject}; the tolerance is ${fmt(f.limit)} ${f.unit}`;
  } else if (f.check === 'stroke') {
    detail = `${fmt(f.value)} m from mid-stroke, past the half-width ${fmt(f.limit)} m of the usable band`;
  } else {
    const unit = CHECK_UNIT[f.check];
    detail = `${fmt(f.value)} ${unit} against the limit ${fmt(f.limit)} ${unit}`;
  }
  return `  - [${f.severity}] ${what}, ${f.subject}, ${span}: ${detail} (${pct(f.ratio)} of the limit)`;
}

/** The text of report.txt for a checked run. */
export function buildReport(result: CheckResult, ctx: ReportContext): string {
  const out: string[] = [];
  const hard = result.findings.filter((f) => f.severity === 'hard');
  const comfort = result.findings.filter((f) => f.severity === 'comfort');
  out.push('Legwork motion package report', '=============================', '', REPORT_CAUTION, '');
  out.push(
    `Input:   ${ctx.inputFile} (${ctx.inputKind} track, ${ctx.inputRows} rows, ${ctx.start_s.toFixed(3)} to ${ctx.end_s.toFixed(3)} s)`,
    `Base:    ${ctx.baseName} (${ctx.baseKind}, ${ctx.seats} seat${ctx.seats === 1 ? '' : 's'}), processed at the controller rate ${ctx.rate_hz} Hz`,
    `Cueing:  ${ctx.profileName === null ? 'none (the input was already platform motion)' : `classical washout, profile "${ctx.profileName}"`}`,
    `Budget:  ${ctx.budget.name ?? '(unnamed)'}${ctx.budget.version !== undefined ? `, version ${ctx.budget.version}` : ''}`,
  );
  if (ctx.budgetIsDemo) {
    out.push(
      "         No budget was given, so the DEMO budget was used: invented numbers, not any standard's.",
    );
  }
  if (ctx.budget.source) out.push(`         Source as entered: ${ctx.budget.source}`);
  out.push(`Legwork: version ${ctx.softwareVersion}`, '');

  if (hard.length > 0) {
    out.push(
      'RESULT: OVER A HARD LIMIT. Actuator or rider-envelope limits are exceeded. This cannot be cleared by',
      'review: the motion must be cued again.',
    );
  } else if (comfort.length > 0) {
    out.push(
      'RESULT: OVER A COMFORT LIMIT. The run is held until a safety reviewer clears it with a written reason,',
      'or it is cued again.',
    );
  } else {
    out.push('RESULT: WITHIN THE BUDGET. Every check used less than its limit.');
  }
  out.push('');

  const LIST_MAX = 40;
  out.push(`Findings: ${result.findings.length} (${hard.length} hard, ${comfort.length} comfort)`);
  for (const f of [...hard, ...comfort].slice(0, LIST_MAX)) out.push(describeFinding(f, ctx.budget));
  if (result.findings.length > LIST_MAX) {
    out.push(`  ... and ${result.findings.length - LIST_MAX} more, listed in findings.json.`);
  }
  out.push('');

  out.push('Budget use: the worst value of each check over its limit (100 % = at the limit).');
  const byCheck = new Map<string, CheckResult['uses'][number]>();
  for (const u of result.uses) {
    const prev = byCheck.get(u.check);
    if (!prev || u.ratio > prev.ratio) byCheck.set(u.check, u);
  }
  for (const [check, u] of byCheck) {
    // The worst value against its limit where the check has one number for both (not the envelope).
    const unit = checkUnit(u.check);
    const measured =
      u.value !== undefined && u.limit !== undefined
        ? `: ${Number(u.value.toPrecision(4))} of ${Number(u.limit.toPrecision(4))}${unit ? ` ${unit}` : ''}`
        : '';
    out.push(
      `  ${CHECK_WORDS[check as Finding['check']].padEnd(44)} ${pct(u.ratio).padStart(8)}  (${u.subject}${measured})`,
    );
  }
  out.push('');

  const c = result.comfort;
  if (c) {
    out.push('Rider comfort over the whole track (ISO 2631-1:1997), at the worst seat per axis:');
    for (const axis of ['x', 'y', 'z'] as const) {
      const w = c.wrms_mps2[axis];
      out.push(
        `  weighted r.m.s. ${axis} (${axis === 'z' ? 'Wk' : 'Wd'}): ${fmt(w)} m/s^2 at ${c.wrmsSeat[axis]}, ` +
          `"${comfortWording(w)}" on the standard's comfort scale` +
          (c.crestFactor ? `, crest factor ${fmt(c.crestFactor[axis], 3)}` : '') +
          `; VDV ${fmt(c.vdv_mps1_75[axis])} m/s^1.75 at ${c.vdvSeat?.[axis] ?? c.wrmsSeat[axis]}` +
          (c.mtvv_mps2
            ? `; MTVV ${fmt(c.mtvv_mps2[axis])} m/s^2 at ${c.mtvvSeat?.[axis] ?? c.wrmsSeat[axis]}`
            : ''),
      );
    }
    out.push(
      `  MSDV z (Wf): ${fmt(c.msdvZ_mps1_5)} m/s^1.5 at ${c.msdvSeat}; by the standard's estimate about ` +
        `${fmt(Math.min(100, c.vomitShare_pct), 2)} % of people may vomit (Km = 1/3).`,
      `  ${c.weightingNote}`,
      '',
    );
  }
  if (ctx.sicknessBandShare) {
    const s = ctx.sicknessBandShare;
    out.push(
      "Spectra (spectra.json): share of the rider's specific-force power in 0.1-0.5 Hz, where motion sickness",
      `is most provoked: x ${pct(s.x)}, y ${pct(s.y)}, z ${pct(s.z)}.`,
      '',
    );
  }
  if (result.notes && result.notes.length > 0) {
    out.push('Notes:');
    for (const n of result.notes) out.push(`  - ${n}`);
    out.push('');
  }
  out.push(
    'How the checks work: each check gives a use ratio, its worst value over its limit. Rider forces are',
    'compared after a 4-pole Butterworth low-pass at 5 Hz (common practice for ride accelerations). Envelope',
    'rows with a duration allow the force outside their band for strictly less than that time; a row with',
    'duration 0 is an absolute bound. Stroke is checked inside [min + margin, max - margin]: its use is the',
    "leg's distance from the middle of that band over half the band's width (0 at mid-stroke, 1 at the margin).",
    '',
    REPORT_CAUTION,
    '',
  );
  return out.join('\n');
}
