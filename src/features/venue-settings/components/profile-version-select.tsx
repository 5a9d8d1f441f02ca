import { useId, useState } from 'react';
import type { FormEvent } from 'react';
import type { Profile, VenueDetail } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { ErrorNotice, Loading, Notice } from '../../../components/ui/status';
import { useProfiles } from '../../../lib/queries/profiles';
import { useUpdateVenueSettings } from '../api/update-venue-settings';

const KIND_TEXT = {
  cueing: { title: 'Cueing profile', who: 'motion engineers' },
  budget: { title: 'Budget profile', who: 'safety reviewers' },
} as const;

/** A plain form choosing which version of a cueing or budget profile the venue's next runs use. */
export function ProfileVersionSelect({
  studioId,
  venue,
  kind,
}: {
  studioId: string;
  venue: VenueDetail;
  kind: Profile['kind'];
}) {
  const id = useId();
  const current = kind === 'cueing' ? venue.cueingVersion : venue.budgetVersion;
  const [chosen, setChosen] = useState(current?.id ?? '');
  const [saved, setSaved] = useState(false);
  const profiles = useProfiles(studioId, kind);
  const update = useUpdateVenueSettings(studioId, venue.id);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setSaved(false);
    const value = chosen || null;
    update.mutate(
      kind === 'cueing'
        ? { studioId, venueId: venue.id, cueingVersionId: value }
        : { studioId, venueId: venue.id, budgetVersionId: value },
      { onSuccess: () => setSaved(true) },
    );
  };

  return (
    <form
      onSubmit={submit}
      aria-label={`${KIND_TEXT[kind].title} of ${venue.name}`}
      className="flex flex-col gap-2"
    >
      <p className="text-sm text-ink-800">
        Current:{' '}
        {current ? (
          <span className="font-medium">
            {current.name} v{current.version}
          </span>
        ) : (
          <span className="text-signal-600">none set</span>
        )}
      </p>
      {profiles.isPending ? <Loading what="Loading profiles" /> : null}
      {profiles.isError ? <ErrorNotice error={profiles.error} retry={() => void profiles.refetch()} /> : null}
      {profiles.data ? (
        <div className="flex flex-wrap items-end gap-3">
          <div className="flex flex-col gap-1">
            <label htmlFor={id} className="text-xs font-medium text-ink-600">
              {KIND_TEXT[kind].title} version for new runs
            </label>
            <select
              id={id}
              value={chosen}
              onChange={(event) => {
                setChosen(event.target.value);
                setSaved(false);
              }}
              className="min-w-72 rounded border border-ink-200 bg-white px-2 py-1.5 text-sm text-ink-900"
            >
              <option value="">none</option>
              {profiles.data.map((profile) => (
                <optgroup key={profile.id} label={profile.name}>
                  {[...profile.versions]
                    .sort((a, b) => b.version - a.version)
                    .map((version) => (
                      <option key={version.id} value={version.id}>
                        {profile.name} v{version.version}
                        {version.note ? ` — ${version.note}` : ''}
                      </option>
                    ))}
                </optgroup>
              ))}
            </select>
          </div>
          <Button
            type="submit"
            variant="primary"
            busy={update.isPending}
            disabled={chosen === (current?.id ?? '')}
          >
            Save
          </Button>
        </div>
      ) : null}
      {update.error ? <ErrorNotice error={update.error} /> : null}
      {saved ? (
        <Notice>Saved. Runs queued from now on use this version; earlier runs keep theirs.</Notice>
      ) : null}
      <p className="text-xs text-ink-400">
        Changed by {KIND_TEXT[kind].who}; the server refuses anyone else.
      </p>
    </form>
  );
}
