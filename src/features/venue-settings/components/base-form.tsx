import { useState } from 'react';
import type { FormEvent } from 'react';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useUpdateVenueBase } from '../api/update-venue-base';
import { BaseJsonField, locateBaseIssues, readBaseJson } from './base-json-field';
import type { BaseIssue } from './base-json-field';

/** Edits the venue's motion base as JSON (lengths m, angles deg); the server checks the geometry. */
export function BaseForm({ studioId, venue }: { studioId: string; venue: VenueDetail }) {
  const [text, setText] = useState(() => JSON.stringify(venue.base, null, 2));
  const [clientIssue, setClientIssue] = useState<BaseIssue | null>(null);
  const [sentText, setSentText] = useState('');
  const [saved, setSaved] = useState(false);
  const update = useUpdateVenueBase(studioId, venue.id);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setSaved(false);
    const read = readBaseJson(text);
    if (!read.ok) {
      setClientIssue(read.issue);
      update.reset();
      return;
    }
    setClientIssue(null);
    setSentText(text);
    update.mutate(
      { studioId, venueId: venue.id, base: read.base },
      {
        // The server stores joint form (a parametric hexapod comes back as joints), so show what it kept.
        onSuccess: (stored) => {
          setText(JSON.stringify(stored.base, null, 2));
          setSaved(true);
        },
      },
    );
  };

  // Positions refer to the text that was sent, which may have been edited since.
  const serverIssues =
    update.error instanceof ApiRequestError ? locateBaseIssues(sentText, update.error.issues) : [];

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={`Motion base of ${venue.name}`}
      className="flex flex-col gap-2"
    >
      <BaseJsonField
        label="Motion base (JSON)"
        value={text}
        onChange={(next) => {
          setText(next);
          setSaved(false);
        }}
        issues={clientIssue ? [clientIssue] : serverIssues}
      />
      {update.error ? <ErrorNotice error={update.error} /> : null}
      {saved ? <Notice>Motion base saved.</Notice> : null}
      <div>
        <Button type="submit" variant="primary" busy={update.isPending}>
          Save
        </Button>
      </div>
      <p className="text-xs text-ink-400">
        Finished runs keep the base they used (it is in their manifest); queued runs use the base as it is
        when they start. Changed by motion engineers and studio admins; the server refuses anyone else.
      </p>
      <p className="text-xs text-ink-400">
        Legwork supports, and never replaces, the ride manufacturer&apos;s engineering, the applicable codes
        and a qualified person&apos;s sign-off.
      </p>
    </form>
  );
}
