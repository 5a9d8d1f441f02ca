// The run page as a review workbench: the decision and the findings first, then the take on one time
// axis with every finding marked, then the motion charts on the window of the finding selected, and
// the reference material (spectra, comfort tables, touch-up, notes, files) folded away below.
import { FRAME_RATES } from '../../../../shared/motion/timecode';
import type { ProxyVideoClip } from './base-preview';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import type { ReactNode } from 'react';
import { parseMotionBase } from '../../../../shared/schemas/motion-base';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import type { Finding, Use } from '../../../../shared/schemas/findings';
import type { FilmSync } from '../../../../shared/schemas/film-sync';
import type { RunSeries } from '../../../../shared/schemas/run-series';
import type { XRange } from '../../../components/charts/band-chart';
import { CAUTION_TEXT } from '../../../components/layout/caution-strip';
import { Section } from '../../../components/ui/section';
import { ErrorNotice, Loading } from '../../../components/ui/status';
import { isUnauthorized } from '../../../lib/api-client';
import { isRunActive, useRun } from '../api/get-run';
import { useRunSeries } from '../api/get-run-series';
import { useVenue } from '../../../lib/queries/venues';
import { BudgetTable } from './budget-table';
import { ComfortSummary } from './comfort-summary';
import { FindingReadout } from './finding-readout';
import { FindingsTable } from './findings-table';
import { Fold } from './fold';
import { RunCharts } from './run-charts';
import { RunFiles } from './run-files';
import { RunAlerts, RunFacts } from './run-header';
import { RunSpectra } from './run-spectra';
import { FilmSyncPanel } from './film-sync-panel';
import { TakeTimeline } from './take-timeline';
import { TouchupSummary } from './touchup-summary';
import { findingWindow } from '../utils/finding-view';

function readBase(base: unknown): MotionBase | null {
  try {
    return parseMotionBase(base);
  } catch {
    // A base the parser refuses simply has no preview; the venue page names its problems.
    return null;
  }
}

/** Which finding is selected and which window every chart shows, shared by the list, the timeline and the charts. */
function useFindingFocus(findings: readonly Finding[]) {
  const [selected, setSelected] = useState<number | null>(null);
  const [view, setView] = useState<XRange | null>(null);
  const order = useMemo(
    () =>
      findings
        .map((f, i) => ({ f, i }))
        .sort((a, b) => a.f.start_s - b.f.start_s || b.f.ratio - a.f.ratio)
        .map((o) => o.i),
    [findings],
  );
  const select = useCallback(
    (index: number) => {
      const f = findings[index];
      if (!f) return;
      setSelected(index);
      setView(findingWindow(f));
    },
    [findings],
  );
  const onView = useCallback((next: XRange | null) => {
    setView(next);
    // The whole take again lets go of the finding too.
    if (next === null) setSelected(null);
  }, []);
  const position = selected === null ? -1 : order.indexOf(selected);
  const step = useCallback(
    (by: -1 | 1) => {
      const next = order[Math.min(Math.max(position + by, 0), order.length - 1)];
      if (next !== undefined) select(next);
    },
    [order, position, select],
  );
  return { selected, view, select, onView, position, step };
}

const NO_USES: readonly Use[] = [];

function Workbench({
  studioId,
  runId,
  venueId,
  takeDuration_s,
  findings,
  uses,
  filmSync,
  focus,
  video,
}: {
  studioId: string;
  runId: string;
  venueId: string;
  takeDuration_s: number;
  findings: readonly Finding[];
  uses: readonly Use[];
  filmSync: FilmSync | null;
  focus: ReturnType<typeof useFindingFocus>;
  video: ProxyVideoClip | null;
}) {
  const series = useRunSeries(studioId, runId, true);
  const venue = useVenue(studioId, venueId);
  const base = useMemo(() => (venue.data ? readBase(venue.data.base) : null), [venue.data]);
  const range = useMemo(() => takeRange(series.data, takeDuration_s), [series.data, takeDuration_s]);
  const finding = focus.selected === null ? null : (findings[focus.selected] ?? null);
  const focus_s = finding ? (finding.start_s + finding.end_s) / 2 : null;
  return (
    <>
      <TakeTimeline
        findings={findings}
        range={range}
        view={focus.view}
        selected={focus.selected}
        onSelect={focus.select}
      />
      <Section title="Motion" testId="motion-workbench">
        {series.isPending ? <Loading what="Loading the chart series" /> : null}
        {series.isError ? <ErrorNotice error={series.error} retry={() => void series.refetch()} /> : null}
        {series.data ? (
          <RunCharts
            series={series.data}
            findings={findings}
            uses={uses}
            base={base}
            filmSync={filmSync}
            video={video}
            view={focus.view}
            onView={focus.onView}
            selected={focus.selected}
            focus_s={focus_s}
            selection={
              <FindingReadout
                finding={finding}
                position={focus.position}
                count={findings.length}
                filmSync={filmSync}
                onStep={focus.step}
              />
            }
          />
        ) : null}
      </Section>
    </>
  );
}

/** The take's whole time axis: the series' (ramps included) once loaded, else 0 to the take's length. */
function takeRange(series: RunSeries | undefined, takeDuration_s: number): XRange {
  const first = series?.time_s[0];
  const last = series?.time_s[series.time_s.length - 1];
  if (first !== undefined && last !== undefined && last > first) return { min: first, max: last };
  return { min: 0, max: Math.max(takeDuration_s, 1) };
}

/**
 * Everything about one cue run. `decision` (the review feature's panel, placed by the route) leads
 * the page beside the findings.
 */
export function RunView({
  studioId,
  runId,
  decision = null,
}: {
  studioId: string;
  runId: string;
  decision?: ReactNode;
}) {
  const run = useRun(studioId, runId);
  const findings = run.data?.result?.findings ?? NO_FINDINGS;
  const focus = useFindingFocus(findings);
  const list = useRef<HTMLDivElement>(null);
  // The selected finding's row scrolls into the list's own view (never the page: the reader may be
  // at the charts, stepping through the findings with the arrow keys).
  useEffect(() => {
    const box = list.current;
    const row = box?.querySelector<HTMLElement>('tr[aria-current="true"]');
    if (!box || !row) return;
    const top = row.getBoundingClientRect().top - box.getBoundingClientRect().top + box.scrollTop;
    if (top < box.scrollTop) box.scrollTop = top;
    else if (top + row.offsetHeight > box.scrollTop + box.clientHeight)
      box.scrollTop = top + row.offsetHeight - box.clientHeight;
  }, [focus.selected]);
  if (run.isPending)
    return (
      <>
        {decision}
        <Loading what="Loading the run" />
      </>
    );
  if (run.isError && !run.data) {
    return (
      <>
        {decision}
        <ErrorNotice
          error={run.error}
          retry={isUnauthorized(run.error) ? undefined : () => void run.refetch()}
        />
      </>
    );
  }
  const detail = run.data;
  const finished = !isRunActive(detail.state) && detail.state !== 'failed';
  const result = detail.result;
  // The comfort summary already shows its weighting note; the notes list keeps the others.
  const notes = (result?.notes ?? []).filter((note) => note !== result?.comfort?.weightingNote);

  return (
    <>
      <RunAlerts studioId={studioId} run={detail} />
      {run.isError ? <ErrorNotice error={run.error} /> : null}
      <div className="grid grid-cols-1 items-start gap-4 min-[1360px]:grid-cols-[minmax(0,7fr)_minmax(0,5fr)]">
        <div className="flex min-w-0 flex-col gap-4">{decision}</div>
        {result ? (
          <Section
            title={`Findings (${findings.length})`}
            aside={
              <span
                className={`text-sm font-medium ${result.within ? 'text-tealdeep-700' : 'text-stop-700'}`}
              >
                {result.within ? 'Within budget' : 'Over budget'}
              </span>
            }
          >
            <div
              ref={list}
              className="max-h-72 overflow-y-auto min-[1360px]:max-h-[26rem]"
              data-testid="findings-list"
            >
              <FindingsTable
                findings={findings}
                filmSync={detail.filmSync}
                selected={focus.selected}
                onSelect={focus.select}
              />
            </div>
          </Section>
        ) : (
          <RunFacts studioId={studioId} run={detail} />
        )}
      </div>
      <FilmSyncPanel studioId={studioId} run={detail} />
      {finished ? (
        <Workbench
          studioId={studioId}
          runId={runId}
          venueId={detail.venueId}
          takeDuration_s={detail.take.duration_s}
          findings={findings}
          uses={detail.result?.uses ?? NO_USES}
          filmSync={detail.filmSync}
          focus={focus}
          video={
            detail.take.proxyVideo
              ? {
                  url: `/api/studios/${encodeURIComponent(studioId)}/takes/${encodeURIComponent(detail.take.id)}/proxy-video`,
                  // The picture runs `offset` ahead of the motion: a positive offset plays the motion later.
                  offset_s: detail.filmSync
                    ? (detail.filmSync.offset_frames * FRAME_RATES[detail.filmSync.frameRate].den) /
                      FRAME_RATES[detail.filmSync.frameRate].num
                    : 0,
                }
              : null
          }
        />
      ) : null}
      {result ? <RunFacts studioId={studioId} run={detail} /> : null}
      {result ? (
        <Section title="Budget">
          <BudgetTable uses={result.uses} />
        </Section>
      ) : null}
      {finished && detail.files.some((file) => file.name === 'spectra.json') ? (
        <Fold title="Spectra">
          <RunSpectra studioId={studioId} runId={runId} />
        </Fold>
      ) : null}
      {result?.comfort ? (
        <Fold title="Comfort and motion sickness (ISO 2631-1)">
          <ComfortSummary comfort={result.comfort} />
        </Fold>
      ) : null}
      {detail.params.touchup ? (
        <Fold title="Touch-up">
          <TouchupSummary touchup={detail.params.touchup} />
        </Fold>
      ) : null}
      {notes.length > 0 ? (
        <Fold title={`Notes (${notes.length})`}>
          <ul className="list-disc pl-5 text-sm text-ink-800">
            {notes.map((note) => (
              <li key={note}>{note}</li>
            ))}
          </ul>
        </Fold>
      ) : null}
      {detail.files.length > 0 ? (
        <Fold title={`Files and hashes (${detail.files.length})`}>
          <RunFiles studioId={studioId} runId={runId} files={detail.files} />
        </Fold>
      ) : null}
      <p
        role="note"
        aria-label="Run caution"
        className="rounded border border-signal-400 bg-white px-3 py-2 text-xs text-ink-800"
      >
        <span className="font-semibold text-signal-600">Caution. </span>
        {CAUTION_TEXT}
      </p>
    </>
  );
}

const NO_FINDINGS: readonly Finding[] = [];
