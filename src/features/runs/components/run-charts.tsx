// The run's charts from its decimated series. Values stay SI in the data; millimetres and degrees
// exist only here, for display.
import { useMemo, useState } from 'react';
import type { Finding } from '../../../../shared/schemas/findings';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import type { RunSeries, SeriesBand } from '../../../../shared/schemas/run-series';
import { BandChart } from '../../../components/charts/band-chart';
import type { ChartBand, ChartLine, ChartSpan } from '../../../components/charts/band-chart';
import { CHART_COLORS, withAlpha } from '../../../components/charts/palette';
import type { FilmSync } from '../../../../shared/schemas/film-sync';
import { BasePreview } from './base-preview';
import { runTimecode } from '../utils/film-time';

const M_TO_MM = 1000;
const RAD_TO_DEG = 180 / Math.PI;

const AXIS_NAMES = { x: 'x (surge)', y: 'y (sway)', z: 'z (heave)' } as const;
const POSE_LABELS: Record<string, string> = {
  x_m: 'x',
  y_m: 'y',
  z_m: 'z',
  roll_rad: 'roll',
  pitch_rad: 'pitch',
  yaw_rad: 'yaw',
};

/** Display label, unit and factor of a take column by its SI suffix (data stay SI). */
export function takeColumnDisplay(name: string): { label: string; unit: string; scale: number } {
  const cut = name.lastIndexOf('_');
  const axis = cut > 0 ? name.slice(0, cut) : name;
  const suffix = cut > 0 ? name.slice(cut + 1) : '';
  if (suffix === 'm') return { label: axis, unit: 'mm', scale: M_TO_MM };
  if (suffix === 'rad') return { label: axis, unit: 'deg', scale: RAD_TO_DEG };
  if (suffix === 'radps') return { label: axis, unit: 'deg/s', scale: RAD_TO_DEG };
  if (suffix === 'mps2') return { label: axis, unit: 'm/s²', scale: 1 };
  return { label: axis, unit: suffix, scale: 1 };
}

/** Finding spans coloured by severity: hard red, comfort amber. */
export function findingSpans(findings: readonly Finding[]): ChartSpan[] {
  return findings.map((f) => ({
    from: f.start_s,
    to: f.end_s,
    color: f.severity === 'hard' ? CHART_COLORS.hard : CHART_COLORS.comfort,
  }));
}

function poseBands(pose: Record<string, SeriesBand>, suffix: '_m' | '_rad'): ChartBand[] {
  return Object.entries(pose)
    .filter(([key]) => key.endsWith(suffix))
    .map(([key, band], i) => ({
      label: POSE_LABELS[key] ?? key,
      color: CHART_COLORS.series[i % CHART_COLORS.series.length] ?? CHART_COLORS.cued,
      min: band.min,
      max: band.max,
    }));
}

/** Force per axis (input vs felt at seat 1), pose offsets and leg lengths inside the stroke band, with findings shaded. */
export function RunCharts({
  series,
  findings,
  base = null,
  filmSync = null,
}: {
  series: RunSeries;
  findings: readonly Finding[];
  /** The run's film sync: the cursor read-out shows the picture's timecode beside the seconds. */
  filmSync?: FilmSync | null;
  /** The venue's motion base for the 3-D preview; none, no preview. */
  base?: MotionBase | null;
}) {
  // Gaps in the take (bridged by interpolation) are shaded in grey beside the finding spans.
  const spans = useMemo(
    () => [
      ...(series.gaps ?? []).map((g) => ({ from: g.start_s, to: g.end_s, color: CHART_COLORS.input })),
      ...findingSpans(findings),
    ],
    [findings, series.gaps],
  );
  const [index, setIndex] = useState(0);
  // The preview's instant is marked on every chart; without a preview there is nothing to mark.
  const marker_s = base ? (series.time_s[index] ?? null) : null;
  const force = useMemo(
    () =>
      (['x', 'y', 'z'] as const).map((axis) => {
        const { input, cued } = series.force[axis];
        const bands: ChartBand[] = [];
        if (input)
          bands.push({
            label: series.touchup ? 'input after touch-up' : 'input (vehicle)',
            color: CHART_COLORS.input,
            min: input.min,
            max: input.max,
          });
        bands.push({ label: 'cued (seat 1)', color: CHART_COLORS.cued, min: cued.min, max: cued.max });
        return { axis, bands };
      }),
    [series],
  );
  const translation = useMemo(() => poseBands(series.pose, '_m'), [series]);
  const rotation = useMemo(() => poseBands(series.pose, '_rad'), [series]);
  const legs = useMemo(
    () =>
      series.legs.map((band, i) => ({
        label: `leg${i + 1}`,
        color: CHART_COLORS.series[i % CHART_COLORS.series.length] ?? CHART_COLORS.cued,
        min: band.min,
        max: band.max,
      })),
    [series],
  );
  const legForce = useMemo(
    () =>
      (series.legForce ?? []).map((band, i) => ({
        label: `leg${i + 1}`,
        color: CHART_COLORS.series[i % CHART_COLORS.series.length] ?? CHART_COLORS.cued,
        min: band.min,
        max: band.max,
      })),
    [series],
  );
  const forceLines = useMemo<ChartLine[]>(() => {
    const f = series.forceMax_N;
    if (f === undefined) return [];
    return [
      // Lines are in display units (kN).
      { value: f / 1000, label: `rating ${(f / 1000).toFixed(1)} kN`, color: CHART_COLORS.stroke },
      { value: -f / 1000, label: `rating −${(f / 1000).toFixed(1)} kN`, color: CHART_COLORS.stroke },
    ];
  }, [series]);
  const strokeLines = useMemo<ChartLine[]>(() => {
    const { min_m, max_m, margin_m, mid_m } = series.stroke;
    return [
      {
        value: max_m - margin_m,
        label: `max − margin ${(max_m - margin_m).toFixed(3)} m`,
        color: CHART_COLORS.stroke,
      },
      {
        value: min_m + margin_m,
        label: `min + margin ${(min_m + margin_m).toFixed(3)} m`,
        color: CHART_COLORS.stroke,
      },
      // Stroke use is measured from here: 0 at mid-stroke, 1 at a margin.
      { value: mid_m, label: `mid-stroke ${mid_m.toFixed(3)} m`, color: CHART_COLORS.axis, thin: true },
    ];
  }, [series]);

  const touchupCharts = useMemo(
    () =>
      (series.touchup?.columns ?? []).map((c) => ({
        ...takeColumnDisplay(c.name),
        name: c.name,
        bands: [
          { label: 'as uploaded', color: CHART_COLORS.input, min: c.before.min, max: c.before.max },
          { label: 'after touch-up', color: CHART_COLORS.cued, min: c.after.min, max: c.after.max },
        ] satisfies ChartBand[],
      })),
    [series],
  );
  const cursor_s = series.time_s[index] ?? null;
  const cursorTimecode = cursor_s === null ? null : runTimecode(cursor_s, filmSync);
  // Every chart shares the time axis, the finding spans, the cursor and the instant marked.
  const shared = { x: series.time_s, spans, syncKey: 'run', onCursorIndex: setIndex, marker: marker_s };
  return (
    <div className="flex flex-col gap-4" data-testid="run-charts">
      <p className="flex flex-wrap items-center gap-3 text-xs text-ink-600">
        <span>
          {series.samples.toLocaleString('en-GB')} samples at {series.rate_hz} Hz, drawn as min/max per
          bucket.
        </span>
        <span className="inline-flex items-center gap-1">
          <span
            aria-hidden="true"
            className="inline-block h-3 w-3"
            style={{ background: withAlpha(CHART_COLORS.hard, 0.35) }}
          />
          hard finding
        </span>
        <span className="inline-flex items-center gap-1">
          <span
            aria-hidden="true"
            className="inline-block h-3 w-3"
            style={{ background: withAlpha(CHART_COLORS.comfort, 0.35) }}
          />
          comfort finding
        </span>
      </p>
      <p className="font-mono text-xs text-ink-800" data-testid="cursor-readout">
        {cursor_s === null ? '—' : `t = ${cursor_s.toFixed(3)} s`}
        {cursorTimecode ? <span className="ml-2">TC {cursorTimecode}</span> : null}
        <span className="ml-2 font-sans text-ink-400">(move the pointer over a chart)</span>
      </p>
      <div className="grid grid-cols-1 gap-4 xl:grid-cols-3">
        {force.map(({ axis, bands }) => (
          <BandChart
            key={axis}
            title={`Specific force ${AXIS_NAMES[axis]}`}
            yLabel="m/s²"
            bands={bands}
            {...shared}
            height_px={170}
          />
        ))}
      </div>
      <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
        {translation.length > 0 ? (
          <BandChart
            title="Pose offset, translation"
            yLabel="mm"
            bands={translation}
            {...shared}
            scale={M_TO_MM}
          />
        ) : null}
        {rotation.length > 0 ? (
          <BandChart
            title="Pose offset, rotation"
            yLabel="deg"
            bands={rotation}
            {...shared}
            scale={RAD_TO_DEG}
          />
        ) : null}
      </div>
      <BandChart
        title="Leg lengths inside the stroke band"
        yLabel="m"
        bands={legs}
        {...shared}
        lines={strokeLines}
        height_px={220}
      />
      {legForce.length > 0 ? (
        <BandChart
          title="Actuator forces (compression positive)"
          yLabel="kN"
          bands={legForce}
          {...shared}
          lines={forceLines}
          scale={1e-3}
          height_px={200}
        />
      ) : null}
      {touchupCharts.length > 0 ? (
        <div className="flex flex-col gap-2" data-testid="touchup-charts">
          <h3 className="text-xs font-semibold text-ink-800">
            Take touch-up: each column as uploaded and after the touch-up
          </h3>
          <div className="grid grid-cols-1 gap-4 xl:grid-cols-3">
            {touchupCharts.map((c) => (
              <BandChart
                key={c.name}
                title={`Touch-up ${c.label}`}
                yLabel={c.unit}
                bands={c.bands}
                {...shared}
                scale={c.scale}
                height_px={150}
              />
            ))}
          </div>
        </div>
      ) : null}
      {base ? (
        <div className="flex flex-col gap-1">
          <h3 className="text-xs font-semibold text-ink-800">
            Motion base (the venue&apos;s current geometry)
          </h3>
          <BasePreview base={base} series={series} index={index} onIndex={setIndex} />
        </div>
      ) : null}
    </div>
  );
}
