import { useId, useState } from 'react';
import type { FormEvent } from 'react';
import type { Profile, VenueDetail } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { TextAreaField, issuesByField } from '../../../components/ui/form';
import { ErrorNotice, Loading, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useProfiles } from '../../../lib/queries/profiles';
import { useUpdateVenueSettings } from '../api/update-venue-settings';

const KIND_TEXT = {
  cueing: { title: 'Cueing profile', who: 'motion engineers' },
  budget: { title: 'Budget profile', who: 'safety reviewers' },
} as const;

/**
 * A plain form choosing which version of a cueing or budget profile the venue's next runs use. Saving
 * asks to confirm the change, naming both versions, and for a reason, which the audit log keeps.
 */
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

  const [confirming, setConfirming] = useState(false);
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | undefined>();

  const versionName = (versionId: string): string => {
    if (!versionId) return 'none';
    for (const profile of profiles.data ?? []) {
      const version = profile.versions.find((v) => v.id === versionId);
      if (version) return `${profile.name} v${version.version}`;
    }
    return 'an unknown version';
  };

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setSaved(false);
    if (!confirming) {
      setConfirming(true);
      setReasonError(undefined);
      update.reset();
      return;
    }
    if (!reason.trim()) {
      setReasonError('Say why the venue changes profile; the audit log keeps the reason.');
      return;
    }
    setReasonError(undefined);
    const value = chosen || null;
    update.mutate(
      kind === 'cueing'
        ? { studioId, venueId: venue.id, cueingVersionId: value, reason: reason.trim() }
        : { studioId, venueId: venue.id, budgetVersionId: value, reason: reason.trim() },
      {
        onSuccess: () => {
          setSaved(true);
          setConfirming(false);
          setReason('');
        },
      },
    );
  };

  const serverIssues =
    update.error instanceof ApiRequestError
      ? issuesByField(update.error.issues)
      : ({} as Record<string, string>);
  const shownReasonError = reasonError ?? serverIssues.reason;

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
              disabled={confirming}
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
          {!confirming ? (
            <Button type="submit" variant="primary" disabled={chosen === (current?.id ?? '')}>
              Save
            </Button>
          ) : null}
        </div>
      ) : null}
      {confirming ? (
        <div
          role="group"
          aria-label={`Confirm the ${KIND_TEXT[kind].title.toLowerCase()} change`}
          className="flex max-w-xl flex-col gap-2 rounded border border-signal-400 bg-white p-3"
        >
          <p className="text-sm text-ink-900">
            Change the {KIND_TEXT[kind].title.toLowerCase()} of {venue.name} from{' '}
            <span className="font-medium">{current ? `${current.name} v${current.version}` : 'none'}</span> to{' '}
            <span className="font-medium">{versionName(chosen)}</span>?
          </p>
          <p className="text-xs text-ink-600">
            {kind === 'budget'
              ? chosen
                ? 'Runs queued from now on are checked against this budget; earlier runs keep the budget they were checked against.'
                : 'Runs cannot be queued for this venue until a budget is chosen again; earlier runs keep theirs.'
              : chosen
                ? 'Runs queued from now on are cued with this profile; earlier runs keep theirs.'
                : 'Vehicle takes cannot be cued for this venue until a cueing profile is chosen again (pose and leg takes need none); earlier runs keep theirs.'}
          </p>
          <TextAreaField
            label="Reason for the change (kept in the audit log)"
            value={reason}
            error={shownReasonError}
            onChange={(event) => {
              setReason(event.target.value);
              setReasonError(undefined);
            }}
            maxLength={4000}
          />
          <div className="flex gap-2">
            <Button type="submit" variant="primary" busy={update.isPending}>
              Confirm change
            </Button>
            <Button
              variant="quiet"
              onClick={() => {
                setConfirming(false);
                setReasonError(undefined);
                update.reset();
              }}
            >
              Back
            </Button>
          </div>
        </div>
      ) : null}
      {update.error && !serverIssues.reason ? <ErrorNotice error={update.error} /> : null}
      {saved ? (
        <Notice>Saved. Runs queued from now on use this version; earlier runs keep theirs.</Notice>
      ) : null}
      <p className="text-xs text-ink-400">
        Changed by {KIND_TEXT[kind].who}; the server refuses anyone else.
      </p>
    </form>
  );
}
