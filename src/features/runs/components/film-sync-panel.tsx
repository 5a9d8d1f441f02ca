import { useState } from 'react';
import type { FormEvent } from 'react';
import { useNavigate } from 'react-router-dom';
import { appPaths } from '../../../../shared/app-paths';
import type { RunDetail } from '../../../../shared/schemas/pipeline';
import type { FilmSync } from '../../../../shared/schemas/film-sync';
import { filmOffsetBody } from '../../../../shared/schemas/run-params';
import { Button } from '../../../components/ui/button';
import { FieldError } from '../../../components/ui/form';
import { ErrorNotice } from '../../../components/ui/status';
import { useCan } from '../../../lib/membership';
import { useNudgeFilmOffset } from '../api/nudge-film-offset';
import { describeFilmSync } from '../utils/film-time';

/**
 * The run's film sync, and for a producer the nudge: moving the motion some frames against the picture
 * makes a new run (this one is kept as it is) and opens it.
 */
export function FilmSyncPanel({ studioId, run }: { studioId: string; run: RunDetail }) {
  // Only a run with film sync has anything to show (and asks for the member's roles).
  return run.filmSync ? <FilmSyncBox studioId={studioId} run={run} sync={run.filmSync} /> : null;
}

function FilmSyncBox({ studioId, run, sync }: { studioId: string; run: RunDetail; sync: FilmSync }) {
  const canNudge = useCan('runs.sync');
  const navigate = useNavigate();
  const nudge = useNudgeFilmOffset(studioId);
  const [by, setBy] = useState('1');
  const [error, setError] = useState<string | undefined>();

  const send = (delta: number) => {
    const parsed = filmOffsetBody.safeParse({ offset_frames: sync.offset_frames + delta });
    if (!Number.isInteger(delta) || delta === 0 || !parsed.success) {
      setError('A nudge is a whole number of frames, not zero, within ±100,000 frames in all.');
      return;
    }
    setError(undefined);
    nudge.mutate(
      { studioId, runId: run.id, offset_frames: parsed.data.offset_frames },
      { onSuccess: (next) => void navigate(appPaths.run(studioId, next.id)) },
    );
  };
  const submit = (sign: 1 | -1) => (event?: FormEvent) => {
    event?.preventDefault();
    send(sign * Number(by));
  };

  return (
    <div
      className="flex flex-col gap-2 rounded border border-ink-200 bg-white px-4 py-3"
      aria-label="Film sync"
    >
      <p className="text-sm text-ink-900">
        <span className="font-semibold">Film sync: </span>
        {describeFilmSync(sync)}
        {run.params.filmOffset_frames !== undefined &&
        run.params.filmOffset_frames !== run.take.filmSync?.offset_frames
          ? ` (the take says ${run.take.filmSync?.offset_frames ?? 0}; this run was nudged)`
          : ''}
      </p>
      {canNudge ? (
        <form onSubmit={submit(1)} noValidate className="flex flex-wrap items-end gap-2">
          <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
            Nudge by (frames)
            <input
              value={by}
              onChange={(event) => setBy(event.target.value)}
              inputMode="numeric"
              aria-invalid={error ? true : undefined}
              className="w-20 rounded border border-ink-200 bg-white px-2 py-1 font-mono text-sm"
            />
          </label>
          <Button type="button" size="sm" busy={nudge.isPending} onClick={() => submit(-1)()}>
            Motion earlier
          </Button>
          <Button type="submit" size="sm" busy={nudge.isPending}>
            Motion later
          </Button>
          <span className="text-xs text-ink-600">
            Makes a new run of this take with the same profiles; this run stays as it is.
          </span>
        </form>
      ) : null}
      {error ? <FieldError>{error}</FieldError> : null}
      {nudge.error ? <ErrorNotice error={nudge.error} /> : null}
    </div>
  );
}
