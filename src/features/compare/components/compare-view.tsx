// The run comparison: the runs named with their colour and dash, their motion overlaid on one time
// axis with a shared cursor, their budgets side by side, and the motion caution.
import { useCallback, useMemo, useState } from 'react';
import type { RunDetail } from '../../../../shared/schemas/pipeline';
import type { RunSeries } from '../../../../shared/schemas/run-series';
import { CAUTION_TEXT } from '../../../components/layout/caution-strip';
import { Section } from '../../../components/ui/section';
import { ErrorNotice, Loading, Notice } from '../../../components/ui/status';
import { useComparedRuns, useComparedSeries } from '../api/get-compared-runs';
import { compareSelection, legsComparable, sharedKeys } from '../utils/compare-diff';
import { runLetter } from '../utils/run-identity';
import { runStyle } from '../utils/run-styles';
import { CompareBudget } from './compare-budget';
import { CompareHeader } from './compare-header';
import { OverlayChart } from './overlay-chart';
import type { OverlayRun } from './overlay-chart';

const M_TO_MM = 1000;
const RAD_TO_DEG = 180 / Math.PI;
const SYNC_KEY = 'run-compare';

const FORCE_TITLES = {
  x: 'Seat specific force x (surge)',
  y: 'Seat specific force y (sway)',
  z: 'Seat specific force z (heave)',
} as const;
const POSE_TITLES: Record<string, string> = {
  x_m: 'Platform x (surge)',
  y_m: 'Platform y (sway)',
  z_m: 'Platform z (heave)',
  roll_rad: 'Platform roll',
  pitch_rad: 'Platform pitch',
  yaw_rad: 'Platform yaw',
};

function overlay(
  series: readonly RunSeries[],
  pick: (s: RunSeries) => { min: number[]; max: number[] } | undefined,
): OverlayRun[] {
  const out: OverlayRun[] = [];
  series.forEach((s, k) => {
    const band = pick(s);
    if (band)
      out.push({ label: runLetter(k), style: runStyle(k), time_s: s.time_s, min: band.min, max: band.max });
  });
  return out;
}

function CompareCharts({ runs, series }: { runs: readonly RunDetail[]; series: readonly RunSeries[] }) {
  const [cursor, setCursor] = useState<number | null>(null);
  const onCursor = useCallback((t: number | null) => setCursor(t), []);
  const force = useMemo(
    () =>
      (['x', 'y', 'z'] as const).map((axis) => ({ axis, runs: overlay(series, (s) => s.force[axis].cued) })),
    [series],
  );
  const pose = useMemo(() => sharedKeys(series.map((s) => Object.keys(s.pose))), [series]);
  const poseCharts = useMemo(
    () =>
      pose.shared.map((key) => ({
        key,
        runs: overlay(series, (s) => s.pose[key]),
        unit: key.endsWith('_rad') ? 'deg' : 'mm',
        scale: key.endsWith('_rad') ? RAD_TO_DEG : M_TO_MM,
      })),
    [series, pose],
  );
  const legs = legsComparable(
    runs.map((r, k) => ({
      venueId: r.venueId,
      venueName: r.venueName,
      legCount: series[k]?.legs.length ?? 0,
    })),
  );
  const legCount = Math.min(...series.map((s) => s.legs.length));
  const legCharts = useMemo(
    () =>
      legs.ok
        ? Array.from({ length: legCount }, (_, i) => ({ i, runs: overlay(series, (s) => s.legs[i]) }))
        : [],
    [legs.ok, legCount, series],
  );
  const venuesDiffer = new Set(runs.map((r) => r.venueId)).size > 1;
  const chart = (title: string, unit: string, chartRuns: OverlayRun[], scale = 1) => (
    <OverlayChart
      key={title}
      title={title}
      unit={unit}
      runs={chartRuns}
      scale={scale}
      syncKey={SYNC_KEY}
      cursor_s={cursor}
      onCursor={onCursor}
    />
  );
  return (
    <div className="flex flex-col gap-5" data-testid="compare-charts">
      <div className="flex flex-col gap-2">
        <h3 className="text-sm font-medium text-ink-800">Specific force at seat 1</h3>
        {venuesDiffer ? (
          <p className="text-xs text-ink-600">
            Seat 1 is each venue’s own first seat; the seats sit at different places on different bases.
          </p>
        ) : null}
        <div className="grid grid-cols-1 gap-4 md:grid-cols-2 2xl:grid-cols-3">
          {force.map((f) => chart(FORCE_TITLES[f.axis], 'm/s²', f.runs))}
        </div>
      </div>
      <div className="flex flex-col gap-2">
        <h3 className="text-sm font-medium text-ink-800">Platform pose (offset from neutral)</h3>
        {pose.notShared.length > 0 ? (
          <p className="text-xs text-ink-600">
            Not compared, not every base has them: {pose.notShared.map((k) => POSE_TITLES[k] ?? k).join(', ')}
            .
          </p>
        ) : null}
        <div className="grid grid-cols-1 gap-4 md:grid-cols-2 2xl:grid-cols-3">
          {poseCharts.map((p) => chart(POSE_TITLES[p.key] ?? p.key, p.unit, p.runs, p.scale))}
        </div>
      </div>
      <div className="flex flex-col gap-2">
        <h3 className="text-sm font-medium text-ink-800">Leg lengths</h3>
        {legs.ok ? (
          <div className="grid grid-cols-1 gap-4 md:grid-cols-2 2xl:grid-cols-3">
            {legCharts.map((l) => chart(`Leg ${l.i + 1} length`, 'mm', l.runs, M_TO_MM))}
          </div>
        ) : (
          <p className="text-xs text-ink-800" role="note" aria-label="Not compared">
            {legs.reason}
          </p>
        )}
      </div>
    </div>
  );
}

/** The comparison of the given runs (ids from the address), in their order. */
export function CompareView({ studioId, runIds }: { studioId: string; runIds: readonly string[] }) {
  const details = useComparedRuns(studioId, runIds);
  const runs = details.map((d) => d.data).filter((d): d is RunDetail => d !== undefined);
  const allLoaded = runs.length === runIds.length;
  const ready = details.map((d) => Boolean(d.data?.result));
  const seriesQueries = useComparedSeries(studioId, runIds, ready);
  const series = seriesQueries.map((q) => q.data).filter((s): s is RunSeries => s !== undefined);
  const failed = details.find((d) => d.isError && !d.data);
  const seriesFailed = seriesQueries.find((q) => q.isError);

  const caution = (
    <p
      role="note"
      aria-label="Run caution"
      className="rounded border border-signal-400 bg-white px-3 py-2 text-xs text-ink-800"
    >
      <span className="font-semibold text-signal-600">Caution. </span>
      {CAUTION_TEXT}
    </p>
  );

  if (runIds.length < 2)
    return (
      <>
        <Notice>Choose two or more runs of one take on the track page to compare them.</Notice>
        {caution}
      </>
    );
  if (failed) return <ErrorNotice error={failed.error} retry={() => void failed.refetch()} />;
  if (!allLoaded) return <Loading what="Loading the runs" />;
  const selection = compareSelection(
    runs.map((r) => ({ id: r.id, takeId: r.takeId, takeNumber: r.takeNumber, state: r.state })),
  );
  const sameTrack = new Set(runs.map((r) => r.trackId)).size === 1;
  return (
    <>
      <CompareHeader studioId={studioId} runs={runs} />
      {caution}
      {!sameTrack || !selection.ok ? (
        <Notice>{!sameTrack ? 'These runs are of different tracks.' : selection.reason}</Notice>
      ) : null}
      <Section title="Motion">
        {seriesFailed ? (
          <ErrorNotice error={seriesFailed.error} retry={() => void seriesFailed.refetch()} />
        ) : series.length === runs.length ? (
          <CompareCharts runs={runs} series={series} />
        ) : ready.every(Boolean) ? (
          <Loading what="Loading the chart series" />
        ) : (
          <Notice>A run without a result has no chart series yet.</Notice>
        )}
      </Section>
      <Section title="Budget side by side">
        <CompareBudget runs={runs} />
      </Section>
    </>
  );
}
