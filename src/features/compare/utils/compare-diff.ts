// Pure helpers of the run comparison: which runs may be compared, the budget rows side by side with
// their change from the first run, the quantities comparable across venues, and the alignment of each
// run's own chart time axis onto one shared axis.
import { CHECK_SEVERITY } from '../../../../shared/schemas/findings';
import type { CheckName, Finding, Severity, Use } from '../../../../shared/schemas/findings';

import { ratioTone } from '../../../components/charts/run-badges';

export { COMPARE_MAX_RUNS, compareSelection } from '../../../lib/compare-selection';

/** The tiers of a use ratio, exactly as the app's use bars draw them (below 0.8, 0.8 to 1, 1 and above). */
export type UseTone = ReturnType<typeof ratioTone>;
export const useTone = ratioTone;

/** Checks whose subject is an actuator of the base. */
export const LEG_CHECKS: ReadonlySet<CheckName> = new Set<CheckName>([
  'stroke',
  'legSpeed',
  'legAccel',
  'legForce',
]);

const TONE_RANK: Record<UseTone, number> = { ok: 0, close: 1, over: 2 };

/** The run ids in the comparison address (`?runs=a,b,c`): trimmed, empty parts and repeats dropped. */
export function parseRunIds(param: string | null): string[] {
  if (!param) return [];
  const out: string[] = [];
  for (const part of param.split(',')) {
    const id = part.trim();
    if (id && !out.includes(id)) out.push(id);
  }
  return out;
}

/** One budget check on one subject, with each run's use (null where that run did not report it). */
export interface BudgetRow {
  key: string;
  check: CheckName;
  subject: string;
  axis: Use['axis'];
  severity: Severity;
  ratios: (number | null)[];
  /** Each run's ratio minus the first run's (null for the first run and where either is missing). */
  deltas: (number | null)[];
  /** How each run's tier compares with the first run's: worse, better, same, or null when not comparable. */
  shifts: ('worse' | 'better' | 'same' | null)[];
  /** Each run's worst value on this row (the check's unit), where the run reports one. */
  values: (number | null)[];
  /**
   * The limit in each run (the check's unit): the one its worst value was measured against, or else
   * the one a finding of this row gave; null where neither says (envelope rows, start/end).
   */
  limits: (number | null)[];
  /** The largest ratio over the runs, for sorting. */
  worst: number;
}

export function rowKey(use: Pick<Use, 'check' | 'subject' | 'axis'>): string {
  return `${use.check}|${use.subject}|${use.axis ?? ''}`;
}

/**
 * The budget uses of every run side by side: one row per check, subject and axis that any run
 * reports, each run's worst ratio on it (the largest when a run reports the key more than once), the
 * change from the first run and the tier shift, largest use first.
 */
export function budgetRows(
  runs: readonly { uses: readonly Use[]; findings: readonly Finding[] }[],
  options: { legsComparable?: boolean } = {},
): BudgetRow[] {
  const legsComparable = options.legsComparable ?? true;
  const rows = new Map<string, BudgetRow>();
  runs.forEach((run, k) => {
    for (const use of run.uses) {
      const key = rowKey(use);
      let row = rows.get(key);
      if (!row) {
        row = {
          key,
          check: use.check,
          subject: use.subject,
          axis: use.axis,
          severity: CHECK_SEVERITY[use.check],
          ratios: runs.map(() => null),
          deltas: runs.map(() => null),
          shifts: runs.map(() => null),
          values: runs.map(() => null),
          limits: runs.map(() => null),
          worst: Number.NEGATIVE_INFINITY,
        };
        rows.set(key, row);
      }
      const had = row.ratios[k];
      if (had === null || had === undefined || use.ratio > had) {
        row.ratios[k] = use.ratio;
        row.values[k] = use.value ?? null;
        row.limits[k] = use.limit ?? null;
      }
    }
    for (const finding of run.findings) {
      const row = rows.get(rowKey(finding));
      if (row && row.limits[k] === null) row.limits[k] = finding.limit;
    }
  });
  for (const row of rows.values()) {
    const first = row.ratios[0] ?? null;
    row.ratios.forEach((ratio, k) => {
      if (ratio !== null) row.worst = Math.max(row.worst, ratio);
      if (k === 0 || ratio === null || first === null) return;
      // Leg 2 of one base is not leg 2 of another: the use is shown, its change is not.
      if (!legsComparable && LEG_CHECKS.has(row.check)) return;
      row.deltas[k] = ratio - first;
      const shift = TONE_RANK[useTone(ratio)] - TONE_RANK[useTone(first)];
      row.shifts[k] = shift > 0 ? 'worse' : shift < 0 ? 'better' : 'same';
    });
  }
  return [...rows.values()].sort((a, b) => b.worst - a.worst || a.key.localeCompare(b.key));
}

/** Hard and comfort findings of a run. */
export function findingCounts(findings: readonly Pick<Finding, 'severity'>[]): {
  hard: number;
  comfort: number;
} {
  let hard = 0;
  for (const f of findings) if (f.severity === 'hard') hard++;
  return { hard, comfort: findings.length - hard };
}

/** A change of use as text with its direction, e.g. "▲ +0.12" or "▼ −0.05"; "=" when it rounds to none. */
export function deltaText(delta: number): string {
  const rounded = Math.round(delta * 100) / 100;
  if (rounded === 0) return '= 0.00';
  return `${rounded > 0 ? '▲ +' : '▼ −'}${Math.abs(rounded).toFixed(2)}`;
}

/** What the legs of the runs allow: overlaid when every run plays on one venue's base, else why not. */
export function legsComparable(runs: readonly { venueId: string; venueName: string; legCount: number }[]): {
  ok: boolean;
  reason: string;
} {
  const venues = [...new Set(runs.map((r) => r.venueId))];
  if (venues.length <= 1) return { ok: true, reason: '' };
  const names = [...new Set(runs.map((r) => r.venueName))].join(', ');
  return {
    ok: false,
    reason: `Leg lengths are not compared: the runs play on different motion bases (${names}), whose legs, strokes and layouts differ. Each run's own page charts them against its stroke band.`,
  };
}

/** The pose keys every run's series has (e.g. a planar stage has no yaw of its own), in the first run's order. */
export function sharedKeys(keySets: readonly (readonly string[])[]): {
  shared: string[];
  notShared: string[];
} {
  const first = keySets[0];
  if (!first) return { shared: [], notShared: [] };
  const all = [...new Set(keySets.flat())];
  const shared = all.filter((key) => keySets.every((keys) => keys.includes(key)));
  const order = (key: string) => (first.includes(key) ? first.indexOf(key) : first.length + all.indexOf(key));
  return {
    shared: shared.sort((a, b) => order(a) - order(b)),
    notShared: all.filter((key) => !shared.includes(key)).sort((a, b) => order(a) - order(b)),
  };
}

/**
 * Each run's values on one shared, sorted time axis (the union of their own axes): a run has its
 * value at its own instants and null between them, so uPlot joins its points (spanGaps) and no value
 * is invented or moved in time.
 */
export function alignOnSharedAxis(
  axes: readonly (readonly number[])[],
  columns: readonly (readonly (readonly number[])[])[],
): { x: number[]; columns: (number | null)[][][] } {
  const x = [...new Set(axes.flat())].sort((a, b) => a - b);
  const index = new Map(x.map((t, i) => [t, i]));
  const out = columns.map((runColumns, k) =>
    runColumns.map((values) => {
      const col: (number | null)[] = new Array<number | null>(x.length).fill(null);
      const axis = axes[k] ?? [];
      axis.forEach((t, i) => {
        const v = values[i];
        const at = index.get(t);
        if (at !== undefined && v !== undefined && Number.isFinite(v)) col[at] = v;
      });
      return col;
    }),
  );
  return { x, columns: out };
}

/**
 * The bucket of a run's own time axis that holds instant t (the last bucket starting at or before
 * t), or null when t lies before its first sample or after its last.
 */
export function bucketAt(time_s: readonly number[], t: number): number | null {
  const n = time_s.length;
  const first = time_s[0];
  const last = time_s[n - 1];
  if (n === 0 || first === undefined || last === undefined || !(t >= first) || t > last) return null;
  let lo = 0;
  let hi = n - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if ((time_s[mid] ?? Number.POSITIVE_INFINITY) <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}
