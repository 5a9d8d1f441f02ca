// `/s/:studioId/runs/:runId`: one cue run, its charts and its budget.
import { useParams } from 'react-router-dom';
import { RoleGate } from '../../components/ui/role-gate';
import { PageHeading } from '../../components/ui/section';
import { RunView } from '../../features/runs/components/run-view';
import { useStudioContext } from './studio-layout';

/** The run page for the run id in the address. */
export function RunRoute() {
  const { membership } = useStudioContext();
  const { runId = '' } = useParams();
  return (
    <RoleGate permission="runs.read" what="Cue runs">
      <PageHeading title="Cue run" subtitle="Input and cued motion, actuator use and the safety budget." />
      <RunView key={runId} studioId={membership.studioId} runId={runId} />
    </RoleGate>
  );
}
