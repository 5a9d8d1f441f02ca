import { useMemo } from 'react';
import { parseMotionBase } from '../../../../shared/schemas/motion-base';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import { CAUTION_TEXT } from '../../../components/layout/caution-strip';
import { Section } from '../../../components/ui/section';
import { ErrorNotice, Loading } from '../../../components/ui/status';
import { isUnauthorized } from '../../../lib/api-client';
import { isRunActive, useRun } from '../api/get-run';
import { useRunSeries } from '../api/get-run-series';
import { useVenue } from '../../../lib/queries/venues';
import { BudgetTable } from './budget-table';
import { ComfortSummary } from './comfort-summary';
import { FindingsTable } from './findings-table';
import { RunCharts } from './run-charts';
import { RunFiles } from './run-files';
import { RunHeader } from './run-header';
import { RunSpectra } from './run-spectra';
import { FilmSyncPanel } from './film-sync-panel';
import { TouchupSummary } from './touchup-summary';
import type { FilmSync } from '../../../../shared/schemas/film-sync';

function readBase(base: unknown): MotionBase | null {
  try {
    return parseMotionBase(base);
  } catch {
    // A base the parser refuses simply has no preview; the venue page names its problems.
    return null;
  }
}

function Charts({
  studioId,
  runId,
  venueId,
  findings,
  filmSync,
}: {
  studioId: string;
  runId: string;
  venueId: string;
  findings: Parameters<typeof RunCharts>[0]['findings'];
  filmSync: FilmSync | null;
}) {
  const series = useRunSeries(studioId, runId, true);
  const venue = useVenue(studioId, venueId);
  const base = useMemo(() => (venue.data ? readBase(venue.data.base) : null), [venue.data]);
  if (series.isPending) return <Loading what="Loading the chart series" />;
  if (series.isError) return <ErrorNotice error={series.error} retry={() => void series.refetch()} />;
  return <RunCharts series={series.data} findings={findings} base={base} filmSync={filmSync} />;
}

/** Everything about one cue run: header, live progress, charts, budget, findings, comfort, files and the caution. */
export function RunView({ studioId, runId }: { studioId: string; runId: string }) {
  const run = useRun(studioId, runId);
  if (run.isPending) return <Loading what="Loading the run" />;
  if (run.isError && !run.data) {
    return (
      <ErrorNotice
        error={run.error}
        retry={isUnauthorized(run.error) ? undefined : () => void run.refetch()}
      />
    );
  }
  const detail = run.data;
  const finished = !isRunActive(detail.state) && detail.state !== 'failed';
  const result = detail.result;
  // The comfort summary already shows its weighting note; the notes list keeps the others.
  const notes = (result?.notes ?? []).filter((note) => note !== result?.comfort?.weightingNote);

  return (
    <>
      <RunHeader studioId={studioId} run={detail} />
      {run.isError ? <ErrorNotice error={run.error} /> : null}
      <FilmSyncPanel studioId={studioId} run={detail} />
      {detail.params.touchup ? (
        <Section title="Touch-up">
          <TouchupSummary touchup={detail.params.touchup} />
        </Section>
      ) : null}
      {finished ? (
        <Section title="Motion">
          <Charts
            studioId={studioId}
            runId={runId}
            venueId={detail.venueId}
            findings={result?.findings ?? []}
            filmSync={detail.filmSync}
          />
        </Section>
      ) : null}
      {finished && detail.files.some((file) => file.name === 'spectra.json') ? (
        <Section title="Spectra">
          <RunSpectra studioId={studioId} runId={runId} />
        </Section>
      ) : null}
      {result ? (
        <>
          <Section
            title="Budget"
            aside={
              <span
                className={`text-sm font-medium ${result.within ? 'text-tealdeep-700' : 'text-stop-700'}`}
              >
                {result.within ? 'Within budget' : 'Over budget'}
              </span>
            }
          >
            <BudgetTable uses={result.uses} />
          </Section>
          <Section title={`Findings (${result.findings.length})`}>
            <FindingsTable findings={result.findings} filmSync={detail.filmSync} />
          </Section>
          {result.comfort ? (
            <Section title="Comfort and motion sickness (ISO 2631-1)">
              <ComfortSummary comfort={result.comfort} />
            </Section>
          ) : null}
          {notes.length > 0 ? (
            <Section title="Notes">
              <ul className="list-disc pl-5 text-sm text-ink-800">
                {notes.map((note) => (
                  <li key={note}>{note}</li>
                ))}
              </ul>
            </Section>
          ) : null}
        </>
      ) : null}
      {detail.files.length > 0 ? (
        <Section title="Files">
          <RunFiles studioId={studioId} runId={runId} files={detail.files} />
        </Section>
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
