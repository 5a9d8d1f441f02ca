// The rider's acceleration-duration envelope (docs/motion-conventions.md sections 5-7). For each row (duration d,
// lower, upper) the longest continuous time outside [lower, upper] must be shorter than d; d = 0 makes
// the row an absolute bound. For a timed row a value exactly on a bound is inside. An absolute row is
// a use ratio like any other check (bandRatio, 1 on the bound), and a ratio at or over 1 is a finding,
// so a value exactly on an absolute bound (1.0 g against 1.0 g) is a finding.
//
// Besides each violating excursion, every row reports the whole time spent outside it over the track
// and the number of separate excursions, so ten 0.4 s dips against a 1 s row read as what they are.
//
// Time outside is counted on the sample grid: an excursion of k consecutive samples outside lasts
// k / rate seconds (each sample stands for one sample interval). That errs on the safe side by up to one
// interval against the first-to-last-sample span, and a duration exactly equal to d is a violation
// because the rule asks for strictly shorter. The reported span is [t_first - dt/2, t_last + dt/2], so it
// covers every sample outside and is exactly as long as the counted duration.
import type { EnvelopeRow } from '../schemas/budget';

/** One excursion that breaks an envelope row; sample indices are into the checked signal. */
export interface EnvelopeViolation {
  row: number;
  firstIndex: number;
  lastIndex: number;
  /** Time outside, s (samples outside / rate). */
  duration_s: number;
  /** Peak (g) for an absolute row, the time outside (s) for a timed row. */
  value: number;
  /** The bound crossed (g) for an absolute row, the row's duration (s) for a timed row. */
  limit: number;
  ratio: number;
  /** Whole time outside this row over the track, s, and the number of excursions. */
  rowOutside_s: number;
  rowExcursions: number;
}

/** One row's totals over the track. */
export interface EnvelopeRowSummary {
  ratio: number;
  totalOutside_s: number;
  excursions: number;
}

/** Worst use of one axis signal against its envelope rows. */
export interface EnvelopeAxisResult {
  /** Worst use ratio over all rows: bandRatio for absolute rows, time outside / duration for timed rows. */
  ratio: number;
  /** Row that gave the worst ratio. */
  worstRow: number;
  violations: EnvelopeViolation[];
  /** Per row: its worst ratio, the whole time outside it (s) and the number of excursions. */
  rows: EnvelopeRowSummary[];
}

/**
 * Use ratio of one sample against a band, measured from the at-rest value: (v - rest) / (upper - rest)
 * above rest, (rest - v) / (rest - lower) below. For x and y (rest 0) this is value / limit; for z it
 * is the excursion from 1 g over the room the band allows, which stays meaningful for a lower bound such
 * as 0.2 g where value / limit would not. Requires lower < rest < upper (the budget schema checks it).
 */
export function bandRatio(v_g: number, lower_g: number, upper_g: number, rest_g: number): number {
  return v_g >= rest_g ? (v_g - rest_g) / (upper_g - rest_g) : (rest_g - v_g) / (rest_g - lower_g);
}

/**
 * Checks one axis of specific force (g, uniform grid at rate_hz, read as signal[offset + i * stride] for
 * i < n) against envelope rows whose bands contain rest_g.
 */
export function checkEnvelopeAxis(
  signal_g: Float64Array,
  offset: number,
  stride: number,
  n: number,
  rate_hz: number,
  rows: readonly EnvelopeRow[],
  rest_g: number,
): EnvelopeAxisResult {
  const violations: EnvelopeViolation[] = [];
  const summaries: EnvelopeRowSummary[] = [];
  let worst = 0;
  let worstRow = 0;
  for (let r = 0; r < rows.length; r++) {
    const rowFirstViolation = violations.length;
    let outsideCount = 0;
    let excursions = 0;
    const row = rows[r] as EnvelopeRow;
    const d_s = row[0];
    const lo = row[1];
    const hi = row[2];
    let rowRatio = 0;
    let runFirst = -1;
    let peakRatio = 0;
    let peakValue = 0;
    const closeRun = (last: number) => {
      const count = last - runFirst + 1;
      const duration_s = count / rate_hz;
      outsideCount += count;
      excursions++;
      if (d_s === 0) {
        violations.push({
          row: r,
          firstIndex: runFirst,
          lastIndex: last,
          duration_s,
          value: peakValue,
          limit: peakValue > rest_g ? hi : lo,
          ratio: peakRatio,
          rowOutside_s: 0,
          rowExcursions: 0,
        });
      } else {
        const ratio = duration_s / d_s;
        if (ratio > rowRatio) rowRatio = ratio;
        if (duration_s >= d_s) {
          violations.push({
            row: r,
            firstIndex: runFirst,
            lastIndex: last,
            duration_s,
            value: duration_s,
            limit: d_s,
            ratio,
            rowOutside_s: 0,
            rowExcursions: 0,
          });
        }
      }
      runFirst = -1;
    };
    for (let i = 0; i < n; i++) {
      const v = signal_g[offset + i * stride] as number;
      let outside: boolean;
      if (d_s === 0) {
        const q = bandRatio(v, lo, hi, rest_g);
        if (q > rowRatio) rowRatio = q;
        // At or over the bound: ratio >= 1 (see the file comment).
        outside = q >= 1;
        if (outside) {
          if (runFirst < 0) {
            runFirst = i;
            peakRatio = q;
            peakValue = v;
          } else if (q > peakRatio) {
            peakRatio = q;
            peakValue = v;
          }
        }
      } else {
        outside = v < lo || v > hi;
        if (outside && runFirst < 0) runFirst = i;
      }
      if (!outside && runFirst >= 0) closeRun(i - 1);
    }
    if (runFirst >= 0) closeRun(n - 1);
    const totalOutside_s = outsideCount / rate_hz;
    for (let v = rowFirstViolation; v < violations.length; v++) {
      const viol = violations[v] as EnvelopeViolation;
      viol.rowOutside_s = totalOutside_s;
      viol.rowExcursions = excursions;
    }
    summaries.push({ ratio: rowRatio, totalOutside_s, excursions });
    if (rowRatio > worst) {
      worst = rowRatio;
      worstRow = r;
    }
  }
  return { ratio: worst, worstRow, violations, rows: summaries };
}
