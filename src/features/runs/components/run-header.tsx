import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { RunDetail } from '../../../../shared/schemas/pipeline';
import { formatBytes, formatDuration_s, shortSha } from '../../../components/charts/format-units';
import { ProgressBar, RunStateBadge, UseRatioBar } from '../../../components/charts/run-badges';
import { checkLabel, formatVenueTime } from '../../../lib/format';
import { useVenue } from '../../../lib/queries/venues';
import { isRunActive } from '../api/get-run';
import { useRequeueRun } from '../api/requeue-run';
import { Button } from '../../../components/ui/button';
import { ErrorNotice } from '../../../components/ui/status';
import { useCan } from '../../../lib/membership';

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="flex flex-col">
      <dt className="text-xs text-ink-600">{label}</dt>
      <dd className="text-sm text-ink-900">{children}</dd>
    </div>
  );
}

/** Asking again for a failed or stalled run, for those who may ask for runs. */
function AskAgain({ studioId, runId }: { studioId: string; runId: string }) {
  const may = useCan('runs.request');
  const requeue = useRequeueRun(studioId);
  if (!may) return null;
  return (
    <div className="mt-2 flex flex-col gap-2">
      <div>
        <Button busy={requeue.isPending} onClick={() => requeue.mutate({ studioId, runId })}>
          Ask for this run again
        </Button>
      </div>
      {requeue.error ? <ErrorNotice error={requeue.error} /> : null}
    </div>
  );
}

/** What the run is (track, take, venue, profile versions), where it stands, and why it failed if it did. */
export function RunHeader({ studioId, run }: { studioId: string; run: RunDetail }) {
  return (
    <div className="flex flex-col gap-3">
      <RunFacts studioId={studioId} run={run} />
      <RunAlerts studioId={studioId} run={run} />
    </div>
  );
}

/** What the run is: track, take, venue, state, profile versions, worst use and its times. */
export function RunFacts({ studioId, run }: { studioId: string; run: RunDetail }) {
  // The venue is the subject: its times are the venue's local times (same cached query as the preview).
  const timeZone = useVenue(studioId, run.venueId).data?.timeZone;
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-2 rounded border border-ink-200 bg-white p-4 md:grid-cols-4">
      <Fact label="Track">
        <Link to={`/s/${studioId}/tracks/${run.trackId}`} className="text-tealdeep-600 underline">
          {run.trackTitle}
        </Link>
      </Fact>
      <Fact label="Take">
        <span className="font-mono">#{run.take.number}</span> {run.take.fileName}
        <span className="block text-xs text-ink-600">
          {formatDuration_s(run.take.duration_s)} · {formatBytes(run.take.sizeBytes)} ·{' '}
          <span className="font-mono" title={run.take.sha256}>
            {shortSha(run.take.sha256)}
          </span>
        </span>
      </Fact>
      <Fact label="Venue">
        <Link to={`/s/${studioId}/venues/${run.venueId}`} className="text-tealdeep-600 underline">
          {run.venueName}
        </Link>
      </Fact>
      <Fact label="State">
        <RunStateBadge state={run.state} />
      </Fact>
      <Fact label="Cueing profile">
        {run.cueingVersion
          ? `${run.cueingVersion.name} v${run.cueingVersion.version}`
          : 'none (the take is already a pose or legs track)'}
      </Fact>
      <Fact label="Budget profile">
        {run.budgetVersion.name} v{run.budgetVersion.version}
      </Fact>
      <Fact label="Worst use">
        <UseRatioBar ratio={run.worstRatio} label={run.worstCheck ?? undefined} />
        {run.worstCheck ? (
          <span className="ml-2 text-xs text-ink-600">{checkLabel(run.worstCheck)}</span>
        ) : null}
      </Fact>
      <Fact label="Queued / finished">
        <span className="text-xs">
          {formatVenueTime(run.createdAt, timeZone)}
          {run.finishedAt ? ` / ${formatVenueTime(run.finishedAt, timeZone)}` : ''}
        </span>
      </Fact>
    </dl>
  );
}

/** Where the run stands when that needs saying: stalled, cueing, failed, or judged against the DEMO budget. */
export function RunAlerts({ studioId, run }: { studioId: string; run: RunDetail }) {
  if (!run.stalled && !isRunActive(run.state) && run.state !== 'failed' && !run.budgetIsDemo) return null;
  return (
    <div className="flex flex-col gap-3">
      {run.stalled ? (
        <div
          role="alert"
          className="rounded border border-signal-400 bg-signal-400/15 px-4 py-3 text-sm text-signal-600"
        >
          <p className="font-semibold">
            Stalled at {run.progress} %: no word from its worker for {run.silent_s} s.
          </p>
          <p>
            The worker cueing this run has stopped answering (stopped, out of memory, or its machine is gone).
            A running worker puts the run back in the queue by itself within a minute; if none is running,
            start one, or ask for the run again.
          </p>
          <AskAgain studioId={studioId} runId={run.id} />
        </div>
      ) : isRunActive(run.state) ? (
        <div
          className="flex items-center gap-3 rounded border border-ink-200 bg-white px-4 py-3"
          role="status"
        >
          <span className="text-sm text-ink-800">
            {run.state === 'queued' ? 'Waiting for a worker' : 'Cueing and checking'}
          </span>
          <ProgressBar percent={run.state === 'queued' ? 0 : run.progress} label="Run progress" />
          {run.lastError ? (
            <span className="text-xs text-signal-600">
              Attempt {run.attempts} failed ({run.lastError}); trying again.
            </span>
          ) : null}
        </div>
      ) : null}
      {run.state === 'failed' ? (
        <div
          role="alert"
          className="rounded border border-stop-500 bg-stop-500/10 px-4 py-3 text-sm text-stop-700"
        >
          <p className="font-semibold">This run failed.</p>
          <p>{run.failureReason ?? run.lastError ?? 'The worker gave no reason.'}</p>
          <AskAgain studioId={studioId} runId={run.id} />
        </div>
      ) : null}
      {run.budgetIsDemo ? (
        <div
          role="note"
          className="rounded border border-signal-400 bg-signal-400/15 px-4 py-3 text-sm text-signal-600"
        >
          <p className="font-semibold">Checked against the DEMO budget.</p>
          <p>
            Its envelope and limits are invented numbers for trying Legwork, not from any standard or code. A
            safety reviewer must set the venue’s own budget before any result here means anything for riders.
          </p>
        </div>
      ) : null}
    </div>
  );
}
