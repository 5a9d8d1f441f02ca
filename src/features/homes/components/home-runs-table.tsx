import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { appPaths } from '../../../../shared/app-paths';
import { REVIEW_DECISION_LABELS } from '../../../../shared/schemas/review';
import type { HomeRun } from '../../../../shared/schemas/homes';
import type { Venue } from '../../../../shared/schemas/api';
import { RunStateBadge, UseRatioBar } from '../../../components/charts/run-badges';
import { Table, Td, Th } from '../../../components/ui/table';
import { checkLabel, formatVenueTime } from '../../../lib/format';

/** Runs as the homes list them, each opening the run page; `action` adds a last column (a button). */
export function HomeRunsTable({
  studioId,
  runs,
  caption,
  venues,
  action,
}: {
  studioId: string;
  runs: readonly HomeRun[];
  caption: string;
  venues: readonly Venue[] | undefined;
  action?: (run: HomeRun) => ReactNode;
}) {
  const zoneOf = (id: string) => venues?.find((v) => v.id === id)?.timeZone;
  return (
    <Table caption={caption}>
      <thead>
        <tr>
          <Th>Run</Th>
          <Th>Venue</Th>
          <Th>State</Th>
          <Th className="text-right">Hard</Th>
          <Th className="text-right">Comfort</Th>
          <Th>Worst use</Th>
          <Th>Latest review</Th>
          {action ? <Th>Next step</Th> : null}
        </tr>
      </thead>
      <tbody>
        {runs.map((run) => (
          <tr key={run.id}>
            <Td>
              <Link className="text-tealdeep-600 underline" to={appPaths.run(studioId, run.id)}>
                {run.trackTitle}, take {run.takeNumber}
              </Link>
              {run.finishedAt ? (
                <span className="block text-xs text-ink-600">
                  cued {formatVenueTime(run.finishedAt, zoneOf(run.venueId))}
                </span>
              ) : null}
            </Td>
            <Td>{run.venueName}</Td>
            <Td>
              <RunStateBadge state={run.state} />
            </Td>
            <Td
              className={`text-right font-mono ${run.hardFindings > 0 ? 'font-semibold text-stop-700' : ''}`}
            >
              {run.hardFindings}
            </Td>
            <Td className="text-right font-mono">{run.comfortFindings}</Td>
            <Td>
              <UseRatioBar
                ratio={run.worstRatio}
                label={run.worstCheck ? checkLabel(run.worstCheck) : undefined}
              />
              {run.worstCheck ? (
                <span className="block text-xs text-ink-600">{checkLabel(run.worstCheck)}</span>
              ) : null}
            </Td>
            <Td className="text-xs">
              {run.lastReview ? (
                <>
                  {REVIEW_DECISION_LABELS[run.lastReview.decision]} by {run.lastReview.by},{' '}
                  {formatVenueTime(run.lastReview.at, zoneOf(run.venueId))}
                  {run.lastReview.reason ? (
                    <span className="block text-ink-600">{run.lastReview.reason}</span>
                  ) : null}
                </>
              ) : (
                'None yet'
              )}
            </Td>
            {action ? <Td>{action(run)}</Td> : null}
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
