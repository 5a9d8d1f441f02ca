import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { appPaths } from '../../../../shared/app-paths';
import type { RunSummary } from '../../../../shared/schemas/pipeline';
import { ProgressBar, RunStateBadge, UseRatioBar } from '../../../components/charts/run-badges';
import { Button } from '../../../components/ui/button';
import { Empty } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { checkLabel, formatVenueTime } from '../../../lib/format';
import { compareSelection } from '../../../lib/compare-selection';
import { useVenues } from '../../../lib/queries/venues';

function groupByVenue(
  runs: readonly RunSummary[],
): { venueId: string; venueName: string; runs: RunSummary[] }[] {
  const groups = new Map<string, { venueId: string; venueName: string; runs: RunSummary[] }>();
  for (const run of runs) {
    const group = groups.get(run.venueId) ?? { venueId: run.venueId, venueName: run.venueName, runs: [] };
    group.runs.push(run);
    groups.set(run.venueId, group);
  }
  for (const group of groups.values()) group.runs.sort((a, b) => b.createdAt.localeCompare(a.createdAt));
  return [...groups.values()].sort((a, b) => a.venueName.localeCompare(b.venueName));
}

function RunStatus({ run }: { run: RunSummary }) {
  if (run.stalled) {
    return (
      <span className="text-xs text-signal-600">
        Stalled at {run.progress} %: no word from its worker for {run.silent_s} s
      </span>
    );
  }
  if (run.state === 'queued' || run.state === 'cueing') {
    return (
      <ProgressBar
        percent={run.state === 'queued' ? 0 : run.progress}
        label={`Progress of run for take ${run.takeNumber} at ${run.venueName}`}
      />
    );
  }
  if (run.state === 'failed')
    return <span className="text-xs text-stop-700">{run.failureReason ?? 'failed'}</span>;
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      <UseRatioBar ratio={run.worstRatio} label={run.worstCheck ?? undefined} />
      {run.worstCheck ? <span className="text-xs text-ink-600">{checkLabel(run.worstCheck)}</span> : null}
      {run.findingCount !== null ? (
        <span className="text-xs text-ink-600">
          {run.findingCount} finding{run.findingCount === 1 ? '' : 's'}
        </span>
      ) : null}
    </span>
  );
}

/** Every cue run of the track, grouped per venue, newest first, with live progress while the worker runs them. */
export function TrackRuns({ studioId, runs }: { studioId: string; runs: readonly RunSummary[] }) {
  const venues = useVenues(studioId);
  const navigate = useNavigate();
  const [picked, setPicked] = useState<readonly string[]>([]);
  if (runs.length === 0) return <Empty>No cue runs yet. Choose “Cue for venues” on a take.</Empty>;
  const zoneOf = (venueId: string) => venues.data?.find((venue) => venue.id === venueId)?.timeZone;
  // Runs keep the order they were ticked in, so the first ticked is the one the others are measured against.
  const selected = picked
    .map((id) => runs.find((run) => run.id === id))
    .filter((run): run is RunSummary => run !== undefined);
  const selection = compareSelection(selected);
  const toggle = (id: string, on: boolean) =>
    setPicked((now) => (on ? [...now.filter((x) => x !== id), id] : now.filter((x) => x !== id)));
  const trackId = runs[0]?.trackId ?? '';
  return (
    <div className="flex flex-col gap-4">
      <div
        role="group"
        aria-label="Compare runs"
        className="flex flex-wrap items-center gap-3 rounded border border-ink-200 bg-white px-3 py-2"
      >
        <Button
          size="sm"
          variant="primary"
          disabled={!selection.ok}
          aria-describedby="compare-selection-reason"
          onClick={() =>
            navigate(
              appPaths.compareRuns(
                studioId,
                trackId,
                selected.map((run) => run.id),
              ),
            )
          }
        >
          Compare selected
        </Button>
        <span id="compare-selection-reason" className="text-xs text-ink-600">
          {selection.reason}
        </span>
        {selected.length > 0 ? (
          <Button size="sm" variant="quiet" onClick={() => setPicked([])}>
            Clear selection
          </Button>
        ) : null}
      </div>
      {groupByVenue(runs).map((group) => (
        <div key={group.venueId} className="flex flex-col gap-1.5">
          <h3 className="text-sm font-medium text-ink-800">
            <Link to={`/s/${studioId}/venues/${group.venueId}`} className="hover:underline">
              {group.venueName}
            </Link>
          </h3>
          <Table caption={`Runs at ${group.venueName}`}>
            <thead>
              <tr>
                <Th>
                  <span className="sr-only">Compare</span>
                </Th>
                <Th className="text-right">Take</Th>
                <Th>State</Th>
                <Th>Worst use / progress</Th>
                <Th>Queued</Th>
                <Th>
                  <span className="sr-only">Open</span>
                </Th>
              </tr>
            </thead>
            <tbody>
              {group.runs.map((run) => (
                <tr key={run.id}>
                  <Td className="w-8">
                    <input
                      type="checkbox"
                      className="h-4 w-4 accent-tealdeep-600"
                      checked={picked.includes(run.id)}
                      onChange={(e) => toggle(run.id, e.target.checked)}
                      aria-label={`Select run of take ${run.takeNumber} at ${run.venueName} (queued ${formatVenueTime(run.createdAt, zoneOf(run.venueId))}) to compare`}
                    />
                  </Td>
                  <Td className="text-right font-mono">{run.takeNumber}</Td>
                  <Td>
                    <RunStateBadge state={run.state} />
                  </Td>
                  <Td>
                    <RunStatus run={run} />
                  </Td>
                  <Td className="text-xs whitespace-nowrap text-ink-600">
                    {formatVenueTime(run.createdAt, zoneOf(run.venueId))}
                  </Td>
                  <Td className="text-right">
                    <Link
                      to={`/s/${studioId}/runs/${run.id}`}
                      className="text-sm text-tealdeep-600 underline"
                      aria-label={`Open run of take ${run.takeNumber} at ${run.venueName}`}
                    >
                      Open run
                    </Link>
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
        </div>
      ))}
    </div>
  );
}
