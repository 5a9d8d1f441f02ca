import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { useVenues } from '../../../lib/queries/venues';
import { VenuesTable } from './venues-table';

/** The studio's venues as the caller may see them; `onlyIds` narrows to a venue operator's scope. */
export function StudioVenues({
  studioId,
  onlyIds,
  caption,
  empty = 'No venues yet.',
}: {
  studioId: string;
  onlyIds?: readonly string[];
  caption?: string;
  empty?: string;
}) {
  const venues = useVenues(studioId);
  if (venues.isPending) return <Loading what="Loading venues" />;
  if (venues.isError) return <ErrorNotice error={venues.error} retry={() => void venues.refetch()} />;
  const shown = onlyIds ? venues.data.filter((venue) => onlyIds.includes(venue.id)) : venues.data;
  if (shown.length === 0) return <Empty>{empty}</Empty>;
  return <VenuesTable venues={shown} caption={caption} />;
}
