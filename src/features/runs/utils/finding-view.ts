// Pure helpers behind the run page's workbench: the window a selected finding zooms the charts to, the
// lanes of the take timeline and its tick marks. No React, no DOM.
import type { Finding } from '../../../../shared/schemas/findings';

/** A stretch of the time axis, in seconds. */
export interface TimeWindow {
  min: number;
  max: number;
}

/** The least context shown on each side of a finding (s): a 40 ms jerk spike still shows its neighbours. */
export const FINDING_MARGIN_MIN_S = 0.5;
/** The context on each side as a share of the finding's own length, when that is more. */
export const FINDING_MARGIN_SHARE = 0.5;

/**
 * The window the charts zoom to for a finding: its span with a margin on each side of
 * max(0.5 s, half the span). Not clipped to the take: the ends of a take show where the motion stops.
 */
export function findingWindow(finding: Pick<Finding, 'start_s' | 'end_s'>): TimeWindow {
  const from = Math.min(finding.start_s, finding.end_s);
  const to = Math.max(finding.start_s, finding.end_s);
  const margin_s = Math.max(FINDING_MARGIN_MIN_S, FINDING_MARGIN_SHARE * (to - from));
  return { min: from - margin_s, max: to + margin_s };
}

/** The lane key of a finding: one lane per check and subject (and axis or envelope row). */
export function laneKey(f: Finding): string {
  return [f.check, f.subject, f.axis ?? '', f.row ?? '', f.quantity ?? ''].join('|');
}

export interface TimelineLane {
  key: string;
  severity: Finding['severity'];
  /** A representative finding of the lane, for its label. */
  first: Finding;
  /** Rows of the lane: findings in one row never overlap in time (gap below `minGap_s`). */
  rows: number[][];
}

/**
 * The timeline's lanes: hard-limit lanes first, then comfort, each lane in the order of its first
 * finding. Findings of one lane that overlap (or come closer than `minGap_s`, so their marks would
 * touch) go to the next row of the lane (greedy interval packing, first row that fits). The numbers
 * in `rows` are indices into `findings`.
 */
export function timelineLanes(findings: readonly Finding[], minGap_s = 0): TimelineLane[] {
  const lanes = new Map<string, { severity: Finding['severity']; first: Finding; members: number[] }>();
  findings.forEach((f, i) => {
    const key = laneKey(f);
    const lane = lanes.get(key);
    if (lane) lane.members.push(i);
    else lanes.set(key, { severity: f.severity, first: f, members: [i] });
  });
  const startOf = (i: number) => findings[i]?.start_s ?? 0;
  const endOf = (i: number) => Math.max(findings[i]?.end_s ?? 0, startOf(i));
  const out: TimelineLane[] = [];
  for (const [key, lane] of lanes) {
    const members = [...lane.members].sort((a, b) => startOf(a) - startOf(b));
    const rows: number[][] = [];
    const rowEnd: number[] = [];
    for (const i of members) {
      let r = rowEnd.findIndex((end) => startOf(i) > end + minGap_s);
      if (r < 0) {
        r = rows.length;
        rows.push([]);
        rowEnd.push(-Infinity);
      }
      rows[r]!.push(i);
      rowEnd[r] = endOf(i);
    }
    out.push({ key, severity: lane.severity, first: lane.first, rows });
  }
  const earliest = (lane: TimelineLane) => Math.min(...lane.rows.flat().map(startOf));
  return out.sort(
    (a, b) => (a.severity === b.severity ? 0 : a.severity === 'hard' ? -1 : 1) || earliest(a) - earliest(b),
  );
}

/**
 * Tick values for an axis from `min` to `max`: steps of 1, 2 or 5 times a power of ten, about
 * `target` of them (the usual "nice numbers" rule of chart axes, common practice).
 */
export function niceTicks(min: number, max: number, target = 10): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max) || max <= min) return [];
  const raw = (max - min) / Math.max(target, 1);
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = ([1, 2, 5, 10].find((m) => m * power >= raw) ?? 10) * power;
  const ticks: number[] = [];
  for (let v = Math.ceil(min / step) * step; v <= max + step * 1e-9; v += step) {
    // Rounded to the step's decimals, so 0.1 + 0.2 reads 0.3.
    ticks.push(Number(v.toFixed(Math.max(0, -Math.floor(Math.log10(step))))));
  }
  return ticks;
}

/** The index of the time closest to `t_s` in an increasing time axis (binary search). */
export function nearestIndex(time_s: readonly number[], t_s: number): number {
  if (time_s.length === 0) return 0;
  let lo = 0;
  let hi = time_s.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if ((time_s[mid] ?? 0) <= t_s) lo = mid;
    else hi = mid;
  }
  return Math.abs((time_s[hi] ?? 0) - t_s) < Math.abs((time_s[lo] ?? 0) - t_s) ? hi : lo;
}
