// A uPlot chart of min/max bands on one time axis: each band is drawn as its min and max lines with
// a fill between them, so a decimated signal still shows every peak. Finding spans are shaded behind
// the lines with their edges drawn, horizontal limit lines are drawn over them, and the legend reads
// every band's value at the shared cursor. The x window can be set from outside (a selected finding)
// and by dragging across the plot; the element carries the window shown as data-x-min / data-x-max.
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

/** A span of the x axis to shade, e.g. a finding from its start_s to its end_s. */
export interface ChartSpan {
  from: number;
  to: number;
  color: string;
  /** Edges drawn at `from` and `to`: solid (a hard limit), dashed (a comfort limit) or none (a gap). */
  edge?: 'solid' | 'dashed' | 'none';
  /** The selected span is drawn stronger; the others then step back. */
  selected?: boolean;
}

/** A window of the x axis, in the x values' unit. */
export interface XRange {
  min: number;
  max: number;
}

/** A horizontal line at a value in the chart's display unit, e.g. a stroke limit. */
export interface ChartLine {
  value: number;
  label: string;
  color: string;
  /** A thin dotted reference (e.g. mid-stroke) instead of a dashed limit. */
  thin?: boolean;
}

export interface BandChartProps {
  title: string;
  /** The y axis label with its unit, e.g. "m/s²". */
  yLabel: string;
  /** The x values shared by every band: time (s) unless `xLabel` says otherwise. */
  x: readonly number[];
  /** The x axis label with its unit; "Time (s)" when not given. */
  xLabel?: string;
  /** A logarithmic y axis (every value must be above 0). */
  yLog?: boolean;
  bands: readonly ChartBand[];
  spans?: readonly ChartSpan[];
  lines?: readonly ChartLine[];
  /** Multiplies every band value for display (e.g. 1000 for m to mm); the lines are already in display units. */
  scale?: number;
  height_px?: number;
  /** Charts with the same key share the cursor line as the pointer moves over any of them. */
  syncKey?: string;
  /** Called with the index into `x` under the cursor. */
  onCursorIndex?: (index: number) => void;
  /** An x value to mark with a vertical line, e.g. the instant shown in the 3-D preview. */
  marker?: number | null;
  /** The x window to show; null or absent, the whole of `x`. */
  xRange?: XRange | null;
  /** Called with the window dragged across the plot; without it, dragging does nothing. */
  onZoom?: (range: XRange) => void;
  /** The index into `x` whose values the legend reads out; null, none. */
  cursorIndex?: number | null;
  /** The unit shown after each value in the legend read-out; `yLabel` when not given. */
  valueUnit?: string;
}

/** A band's value at one index for the read-out: "1.23", or "1.2 … 1.5" when the bucket's min and max differ. */
export function bandValueText(band: ChartBand, index: number, scale = 1): string {
  const lo = (band.min[index] ?? Number.NaN) * scale;
  const hi = (band.max[index] ?? Number.NaN) * scale;
  if (!Number.isFinite(lo) && !Number.isFinite(hi)) return '—';
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return formatReadout(Number.isFinite(lo) ? lo : hi);
  const a = formatReadout(lo);
  const b = formatReadout(hi);
  return a === b ? a : `${a} … ${b}`;
}

/** Four significant digits, no exponent for everyday magnitudes. */
function formatReadout(v: number): string {
  if (v === 0 || Math.abs(v) < 1e-9) return '0';
  const abs = Math.abs(v);
  if (abs >= 1e-3 && abs < 1e6) return String(Number(v.toPrecision(4)));
  return v.toExponential(2);
}

/** uPlot's aligned columns: x, then min and max of each band, scaled for display. */
export function bandChartData(x: readonly number[], bands: readonly ChartBand[], scale = 1): AlignedData {
  const n = x.length;
  const columns: Float64Array[] = [Float64Array.from(x)];
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

/**
 * The x of the last drawn sample of each band: the last index where min or max is finite (NaN and
 * missing values are not drawn). Null for a band with nothing finite.
 */
export function lastDrawnX(x: readonly number[], bands: readonly ChartBand[]): (number | null)[] {
  return bands.map((band) => {
    for (let i = x.length - 1; i >= 0; i--) {
      const xi = x[i];
      if (xi === undefined || !Number.isFinite(xi)) continue;
      if (Number.isFinite(band.min[i] ?? Number.NaN) || Number.isFinite(band.max[i] ?? Number.NaN)) return xi;
    }
    return null;
  });
}

function chartOptions(
  props: Required<Pick<BandChartProps, 'bands' | 'lines'>> & {
    spans: () => readonly ChartSpan[];
    onZoom: ((range: XRange) => void) | null;
    onScale: (range: XRange) => void;
    xLabel: string;
    yLabel: string;
    yLog: boolean;
    height_px: number;
    syncKey: string | undefined;
    onCursor: (index: number) => void;
    marker: () => number | null | undefined;
  },
  width_px: number,
): Options {
  const series: Options['series'] = [{ label: props.xLabel }];
  const bands: NonNullable<Options['bands']> = [];
  props.bands.forEach((band, k) => {
    series.push(
      { label: `${band.label} min`, stroke: band.color, width: 1, points: { show: false } },
      { label: `${band.label} max`, stroke: band.color, width: 1, points: { show: false } },
    );
    // uPlot band series are [upper, lower], 1-based after the x column; a plain line needs no fill.
    if (band.min !== band.max)
      bands.push({ series: [2 + 2 * k, 1 + 2 * k], fill: withAlpha(band.color, 0.22) });
  });
  const { lines } = props;
  const zoom = props.onZoom;
  return {
    width: width_px,
    height: props.height_px,
    legend: { show: false },
    cursor: {
      ...(props.syncKey ? { sync: { key: props.syncKey } } : {}),
      // Dragging across the plot selects a window that every chart then shows (no zoom of one chart alone).
      drag: { x: zoom !== null, y: false, setScale: false },
      // No hover dots on the min/max lines: the legend reads every band at the cursor instead.
      points: { show: false },
    },
    scales: {
      x: { time: false },
      y: {
        distr: props.yLog ? 3 : 1,
        // Keep the limit lines on the chart even when the motion stays far from them.
        range: (_u, min, max) => {
          if (props.yLog) {
            const top = Number.isFinite(max) && max > 0 ? max : 1;
            const bottom = Number.isFinite(min) && min > 0 ? min : top * 1e-6;
            return [bottom / 2, top * 2];
          }
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
        label: props.xLabel,
        stroke: CHART_COLORS.axis,
        grid: { stroke: CHART_COLORS.grid, width: 1 },
        size: 36,
      },
      {
        label: props.yLabel,
        stroke: CHART_COLORS.axis,
        // On a log axis only the decades get a grid line; a line at every minor tick stripes the plot.
        grid: {
          stroke: CHART_COLORS.grid,
          width: 1,
          ...(props.yLog
            ? {
                filter: (_u: uPlot, splits: (number | null)[]) =>
                  splits.map((v) => (v !== null && isDecade(v) ? v : null)),
              }
            : {}),
        },
        size: 56,
        // Short charts still get three or more labelled ticks.
        space: 20,
        // uPlot's default labels round 0.0001 to "0" on a log axis; decades read better as 1e-4.
        ...(props.yLog
          ? {
              values: (_u: uPlot, splits: (number | null)[]) =>
                // uPlot leaves null where it drops a tick (minor log ticks).
                splits.map((v) =>
                  v === null
                    ? ''
                    : v >= 0.01 && v < 1e4
                      ? String(Number(v.toPrecision(2)))
                      : v.toExponential(0),
                ),
            }
          : {}),
      },
    ],
    series,
    bands,
    hooks: {
      setScale: [
        (u, key) => {
          const min = u.scales.x?.min;
          const max = u.scales.x?.max;
          if (key === 'x' && typeof min === 'number' && typeof max === 'number') props.onScale({ min, max });
        },
      ],
      setSelect: [
        (u) => {
          if (!zoom || u.select.width < 4) return;
          const min = u.posToVal(u.select.left, 'x');
          const max = u.posToVal(u.select.left + u.select.width, 'x');
          u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
          if (Number.isFinite(min) && Number.isFinite(max) && max > min) zoom({ min, max });
        },
      ],
      setCursor: [
        (u) => {
          const index = u.cursor.idx;
          if (index !== null && index !== undefined) props.onCursor(index);
        },
      ],
      drawClear: [
        (u) => {
          const { ctx } = u;
          const { top, height, left, width } = u.bbox;
          const spans = props.spans();
          const anySelected = spans.some((span) => span.selected);
          ctx.save();
          ctx.beginPath();
          ctx.rect(left, top, width, height);
          ctx.clip();
          for (const span of mergeSpans(spans, (v) => u.valToPos(v, 'x', true), 3 * devicePixelRatio)) {
            const { x0, x1 } = span;
            const alpha = span.selected ? 0.24 : anySelected ? 0.14 : 0.28;
            ctx.fillStyle = withAlpha(span.color, alpha);
            ctx.fillRect(x0, top, x1 - x0, height);
            if (span.edge === 'none' || span.edge === undefined) continue;
            ctx.setLineDash(span.edge === 'dashed' ? [4 * devicePixelRatio, 3 * devicePixelRatio] : []);
            ctx.lineWidth = (span.selected ? 2 : 1) * devicePixelRatio;
            ctx.strokeStyle = withAlpha(span.color, span.selected || !anySelected ? 1 : 0.5);
            ctx.beginPath();
            ctx.moveTo(Math.round(x0), top);
            ctx.lineTo(Math.round(x0), top + height);
            ctx.moveTo(Math.round(x1), top);
            ctx.lineTo(Math.round(x1), top + height);
            ctx.stroke();
          }
          ctx.restore();
        },
      ],
      draw: [
        (u) => {
          const { ctx } = u;
          const { left, width } = u.bbox;
          ctx.save();
          for (const line of lines) {
            ctx.setLineDash(line.thin ? [2, 3] : [6, 4]);
            ctx.lineWidth = (line.thin ? 1 : 1.5) * devicePixelRatio;
            const y = Math.round(u.valToPos(line.value, 'y', true));
            ctx.strokeStyle = line.color;
            ctx.beginPath();
            ctx.moveTo(left, y);
            ctx.lineTo(left + width, y);
            ctx.stroke();
          }
          const marker = props.marker();
          // The instant marked, on the chart's element as it is drawn (the 3-D view's time, for tests).
          const holder = u.root.parentElement;
          if (marker !== null && marker !== undefined && Number.isFinite(marker))
            holder?.setAttribute('data-marker-s', String(marker));
          else holder?.removeAttribute('data-marker-s');
          if (marker !== null && marker !== undefined && Number.isFinite(marker)) {
            const x = Math.round(u.valToPos(marker, 'x', true));
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

/** True for 10^k (k whole), to a rounding error. */
function isDecade(v: number): boolean {
  if (!(v > 0)) return false;
  const k = Math.log10(v);
  return Math.abs(k - Math.round(k)) < 1e-6;
}

/**
 * The spans as drawn, in canvas pixels: a finding at one instant still gets a sliver `minWidth_px`
 * wide, and spans of one kind (colour and edge, none selected) that overlap or touch on screen are
 * drawn as one, so a run of short findings reads as one clear band with one pair of edges instead of
 * stacked fills and a comb of edges. The selected span is always drawn on its own.
 */
export function mergeSpans(
  spans: readonly ChartSpan[],
  toPx: (v: number) => number,
  minWidth_px: number,
): (ChartSpan & { x0: number; x1: number })[] {
  const placed = spans
    .map((span) => {
      const x0 = toPx(span.from);
      return { ...span, x0, x1: Math.max(toPx(span.to), x0 + minWidth_px) };
    })
    .sort((a, b) => a.x0 - b.x0);
  const out: (ChartSpan & { x0: number; x1: number })[] = [];
  const open = new Map<string, ChartSpan & { x0: number; x1: number }>();
  for (const span of placed) {
    if (span.selected) {
      out.push(span);
      continue;
    }
    const kind = `${span.color}|${span.edge ?? 'none'}`;
    const last = open.get(kind);
    if (last && span.x0 <= last.x1 + 1) {
      last.x1 = Math.max(last.x1, span.x1);
      last.to = Math.max(last.to, span.to);
      continue;
    }
    const copy = { ...span };
    open.set(kind, copy);
    out.push(copy);
  }
  // Selected last, so it is drawn over the others.
  return [...out.filter((s) => !s.selected), ...out.filter((s) => s.selected)];
}

// Stable empty defaults, so a chart without spans or lines is not rebuilt on every render.
const NO_SPANS: readonly ChartSpan[] = [];
const NO_LINES: readonly ChartLine[] = [];

/** The whole of an increasing x axis, or null when it has fewer than two finite ends. */
function fullRange(x: readonly number[]): XRange | null {
  const min = x[0];
  const max = x[x.length - 1];
  return min !== undefined && max !== undefined && Number.isFinite(min) && Number.isFinite(max) && max > min
    ? { min, max }
    : null;
}

/**
 * One uPlot chart of bands over time with a legend that reads each band's value at the cursor; redrawn
 * when the data change and resized with its box. Spans, the marker and the x window change without a
 * rebuild.
 */
export const BandChart = memo(function BandChart({
  title,
  yLabel,
  x,
  xLabel = 'Time (s)',
  yLog = false,
  bands,
  spans = NO_SPANS,
  lines = NO_LINES,
  scale = 1,
  height_px = 280,
  syncKey,
  onCursorIndex,
  marker = null,
  xRange = null,
  onZoom,
  cursorIndex = null,
  valueUnit,
}: BandChartProps) {
  const holder = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const markerRef = useRef(marker);
  const spansRef = useRef(spans);
  const rangeRef = useRef(xRange);
  // The latest callbacks, read by uPlot's hooks, so a new callback never rebuilds the chart.
  const cursorHandler = useRef(onCursorIndex);
  const zoomHandler = useRef(onZoom);
  useEffect(() => {
    cursorHandler.current = onCursorIndex;
    zoomHandler.current = onZoom;
  }, [onCursorIndex, onZoom]);
  const zoomable = onZoom !== undefined;
  const data = useMemo(() => bandChartData(x, bands, scale), [x, bands, scale]);
  // Exposed on the chart element so a test can check where each band's drawing ends.
  const lastX = useMemo(
    () =>
      lastDrawnX(x, bands)
        .map((v) => (v === null ? 'none' : String(v)))
        .join(' '),
    [x, bands],
  );

  useEffect(() => {
    const el = holder.current;
    if (!el) return;
    const width_px = Math.max(el.clientWidth, 240);
    const onCursor = (index: number) => cursorHandler.current?.(index);
    const markerAt = () => markerRef.current;
    const spansNow = () => spansRef.current;
    // The window shown, on the element, for tests and for anyone reading the page's markup.
    const onScale = (range: XRange) => {
      el.dataset.xMin = String(range.min);
      el.dataset.xMax = String(range.max);
    };
    const plot = new uPlot(
      chartOptions(
        {
          bands,
          spans: spansNow,
          lines,
          xLabel,
          yLabel,
          yLog,
          height_px,
          syncKey,
          onCursor,
          marker: markerAt,
          onZoom: zoomable ? (range) => zoomHandler.current?.(range) : null,
          onScale,
        },
        width_px,
      ),
      data,
      el,
    );
    const start = rangeRef.current ?? fullRange(x);
    if (start && typeof plot.setScale === 'function') plot.setScale('x', start);
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
  }, [data, x, bands, lines, xLabel, yLabel, yLog, height_px, syncKey, zoomable]);

  // Moving the marker or changing the spans repaints the canvas without rebuilding the chart.
  useEffect(() => {
    markerRef.current = marker;
    spansRef.current = spans;
    plotRef.current?.redraw(false, false);
  }, [marker, spans]);

  // A new window (a finding selected, a drag, the whole take again) rescales x; y follows what is shown.
  useEffect(() => {
    rangeRef.current = xRange;
    const plot = plotRef.current;
    const to = xRange ?? fullRange(x);
    if (plot && to && typeof plot.setScale === 'function') plot.setScale('x', to);
  }, [xRange, x]);

  const unit = valueUnit ?? yLabel;
  const at = cursorIndex !== null && cursorIndex >= 0 && cursorIndex < x.length ? cursorIndex : null;
  return (
    <figure className="flex min-w-0 flex-col gap-1" data-cursor-index={at ?? undefined}>
      <figcaption className="flex flex-col gap-0.5">
        <span className="text-sm font-semibold text-ink-900">{title}</span>
        <span className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5">
          {bands.map((band) => (
            <span key={band.label} className="inline-flex items-center gap-1 text-xs text-ink-600">
              <span
                aria-hidden="true"
                className="inline-block h-2 w-3 rounded-sm"
                style={{ background: band.color }}
              />
              {band.label}
              {at !== null ? (
                <span className="font-mono text-ink-900" data-series={band.label}>
                  {bandValueText(band, at, scale)}
                  <span className="text-ink-600"> {unit}</span>
                </span>
              ) : null}
            </span>
          ))}
          {lines.map((line) => (
            <span key={line.label} className="inline-flex items-center gap-1 text-xs text-ink-600">
              <span
                aria-hidden="true"
                className={`inline-block w-3 ${line.thin ? 'border-t border-dotted' : 'border-t-2 border-dashed'}`}
                style={{ borderColor: line.color }}
              />
              {line.label}
            </span>
          ))}
        </span>
      </figcaption>
      <div
        ref={holder}
        className="min-w-0"
        data-chart={title}
        data-bands={bands.map((b) => b.label).join('|')}
        data-last-x={lastX}
      />
    </figure>
  );
});
