// The acceleration-duration envelope of one axis as a chart: for an excursion lasting a given time
// (log axis, s), the band of specific force (g) the rider may be in. A row [duration_s, lower_g,
// upper_g] says the rider is outside [lower, upper] for less than duration_s at a time, so an
// excursion lasting T must stay inside every row whose duration_s is at most T: the allowed band
// narrows, step by step, as T grows (docs/motion-conventions.md, Findings: Envelope).
import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import type { Options } from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { EnvelopeRow } from '../../../../shared/schemas/budget';
import { CHART_COLORS, withAlpha } from '../../../components/charts/palette';

export interface EnvelopeSteps {
  /** Durations (s), increasing, all above 0: where the band changes, and the chart's right end. */
  duration_s: number[];
  /** The band in force from each duration on (g); null before the first row with a duration. */
  lower_g: (number | null)[];
  upper_g: (number | null)[];
}

/**
 * The allowed band as a step function of excursion length. Rows with duration 0 (instantaneous
 * bounds) hold from `left_s`; the chart ends a decade past the longest row. Rows need not be sorted
 * or valid: the band is the tightest of the rows that apply.
 */
export function envelopeSteps(rows: readonly EnvelopeRow[]): EnvelopeSteps {
  const usable = rows.filter((r) => r.every(Number.isFinite) && r[0] >= 0).sort((a, b) => a[0] - b[0]);
  const positive = usable.map((r) => r[0]).filter((d) => d > 0);
  const shortest = positive.length > 0 ? Math.min(...positive) : 1;
  const longest = positive.length > 0 ? Math.max(...positive) : 1;
  const left_s = shortest / 10;
  const right_s = longest * 10;
  const out: EnvelopeSteps = { duration_s: [], lower_g: [], upper_g: [] };
  let lower = -Infinity;
  let upper = Infinity;
  for (const [d, lo, hi] of usable) {
    lower = Math.max(lower, lo);
    upper = Math.min(upper, hi);
    const x = Math.max(d, left_s);
    const last = out.duration_s.length - 1;
    if (last >= 0 && out.duration_s[last] === x) {
      out.lower_g[last] = lower;
      out.upper_g[last] = upper;
    } else {
      out.duration_s.push(x);
      out.lower_g.push(lower);
      out.upper_g.push(upper);
    }
  }
  if (out.duration_s.length > 0) {
    out.duration_s.push(right_s);
    out.lower_g.push(lower);
    out.upper_g.push(upper);
  }
  return out;
}

/** One axis' envelope drawn while it is edited: upper and lower bound against excursion length. */
export function EnvelopeChart({
  title,
  rows,
  rest_g,
  width_px = 360,
  height_px = 180,
}: {
  title: string;
  rows: readonly EnvelopeRow[];
  /** The at-rest value (g) every row must contain: drawn as a dotted line. */
  rest_g: number;
  width_px?: number;
  height_px?: number;
}) {
  const holder = useRef<HTMLDivElement>(null);
  const steps = envelopeSteps(rows);
  const key = JSON.stringify(steps);

  useEffect(() => {
    const el = holder.current;
    if (!el || steps.duration_s.length === 0) return;
    const color = CHART_COLORS.cued;
    const stepped = uPlot.paths.stepped?.({ align: 1 });
    const options: Options = {
      width: width_px,
      height: height_px,
      legend: { show: false },
      cursor: { show: false },
      scales: {
        x: { time: false, distr: 3, log: 10 },
        y: {
          range: (_u, min, max) => {
            const lo = Math.min(min, rest_g);
            const hi = Math.max(max, rest_g);
            const pad = (hi - lo) * 0.12 || 0.5;
            return [lo - pad, hi + pad];
          },
        },
      },
      axes: [
        {
          label: 'Excursion lasting (s, log)',
          stroke: CHART_COLORS.axis,
          grid: { stroke: CHART_COLORS.grid, width: 1 },
          size: 36,
          values: (_u, splits) => splits.map((v) => (v === null ? '' : String(Number(v.toPrecision(2))))),
        },
        {
          label: 'Specific force (g)',
          stroke: CHART_COLORS.axis,
          grid: { stroke: CHART_COLORS.grid, width: 1 },
          size: 48,
          space: 20,
        },
      ],
      series: [
        {},
        {
          label: 'upper',
          stroke: color,
          width: 2,
          ...(stepped ? { paths: stepped } : {}),
          points: { show: true, size: 5 },
        },
        {
          label: 'lower',
          stroke: color,
          width: 2,
          ...(stepped ? { paths: stepped } : {}),
          points: { show: true, size: 5 },
        },
      ],
      bands: [{ series: [1, 2], fill: withAlpha(color, 0.12) }],
      hooks: {
        draw: [
          (u) => {
            const { ctx } = u;
            const y = Math.round(u.valToPos(rest_g, 'y', true));
            ctx.save();
            ctx.setLineDash([2, 3]);
            ctx.lineWidth = devicePixelRatio;
            ctx.strokeStyle = CHART_COLORS.input;
            ctx.beginPath();
            ctx.moveTo(u.bbox.left, y);
            ctx.lineTo(u.bbox.left + u.bbox.width, y);
            ctx.stroke();
            ctx.restore();
          },
        ],
      },
    };
    const plot = new uPlot(options, [steps.duration_s, steps.upper_g, steps.lower_g], el);
    return () => plot.destroy();
    // `key` stands for `steps`, which is a new object on every render.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key, title, rest_g, width_px, height_px]);

  return (
    <figure className="flex flex-col gap-1" data-testid={`envelope-chart-${title}`}>
      {steps.duration_s.length > 0 ? (
        <div
          ref={holder}
          role="img"
          aria-label={`${title}: allowed specific force against excursion length`}
        />
      ) : (
        <p className="text-xs text-ink-600">No usable rows to draw.</p>
      )}
      <figcaption className="text-xs text-ink-600">
        The band a rider may be in for an excursion of that length; dotted: at rest ({rest_g} g). A row with
        duration 0 holds from the left edge.
      </figcaption>
    </figure>
  );
}
