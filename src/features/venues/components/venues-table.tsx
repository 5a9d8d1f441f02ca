import { Link, useParams } from 'react-router-dom';
import type { Venue } from '../../../../shared/schemas/api';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatRate_hz } from '../../../lib/format';

const BASE_KIND_LABELS: Record<Venue['baseKind'], string> = {
  hexapod: 'Hexapod (6 legs)',
  planar3: 'Planar stage (3 legs)',
};

/** Venues with their motion base: kind, controller rate and seat count. */
export function VenuesTable({ venues, caption = 'Venues' }: { venues: readonly Venue[]; caption?: string }) {
  const { studioId } = useParams();
  return (
    <Table caption={caption}>
      <thead>
        <tr>
          <Th>Venue</Th>
          <Th>Site</Th>
          <Th>Time zone</Th>
          <Th>Motion base</Th>
          <Th className="text-right">Controller rate</Th>
          <Th className="text-right">Seats</Th>
        </tr>
      </thead>
      <tbody>
        {venues.map((venue) => (
          <tr key={venue.id}>
            <Td className="font-medium">
              {studioId ? (
                <Link className="text-tealdeep-600 underline" to={`/s/${studioId}/venues/${venue.id}`}>
                  {venue.name}
                </Link>
              ) : (
                venue.name
              )}
            </Td>
            <Td>{venue.site}</Td>
            <Td className="font-mono text-xs">{venue.timeZone}</Td>
            <Td>{BASE_KIND_LABELS[venue.baseKind]}</Td>
            <Td className="text-right font-mono">{formatRate_hz(venue.controllerRate_hz)}</Td>
            <Td className="text-right font-mono">{venue.seatCount}</Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
