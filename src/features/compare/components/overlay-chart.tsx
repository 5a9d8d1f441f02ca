// One uPlot chart overlaying the same quantity of several runs on one time axis: each run's min/max
// band drawn as its two lines in the run's colour and dash, with a light fill between, and a read-out
// of every run's value at the shared cursor.
import { memo, useEffect, useMemo, useRef } from 'react';
import uPlot from 'uplot';
import type { AlignedData, Options } from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { CHART_COLORS, withAlpha } from '../../../components/charts/palette';
import { alignOnSharedAxis, bucketAt } from '../utils/compare-diff';
import type { RunStyle } from '../utils/run-styles';

export interface OverlayRun {
  /** Short name of the run, e.g. "Run A". */
  label: string;
  style: RunStyle;
  /** The run's own time axis (s) and its band on it, in SI. */
  time_s: readonly number[];
  min: readonly number[];
  max: readonly number[];
}

export interface OverlayChartProps {
  title: string;
  /** Display unit, e.g. "m/s²". */
  unit: string;
  runs: readonly OverlayRun[];
  /** Multiplies every value for display (e.g. 1000 for m to mm). */
  scale?: number;
  height_px?: number;
  syncKey: string;
  /** The shared cursor's time (s), or null when the pointer is off every chart. */
  cursor_s: number | null;
  onCursor: (t_s: number | null) => void;
}

function formatValue(v: number): string {
  const a = Math.abs(v);
  return a >= 100 ? v.toFixed(0) : a >= 10 ? v.toFixed(1) : v.toFixed(2);
}

/** The text of one run's read-out at t: "min … max unit" of its bucket, or a dash outside its span. */
export function readoutText(run: OverlayRun, t: number | null, scale: number, unit: string): string {
  if (t === null) return '—';
  const i = bucketAt(run.time_s, t);
  if (i === null) return 'not playing';
  const lo = (run.min[i] ?? Number.NaN) * scale;
  const hi = (run.max[i] ?? Number.NaN) * scale;
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return '—';
  return Math.abs(hi - lo) < 1e-9 * Math.max(1, Math.abs(hi))
    ? `${formatValue(hi)} ${unit}`
    : `${formatValue(lo)} … ${formatValue(hi)} ${unit}`;
}

export const OverlayChart = memo(function OverlayChart({
  title,
  unit,
  runs,
  scale = 1,
  height_px = 240,
  syncKey,
  cursor_s,
  onCursor,
}: OverlayChartProps) {
  const holder = useRef<HTMLDivElement>(null);
  const cursorHandler = useRef(onCursor);
  useEffect(() => {
    cursorHandler.current = onCursor;
  }, [onCursor]);

  const data = useMemo(() => {
    const aligned = alignOnSharedAxis(
      runs.map((r) => r.time_s),
      runs.map((r) => [r.min.map((v) => v * scale), r.max.map((v) => v * scale)]),
    );
    return [aligned.x, ...aligned.columns.flat()] as unknown as AlignedData;
  }, [runs, scale]);

  useEffect(() => {
    const el = holder.current;
    if (!el) return;
    const series: Options['series'] = [{ label: 'Time (s)' }];
    const bands: NonNullable<Options['bands']> = [];
    runs.forEach((run, k) => {
      const line = {
        stroke: run.style.color,
        width: 1.5,
        dash: run.style.dash,
        spanGaps: true,
        points: { show: false },
      };
      series.push({ ...line, label: `${run.label} min` }, { ...line, label: `${run.label} max` });
      bands.push({ series: [2 + 2 * k, 1 + 2 * k], fill: withAlpha(run.style.color, 0.1) });
    });
    const plot = new uPlot(
      {
        width: Math.max(el.clientWidth, 240),
        height: height_px,
        legend: { show: false },
        // No hover dots on the lines: the legend under the chart reads each run at the cursor.
        cursor: { sync: { key: syncKey }, points: { show: false } },
        scales: {
          x: { time: false },
          y: {
            range: (_u, min, max) => {
              if (!Number.isFinite(min) || !Number.isFinite(max)) return [-1, 1];
              const pad = (max - min) * 0.08 || Math.abs(max) * 0.1 || 1;
              return [min - pad, max + pad];
            },
          },
        },
        axes: [
          {
            label: 'Time (s)',
            stroke: CHART_COLORS.axis,
            grid: { stroke: CHART_COLORS.grid, width: 1 },
            size: 36,
          },
          {
            label: unit,
            stroke: CHART_COLORS.axis,
            grid: { stroke: CHART_COLORS.grid, width: 1 },
            size: 56,
            space: 20,
          },
        ],
        series,
        bands,
        hooks: {
          setCursor: [
            (u) => {
              const left = u.cursor.left;
              cursorHandler.current(left === undefined || left < 0 ? null : u.posToVal(left, 'x'));
            },
          ],
        },
      },
      data,
      el,
    );
    const observer =
      typeof ResizeObserver === 'undefined'
        ? null
        : new ResizeObserver(() => {
            const w = Math.max(el.clientWidth, 240);
            if (w !== plot.width) plot.setSize({ width: w, height: height_px });
          });
    observer?.observe(el);
    return () => {
      observer?.disconnect();
      plot.destroy();
    };
  }, [data, runs, unit, height_px, syncKey]);

  return (
    <figure className="flex min-w-0 flex-col gap-1">
      <figcaption className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5">
        <span className="text-xs font-semibold text-ink-800">{title}</span>
        <span className="text-xs text-ink-600">{unit}</span>
      </figcaption>
      <div
        ref={holder}
        className="min-w-0"
        data-chart={title}
        data-runs={runs.map((r) => r.label).join('|')}
      />
      <ul aria-label={`${title}: values at the cursor`} className="flex flex-wrap gap-x-4 gap-y-0.5 text-xs">
        {runs.map((run) => (
          <li key={run.label} className="inline-flex items-center gap-1.5 text-ink-600">
            <svg aria-hidden="true" width="22" height="6" className="shrink-0">
              <line
                x1="0"
                y1="3"
                x2="22"
                y2="3"
                stroke={run.style.color}
                strokeWidth="2"
                strokeDasharray={run.style.dash.join(' ')}
              />
            </svg>
            <span className="font-medium text-ink-800">{run.label}</span>
            <span className="sr-only">({run.style.dashName} line)</span>
            <span className="font-mono text-ink-800">{readoutText(run, cursor_s, scale, unit)}</span>
          </li>
        ))}
        {cursor_s !== null ? <li className="font-mono text-ink-400">at {cursor_s.toFixed(2)} s</li> : null}
      </ul>
    </figure>
  );
});
