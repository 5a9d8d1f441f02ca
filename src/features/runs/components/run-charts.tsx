// The run's charts from its decimated series. Values stay SI in the data; millimetres and degrees
// exist only here, for display.
import { Fragment, useCallback, useMemo, useRef, useState } from 'react';
import type { KeyboardEvent, ReactNode } from 'react';
import type { Finding, Use } from '../../../../shared/schemas/findings';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import type { RunSeries, SeriesBand } from '../../../../shared/schemas/run-series';
import { BandChart } from '../../../components/charts/band-chart';
import type { ChartBand, ChartLine, ChartSpan, XRange } from '../../../components/charts/band-chart';
import { CHART_COLORS, withAlpha } from '../../../components/charts/palette';
import type { FilmSync } from '../../../../shared/schemas/film-sync';
import { BasePreview } from './base-preview';
import type { ProxyVideoClip } from './base-preview';
import { runTimecode } from '../utils/film-time';
import { nearestIndex } from '../utils/finding-view';
import { chartGroupOrder } from '../utils/chart-order';
import { UseRatioBar } from '../../../components/charts/run-badges';
import { Button } from '../../../components/ui/button';

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

/**
 * Finding spans coloured by tier: hard red with solid edges, comfort amber with dashed edges, so the
 * tier reads without colour too. `selected` is the index into `findings` of the finding in view.
 */
export function findingSpans(findings: readonly Finding[], selected: number | null = null): ChartSpan[] {
  return findings.map((f, i) => ({
    from: f.start_s,
    to: f.end_s,
    color: f.severity === 'hard' ? CHART_COLORS.hard : CHART_COLORS.comfort,
    edge: f.severity === 'hard' ? 'solid' : 'dashed',
    selected: i === selected,
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

/** The chart groups, by the question a reviewer asks of the motion. */
export const CHART_GROUPS = [
  { id: 'all', label: 'Everything' },
  { id: 'rider', label: 'Rider feel' },
  { id: 'pose', label: 'Platform pose' },
  { id: 'actuators', label: 'Actuator use' },
  { id: 'touchup', label: 'Take touch-up' },
] as const;
export type ChartGroupId = (typeof CHART_GROUPS)[number]['id'];

const GROUP_QUESTIONS: Record<Exclude<ChartGroupId, 'all'>, string> = {
  rider: 'What the rider feels: specific force at seat 1 against the vehicle’s.',
  pose: 'Where the platform goes: its pose offset from neutral.',
  actuators: 'What the legs do: lengths inside the usable stroke, forces against the rating.',
  touchup: 'What the touch-up changed in the take, column by column.',
};

function ChartGroup({
  id,
  worst,
  children,
}: {
  id: Exclude<ChartGroupId, 'all'>;
  /** The largest use among the checks this group's charts show, when the run reports one. */
  worst?: number | undefined;
  children: ReactNode;
}) {
  const label = CHART_GROUPS.find((g) => g.id === id)?.label ?? id;
  return (
    <section className="flex flex-col gap-2" aria-label={label} data-chart-group={id}>
      <header className="flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-ink-100 pb-1">
        <h3 className="text-sm font-semibold text-ink-900">{label}</h3>
        <p className="text-xs text-ink-600">{GROUP_QUESTIONS[id]}</p>
        {worst !== undefined ? (
          <span
            className="ml-auto inline-flex items-center gap-1 text-xs text-ink-600"
            data-group-worst={worst}
          >
            largest use here
            <UseRatioBar ratio={worst} label={`largest use, ${label}`} />
          </span>
        ) : null}
      </header>
      <div className="grid grid-cols-1 gap-x-6 gap-y-5 2xl:grid-cols-2">{children}</div>
    </section>
  );
}

/** A row of tabs, one tab stop, the arrow keys move between them (the ARIA tabs pattern). */
function GroupTabs({
  groups,
  current,
  onChange,
  panelId,
}: {
  groups: readonly { id: ChartGroupId; label: string }[];
  current: ChartGroupId;
  onChange: (id: ChartGroupId) => void;
  panelId: string;
}) {
  const refs = useRef<(HTMLButtonElement | null)[]>([]);
  const onKey = (event: KeyboardEvent<HTMLButtonElement>, k: number) => {
    const step = event.key === 'ArrowRight' ? 1 : event.key === 'ArrowLeft' ? -1 : 0;
    const to =
      event.key === 'Home'
        ? 0
        : event.key === 'End'
          ? groups.length - 1
          : (k + step + groups.length) % groups.length;
    if (step === 0 && event.key !== 'Home' && event.key !== 'End') return;
    event.preventDefault();
    const next = groups[to];
    if (!next) return;
    onChange(next.id);
    refs.current[to]?.focus();
  };
  return (
    <div role="tablist" aria-label="Chart groups" className="flex flex-wrap gap-1">
      {groups.map((g, k) => {
        const on = g.id === current;
        return (
          <button
            key={g.id}
            ref={(el) => {
              refs.current[k] = el;
            }}
            type="button"
            role="tab"
            id={`${panelId}-tab-${g.id}`}
            aria-selected={on}
            aria-controls={panelId}
            tabIndex={on ? 0 : -1}
            onClick={() => onChange(g.id)}
            onKeyDown={(event) => onKey(event, k)}
            className={`rounded-t border-b-2 px-3 py-1 text-sm font-medium ${
              on
                ? 'border-tealdeep-600 text-tealdeep-700'
                : 'border-transparent text-ink-600 hover:border-ink-200 hover:text-ink-900'
            }`}
          >
            {g.label}
          </button>
        );
      })}
    </div>
  );
}

/**
 * The motion workbench: the charts grouped by what a reviewer asks (rider feel, platform pose,
 * actuator use), all on one time axis with one cursor, the finding spans drawn on each, and one x
 * window for all of them: a selected finding's, a window dragged across any chart, or the whole take.
 */
export function RunCharts({
  series,
  findings,
  uses = [],
  base = null,
  filmSync = null,
  video = null,
  view = null,
  onView,
  selected = null,
  focus_s = null,
  selection = null,
}: {
  series: RunSeries;
  findings: readonly Finding[];
  /** The run's budget uses: the chart groups come largest use first. */
  uses?: readonly Use[];
  /** The run's film sync: the cursor read-out shows the picture's timecode beside the seconds. */
  filmSync?: FilmSync | null;
  /** The take's proxy video, played in step with the 3-D preview; none, no video. */
  video?: ProxyVideoClip | null;
  /** The venue's motion base for the 3-D preview; none, no preview. */
  base?: MotionBase | null;
  /** The x window every chart shows; null, the whole take. */
  view?: XRange | null;
  /** Called with a new window (a drag across a chart) or null (the whole take again). */
  onView?: (view: XRange | null) => void;
  /** The index into `findings` of the selected finding, drawn stronger. */
  selected?: number | null;
  /** A time to move the cursor (and the 3-D preview) to, e.g. the middle of the selected finding. */
  focus_s?: number | null;
  /** The selected finding's read-out, shown in the toolbar above the charts. */
  selection?: ReactNode;
}) {
  // Gaps in the take (bridged by interpolation) are shaded in grey beside the finding spans.
  const spans = useMemo<ChartSpan[]>(
    () => [
      ...(series.gaps ?? []).map((g) => ({
        from: g.start_s,
        to: g.end_s,
        color: CHART_COLORS.input,
        edge: 'none' as const,
      })),
      ...findingSpans(findings, selected),
    ],
    [findings, series.gaps, selected],
  );
  const [index, setIndex] = useState(0);
  const [group, setGroup] = useState<ChartGroupId>('all');
  // A new focus (a finding selected) moves the cursor there once; the pointer moves it on from there.
  const [seenFocus, setSeenFocus] = useState<number | null>(null);
  if (focus_s !== seenFocus) {
    setSeenFocus(focus_s);
    if (focus_s !== null && Number.isFinite(focus_s)) setIndex(nearestIndex(series.time_s, focus_s));
  }
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
  const poseCharts = useMemo(
    () =>
      [
        {
          title: 'Pose offset, translation',
          yLabel: 'mm',
          bands: poseBands(series.pose, '_m'),
          scale: M_TO_MM,
        },
        {
          title: 'Pose offset, rotation',
          yLabel: 'deg',
          bands: poseBands(series.pose, '_rad'),
          scale: RAD_TO_DEG,
        },
      ].filter((c) => c.bands.length > 0),
    [series],
  );
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
  const actuatorCharts = [
    { title: 'Leg lengths inside the stroke band', yLabel: 'm', bands: legs, lines: strokeLines, scale: 1 },
    {
      title: 'Actuator forces (compression positive)',
      yLabel: 'kN',
      bands: legForce,
      lines: forceLines,
      scale: 1e-3,
    },
  ].filter((c, k) => k === 0 || c.bands.length > 0);
  const zoom = useCallback((range: XRange) => onView?.(range), [onView]);
  const cursor_s = series.time_s[index] ?? null;
  const cursorTimecode = cursor_s === null ? null : runTimecode(cursor_s, filmSync);
  const first_s = series.time_s[0] ?? 0;
  const last_s = series.time_s[series.time_s.length - 1] ?? 0;
  // Every chart shares the time axis, the finding spans, the cursor, the instant marked and the window.
  const shared = {
    x: series.time_s,
    spans,
    syncKey: 'run',
    onCursorIndex: setIndex,
    cursorIndex: index,
    marker: marker_s,
    xRange: view,
    onZoom: onView ? zoom : undefined,
  };
  const groups = CHART_GROUPS.filter((g) => g.id !== 'touchup' || touchupCharts.length > 0);
  // The group closest to (or over) a limit comes first.
  const ordered = useMemo(() => chartGroupOrder(uses), [uses]);
  const shows = (id: ChartGroupId) => group === 'all' || group === id;
  const panelId = 'run-chart-panel';

  return (
    <div className="flex flex-col gap-4" data-testid="run-charts">
      <div
        className="sticky top-0 z-10 -mx-4 flex flex-col gap-2 border-b border-ink-200 bg-white px-4 pt-2 pb-2"
        data-testid="chart-toolbar"
      >
        <div className="flex flex-wrap items-end justify-between gap-3">
          <GroupTabs groups={groups} current={group} onChange={setGroup} panelId={panelId} />
          <p className="font-mono text-xs text-ink-800" data-testid="cursor-readout" aria-live="off">
            {cursor_s === null ? '—' : `t = ${cursor_s.toFixed(3)} s`}
            {cursorTimecode ? <span className="ml-2">TC {cursorTimecode}</span> : null}
          </p>
        </div>
        <div className="flex flex-wrap items-center justify-between gap-3">
          <div className="min-w-0 flex-1">{selection}</div>
          <div className="flex items-center gap-2 text-xs text-ink-600">
            <span data-testid="view-window">
              {view
                ? `Showing ${view.min.toFixed(2)}–${view.max.toFixed(2)} s of ${first_s.toFixed(2)}–${last_s.toFixed(2)} s`
                : `Whole take, ${first_s.toFixed(2)}–${last_s.toFixed(2)} s`}
            </span>
            <Button size="sm" onClick={() => onView?.(null)} disabled={view === null}>
              Show whole take
            </Button>
          </div>
        </div>
      </div>
      <p className="flex flex-wrap items-center gap-3 text-xs text-ink-600">
        <span>
          {series.samples.toLocaleString('en-GB')} samples at {series.rate_hz} Hz, drawn as min/max per
          bucket; the legend reads the bucket under the cursor. Drag across a chart to look closer.
        </span>
        <SpanKey />
      </p>
      <div
        id={panelId}
        role="tabpanel"
        aria-labelledby={`${panelId}-tab-${group}`}
        className="flex flex-col gap-6"
      >
        <div
          className={`grid grid-cols-1 gap-6 ${base ? 'xl:grid-cols-[minmax(0,1fr)_minmax(18rem,32%)]' : ''}`}
          data-testid="run-charts-layout"
        >
          <div className="flex min-w-0 flex-col gap-6" data-testid="chart-groups">
            {ordered.order.map((id) => {
              if (id === 'rider')
                return (
                  <Fragment key={id}>
                    {shows('rider') ? (
                      <ChartGroup id="rider" worst={ordered.worst.rider}>
                        {force.map(({ axis, bands }) => (
                          <BandChart
                            key={axis}
                            title={`Specific force ${AXIS_NAMES[axis]}`}
                            yLabel="m/s²"
                            bands={bands}
                            {...shared}
                          />
                        ))}
                      </ChartGroup>
                    ) : null}
                  </Fragment>
                );
              if (id === 'pose')
                return (
                  <Fragment key={id}>
                    {shows('pose') && poseCharts.length > 0 ? (
                      <ChartGroup id="pose" worst={ordered.worst.pose}>
                        {poseCharts.map((c) => (
                          <BandChart key={c.title} {...c} {...shared} />
                        ))}
                      </ChartGroup>
                    ) : null}
                  </Fragment>
                );
              return (
                <Fragment key={id}>
                  {shows('actuators') ? (
                    <ChartGroup id="actuators" worst={ordered.worst.actuators}>
                      {actuatorCharts.map((c) => (
                        <BandChart key={c.title} {...c} {...shared} />
                      ))}
                    </ChartGroup>
                  ) : null}
                </Fragment>
              );
            })}
            {shows('touchup') && touchupCharts.length > 0 ? (
              <div data-testid="touchup-charts">
                <ChartGroup id="touchup">
                  {touchupCharts.map((c) => (
                    <BandChart
                      key={c.name}
                      title={`Touch-up ${c.label}`}
                      yLabel={c.unit}
                      bands={c.bands}
                      {...shared}
                      scale={c.scale}
                    />
                  ))}
                </ChartGroup>
              </div>
            ) : null}
          </div>
          {base ? (
            <aside
              className="flex min-w-0 flex-col gap-1 self-start xl:sticky xl:top-32"
              aria-label="Motion base at the cursor"
              data-testid="base-aside"
            >
              <h3 className="text-sm font-semibold text-ink-900">
                Motion base at the cursor (the venue&apos;s current geometry)
              </h3>
              <BasePreview base={base} series={series} index={index} onIndex={setIndex} video={video} />
            </aside>
          ) : null}
        </div>
      </div>
    </div>
  );
}

/** The key to the shaded spans: the tiers by fill and edge. */
export function SpanKey() {
  return (
    <span className="inline-flex flex-wrap items-center gap-3">
      <span className="inline-flex items-center gap-1">
        <span
          aria-hidden="true"
          className="inline-block h-3 w-4 border-x-2 border-solid"
          style={{ background: withAlpha(CHART_COLORS.hard, 0.3), borderColor: CHART_COLORS.hard }}
        />
        hard-limit finding
      </span>
      <span className="inline-flex items-center gap-1">
        <span
          aria-hidden="true"
          className="inline-block h-3 w-4 border-x-2 border-dashed"
          style={{ background: withAlpha(CHART_COLORS.comfort, 0.3), borderColor: CHART_COLORS.comfort }}
        />
        comfort finding
      </span>
    </span>
  );
}
