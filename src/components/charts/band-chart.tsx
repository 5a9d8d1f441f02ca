// A uPlot chart of min/max bands on one time axis: each band is drawn as its min and max lines with
// a fill between them, so a decimated signal still shows every peak. Finding spans are shaded behind
// the lines and horizontal limit lines are drawn over them.
import { memo, useEffect, useMemo, useRef } from 'react';
import uPlot from 'uplot';
import type { AlignedData, Options } from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { CHART_COLORS, withAlpha } from './palette';

export interface ChartBand {
  label: string;
  color: string;
  min: readonly number[];
  max: readonly number[];
}

/** A time span to shade, e.g. a finding from start_s to end_s. */
export interface ChartSpan {
  start_s: number;
  end_s: number;
  color: string;
}

/** A horizontal line at a value in the chart's display unit, e.g. a stroke limit. */
export interface ChartLine {
  value: number;
  label: string;
  color: string;
}

export interface BandChartProps {
  title: string;
  /** The y axis label with its unit, e.g. "m/s²". */
  yLabel: string;
  time_s: readonly number[];
  bands: readonly ChartBand[];
  spans?: readonly ChartSpan[];
  lines?: readonly ChartLine[];
  /** Multiplies every band value for display (e.g. 1000 for m to mm); the lines are already in display units. */
  scale?: number;
  height_px?: number;
  /** Charts with the same key share the cursor line as the pointer moves over any of them. */
  syncKey?: string;
  /** Called with the index into `time_s` under the cursor. */
  onCursorIndex?: (index: number) => void;
  /** A time (s) to mark with a vertical line, e.g. the instant shown in the 3-D preview. */
  marker_s?: number | null;
}

/** uPlot's aligned columns: time, then min and max of each band, scaled for display. */
export function bandChartData(
  time_s: readonly number[],
  bands: readonly ChartBand[],
  scale = 1,
): AlignedData {
  const n = time_s.length;
  const columns: Float64Array[] = [Float64Array.from(time_s)];
  for (const band of bands) {
    const lo = new Float64Array(n);
    const hi = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      lo[i] = (band.min[i] ?? Number.NaN) * scale;
      hi[i] = (band.max[i] ?? Number.NaN) * scale;
    }
    columns.push(lo, hi);
  }
  return columns;
}

function chartOptions(
  props: Required<Pick<BandChartProps, 'bands' | 'spans' | 'lines'>> & {
    yLabel: string;
    height_px: number;
    syncKey: string | undefined;
    onCursor: (index: number) => void;
    marker: () => number | null | undefined;
  },
  width_px: number,
): Options {
  const series: Options['series'] = [{ label: 'Time (s)' }];
  const bands: NonNullable<Options['bands']> = [];
  props.bands.forEach((band, k) => {
    series.push(
      { label: `${band.label} min`, stroke: band.color, width: 1, points: { show: false } },
      { label: `${band.label} max`, stroke: band.color, width: 1, points: { show: false } },
    );
    // uPlot band series are [upper, lower], 1-based after the x column.
    bands.push({ series: [2 + 2 * k, 1 + 2 * k], fill: withAlpha(band.color, 0.22) });
  });
  const { spans, lines } = props;
  return {
    width: width_px,
    height: props.height_px,
    legend: { show: false },
    cursor: props.syncKey ? { sync: { key: props.syncKey } } : {},
    scales: {
      x: { time: false },
      y: {
        // Keep the limit lines on the chart even when the motion stays far from them.
        range: (_u, min, max) => {
          let lo = min;
          let hi = max;
          for (const line of lines) {
            lo = Math.min(lo, line.value);
            hi = Math.max(hi, line.value);
          }
          if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [-1, 1];
          const pad = (hi - lo) * 0.08 || Math.abs(hi) * 0.1 || 1;
          return [lo - pad, hi + pad];
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
        label: props.yLabel,
        stroke: CHART_COLORS.axis,
        grid: { stroke: CHART_COLORS.grid, width: 1 },
        size: 56,
        // Short charts still get three or more labelled ticks.
        space: 20,
      },
    ],
    series,
    bands,
    hooks: {
      setCursor: [
        (u) => {
          const index = u.cursor.idx;
          if (index !== null && index !== undefined) props.onCursor(index);
        },
      ],
      drawClear: [
        (u) => {
          const { ctx } = u;
          const { top, height } = u.bbox;
          ctx.save();
          for (const span of spans) {
            const x0 = u.valToPos(span.start_s, 'x', true);
            // A finding at one instant still gets a visible sliver.
            const x1 = Math.max(u.valToPos(span.end_s, 'x', true), x0 + 2);
            ctx.fillStyle = withAlpha(span.color, 0.18);
            ctx.fillRect(x0, top, x1 - x0, height);
          }
          ctx.restore();
        },
      ],
      draw: [
        (u) => {
          const { ctx } = u;
          const { left, width } = u.bbox;
          ctx.save();
          ctx.setLineDash([6, 4]);
          ctx.lineWidth = 1.5 * devicePixelRatio;
          for (const line of lines) {
            const y = Math.round(u.valToPos(line.value, 'y', true));
            ctx.strokeStyle = line.color;
            ctx.beginPath();
            ctx.moveTo(left, y);
            ctx.lineTo(left + width, y);
            ctx.stroke();
          }
          const marker_s = props.marker();
          if (marker_s !== null && marker_s !== undefined && Number.isFinite(marker_s)) {
            const x = Math.round(u.valToPos(marker_s, 'x', true));
            ctx.setLineDash([]);
            ctx.lineWidth = devicePixelRatio;
            ctx.strokeStyle = CHART_COLORS.axis;
            ctx.beginPath();
            ctx.moveTo(x, u.bbox.top);
            ctx.lineTo(x, u.bbox.top + u.bbox.height);
            ctx.stroke();
          }
          ctx.restore();
        },
      ],
    },
  };
}

// Stable empty defaults, so a chart without spans or lines is not rebuilt on every render.
const NO_SPANS: readonly ChartSpan[] = [];
const NO_LINES: readonly ChartLine[] = [];

/** One uPlot chart of bands over time with a small legend; redrawn when the data change and resized with its box. */
export const BandChart = memo(function BandChart({
  title,
  yLabel,
  time_s,
  bands,
  spans = NO_SPANS,
  lines = NO_LINES,
  scale = 1,
  height_px = 180,
  syncKey,
  onCursorIndex,
  marker_s = null,
}: BandChartProps) {
  const holder = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const markerRef = useRef(marker_s);
  // The latest callback, read by uPlot's hook, so a new callback never rebuilds the chart.
  const cursorHandler = useRef(onCursorIndex);
  useEffect(() => {
    cursorHandler.current = onCursorIndex;
  }, [onCursorIndex]);
  const data = useMemo(() => bandChartData(time_s, bands, scale), [time_s, bands, scale]);

  useEffect(() => {
    const el = holder.current;
    if (!el) return;
    const width_px = Math.max(el.clientWidth, 240);
    const onCursor = (index: number) => cursorHandler.current?.(index);
    const marker = () => markerRef.current;
    const plot = new uPlot(
      chartOptions({ bands, spans, lines, yLabel, height_px, syncKey, onCursor, marker }, width_px),
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
    plotRef.current = plot;
    return () => {
      observer?.disconnect();
      plotRef.current = null;
      plot.destroy();
    };
  }, [data, bands, spans, lines, yLabel, height_px, syncKey]);

  // Moving the marker repaints the canvas without rebuilding the chart.
  useEffect(() => {
    markerRef.current = marker_s;
    plotRef.current?.redraw(false, false);
  }, [marker_s]);

  return (
    <figure className="flex min-w-0 flex-col gap-1">
      <figcaption className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5">
        <span className="text-xs font-semibold text-ink-800">{title}</span>
        {bands.map((band) => (
          <span key={band.label} className="inline-flex items-center gap-1 text-xs text-ink-600">
            <span
              aria-hidden="true"
              className="inline-block h-2 w-3 rounded-sm"
              style={{ background: band.color }}
            />
            {band.label}
          </span>
        ))}
        {lines.map((line) => (
          <span key={line.label} className="inline-flex items-center gap-1 text-xs text-ink-600">
            <span
              aria-hidden="true"
              className="inline-block w-3 border-t-2 border-dashed"
              style={{ borderColor: line.color }}
            />
            {line.label}
          </span>
        ))}
      </figcaption>
      <div ref={holder} className="min-w-0" data-chart={title} />
    </figure>
  );
});
