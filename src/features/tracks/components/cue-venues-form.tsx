import { useState } from 'react';
import type { FormEvent } from 'react';
import type { Take } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { CheckboxGroup } from '../../../components/ui/form';
import { ErrorNotice, Loading, Notice } from '../../../components/ui/status';
import { useRequestRuns } from '../api/request-runs';
import { useVenues } from '../../../lib/queries/venues';
import { EMPTY_TOUCHUP, TouchupFields, touchupOfDraft } from './touchup-fields';
import type { TouchupDraft } from './touchup-fields';

/** Queues cue runs of one take for the venues ticked; the server refuses venues without profiles or of the wrong kind. */
export function CueVenuesForm({
  studioId,
  take,
  onDone,
}: {
  studioId: string;
  take: Take;
  onDone?: () => void;
}) {
  const venues = useVenues(studioId);
  const [venueIds, setVenueIds] = useState<string[]>([]);
  const [error, setError] = useState<string | undefined>();
  const [queued, setQueued] = useState<string | null>(null);
  const request = useRequestRuns(studioId);
  const [draft, setDraft] = useState<TouchupDraft>(EMPTY_TOUCHUP);
  const [problems, setProblems] = useState<Record<string, string>>({});

  if (venues.isPending) return <Loading what="Loading venues" />;
  if (venues.isError) return <ErrorNotice error={venues.error} retry={() => void venues.refetch()} />;

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setQueued(null);
    if (venueIds.length === 0) {
      setError('Choose at least one venue.');
      return;
    }
    setError(undefined);
    const { touchup, problems: found } = touchupOfDraft(draft);
    setProblems(found);
    if (Object.keys(found).length > 0) return;
    request.mutate(
      { studioId, takeId: take.id, venueIds, ...(touchup ? { touchup } : {}) },
      {
        onSuccess: (runs) => {
          setQueued(`${runs.length} run${runs.length === 1 ? '' : 's'} queued for take ${take.number}.`);
          setVenueIds([]);
          onDone?.();
        },
      },
    );
  };

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={`Cue take ${take.number} for venues`}
      className="flex flex-col gap-2"
    >
      <CheckboxGroup
        legend={`Venues to cue take ${take.number} for`}
        options={venues.data.map((venue) => ({ value: venue.id, label: venue.name }))}
        value={venueIds}
        onChange={setVenueIds}
        error={error}
        disabled={request.isPending}
      />
      <TouchupFields take={take} draft={draft} onChange={setDraft} problems={problems} />
      {request.error ? <ErrorNotice error={request.error} /> : null}
      {queued ? <Notice>{queued}</Notice> : null}
      <div>
        <Button type="submit" variant="primary" size="sm" busy={request.isPending}>
          Queue cue runs
        </Button>
      </div>
    </form>
  );
}
