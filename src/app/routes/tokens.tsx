// `/s/:studioId/tokens`: API tokens for pipelines that push takes (studio admins).
import { PageHeading } from '../../components/ui/section';
import { ErrorNotice } from '../../components/ui/status';
import { TokensPanel } from '../../features/tokens/components/tokens-panel';
import { useStudioContext } from './studio-layout';

/** The API tokens page; anyone but a studio admin is told who may use it. */
export function TokensRoute() {
  const { membership } = useStudioContext();
  if (!membership.roles.includes('studio_admin')) {
    return <ErrorNotice error={new Error('Only a studio admin can manage API tokens.')} />;
  }
  return (
    <>
      <PageHeading
        title="API tokens"
        subtitle="A token lets a render farm create tracks and push takes into this studio, and nothing else."
      />
      <TokensPanel studioId={membership.studioId} />
    </>
  );
}
