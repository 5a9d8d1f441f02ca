// `/s/:studioId/runs/:runId`: one cue run, the decision on it, its charts and its budget.
import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { RoleGate } from '../../components/ui/role-gate';
import { PageHeading } from '../../components/ui/section';
import { DecisionPanel } from '../../features/review/components/decision-panel';
import { getRunQueryOptions } from '../../features/runs/api/get-run';
import { RunView } from '../../features/runs/components/run-view';
import { useCan } from '../../lib/membership';
import { useStudioContext } from './studio-layout';

/** The run page for the run id in the address. */
export function RunRoute() {
  const { membership } = useStudioContext();
  const { runId = '' } = useParams();
  // The same query as the run view's (one request): the decision shows times in the run's venue's zone.
  const canRead = useCan('runs.read');
  const run = useQuery({ ...getRunQueryOptions(membership.studioId, runId), enabled: canRead });
  return (
    <RoleGate permission="runs.read" what="Cue runs">
      <PageHeading
        title="Cue run"
        subtitle={
          run.data
            ? `${run.data.trackTitle}, take ${run.data.take.number} (${run.data.take.fileName}) at ${run.data.venueName}: the decision, the findings along the take and the motion behind them.`
            : 'The decision, the findings along the take and the motion behind them.'
        }
      />
      <RunView
        key={runId}
        studioId={membership.studioId}
        runId={runId}
        decision={
          <DecisionPanel
            key={`decision-${runId}`}
            studioId={membership.studioId}
            runId={runId}
            venueId={run.data?.venueId}
          />
        }
      />
    </RoleGate>
  );
}
