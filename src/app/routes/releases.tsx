// `/s/:studioId/releases` and `/s/:studioId/releases/:releaseId`: the packages released to venues.
import { useParams } from 'react-router-dom';
import { RoleGate } from '../../components/ui/role-gate';
import { PageHeading } from '../../components/ui/section';
import { ReleaseView } from '../../features/releases/components/release-view';
import { ReleasesList } from '../../features/releases/components/releases-list';
import { useStudioContext } from './studio-layout';

export function ReleasesRoute() {
  const { membership } = useStudioContext();
  return (
    <RoleGate permission="releases.read" what="Releases">
      <PageHeading title="Releases" subtitle="Packages released to venues, newest first." />
      <ReleasesList studioId={membership.studioId} />
    </RoleGate>
  );
}

export function ReleaseRoute() {
  const { membership } = useStudioContext();
  const { releaseId = '' } = useParams();
  return (
    <RoleGate permission="releases.read" what="Releases">
      <PageHeading title="Release" subtitle="A package for one venue's motion base." />
      <ReleaseView key={releaseId} studioId={membership.studioId} releaseId={releaseId} />
    </RoleGate>
  );
}
