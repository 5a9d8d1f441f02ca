import { useState } from 'react';
import type { FormEvent } from 'react';
import { createTrackBody } from '../../../../shared/schemas/pipeline';
import type { TrackDetail } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { TextField, issuesByField } from '../../../components/ui/form';
import { ErrorNotice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useCreateTrack } from '../api/create-track';

/** Creates a track (title and film); on success hands the new track to `onCreated`. */
export function NewTrackForm({
  studioId,
  onCreated,
}: {
  studioId: string;
  onCreated: (track: TrackDetail) => void;
}) {
  const [title, setTitle] = useState('');
  const [film, setFilm] = useState('');
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const create = useCreateTrack(studioId);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = createTrackBody.safeParse({ title, film });
    if (!parsed.success) {
      setClientErrors(
        issuesByField(
          parsed.error.issues.map((issue) => ({ path: issue.path.join('.'), message: issue.message })),
        ),
      );
      return;
    }
    setClientErrors({});
    create.mutate({ studioId, ...parsed.data }, { onSuccess: onCreated });
  };

  const serverErrors = create.error instanceof ApiRequestError ? issuesByField(create.error.issues) : {};
  const errors = { ...serverErrors, ...clientErrors };
  return (
    <form onSubmit={submit} noValidate aria-label="New track" className="flex flex-wrap items-start gap-3">
      {create.error ? (
        <div className="basis-full">
          <ErrorNotice error={create.error} />
        </div>
      ) : null}
      <TextField
        label="Track title"
        value={title}
        error={errors.title}
        onChange={(event) => setTitle(event.target.value)}
        className="w-64"
      />
      <TextField
        label="Ride film"
        value={film}
        error={errors.film}
        onChange={(event) => setFilm(event.target.value)}
        className="w-64"
      />
      <Button type="submit" variant="primary" busy={create.isPending} className="mt-5">
        Create track
      </Button>
    </form>
  );
}
