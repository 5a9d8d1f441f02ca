// `/s/:studioId/tokens`: API tokens for pipelines that push takes (studio admins).
import { PageHeading } from '../../components/ui/section';
import { RoleGate } from '../../components/ui/role-gate';
import { TokensPanel } from '../../features/tokens/components/tokens-panel';
import { useStudioContext } from './studio-layout';

/** The API tokens page; a member without the permission is told whose work it is. */
export function TokensRoute() {
  const { membership } = useStudioContext();
  return (
    <RoleGate permission="tokens.manage" what="API tokens">
      <PageHeading
        title="API tokens"
        subtitle="A token lets a render farm create tracks and push takes into this studio, and nothing else."
      />
      <TokensPanel studioId={membership.studioId} />
    </RoleGate>
  );
}
