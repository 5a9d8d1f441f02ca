// `/s/:studioId/tracks/:trackId/compare?runs=a,b`: runs of one take side by side.
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { appPaths } from '../../../shared/app-paths';
import { RoleGate } from '../../components/ui/role-gate';
import { PageHeading } from '../../components/ui/section';
import { CompareView } from '../../features/compare/components/compare-view';
import { parseRunIds } from '../../features/compare/utils/compare-diff';
import { useStudioContext } from './studio-layout';

/** The run comparison for the runs in the address. */
export function CompareRoute() {
  const { membership } = useStudioContext();
  const { trackId = '' } = useParams();
  const [search] = useSearchParams();
  const runIds = parseRunIds(search.get('runs'));
  return (
    <RoleGate permission="runs.read" what="Cue runs">
      <p className="text-xs">
        <Link to={appPaths.track(membership.studioId, trackId)} className="text-tealdeep-600 underline">
          Back to the track
        </Link>
      </p>
      <PageHeading
        title="Compare runs"
        subtitle="Runs of one take overlaid on one time axis, with their budgets side by side."
      />
      <CompareView key={runIds.join(',')} studioId={membership.studioId} runIds={runIds} />
    </RoleGate>
  );
}
