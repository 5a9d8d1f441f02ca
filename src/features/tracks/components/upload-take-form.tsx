import { useRef, useState } from 'react';
import type { FormEvent } from 'react';
import { ProgressBar } from '../../../components/charts/run-badges';
import { Button } from '../../../components/ui/button';
import { FieldError } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { useUploadTake } from '../api/upload-take';

/** Uploads a take file with a progress bar; the server's reason for refusing a file is shown word for word. */
export function UploadTakeForm({ studioId, trackId }: { studioId: string; trackId: string }) {
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [fraction, setFraction] = useState(0);
  const [missing, setMissing] = useState(false);
  const [done, setDone] = useState<string | null>(null);
  const [duplicate, setDuplicate] = useState<string | null>(null);
  const upload = useUploadTake(studioId);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setDone(null);
    setDuplicate(null);
    if (!file) {
      setMissing(true);
      return;
    }
    setMissing(false);
    setFraction(0);
    upload.mutate(
      { studioId, trackId, file, onProgress: setFraction },
      {
        onSuccess: (take) => {
          setFraction(1);
          setDone(`Take ${take.number} stored: ${take.fileName}, ${take.samples} samples.`);
          // Same SHA-256 as an earlier take of this track: stored anyway, but say so.
          setDuplicate(
            take.duplicateOf
              ? `This file is identical to take ${take.duplicateOf.number} (same SHA-256). It is kept as take ${take.number}; cue the earlier take instead if that is what you meant.`
              : null,
          );
          setFile(null);
          if (input.current) input.current.value = '';
        },
      },
    );
  };

  const sending = upload.isPending;
  const checking = sending && fraction >= 1;
  return (
    <form onSubmit={submit} noValidate aria-label="Upload a take" className="flex flex-col gap-2">
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
          Take file (.csv or .csv.gz)
          <input
            ref={input}
            type="file"
            accept=".csv,.csv.gz,.gz"
            aria-invalid={missing || undefined}
            onChange={(event) => {
              setFile(event.target.files?.[0] ?? null);
              setMissing(false);
              setDone(null);
              upload.reset();
            }}
            className="text-sm text-ink-800 file:mr-2 file:rounded file:border file:border-ink-200 file:bg-white file:px-2 file:py-1 file:text-sm"
          />
        </label>
        <Button type="submit" variant="primary" busy={sending}>
          Upload take
        </Button>
        {sending || done ? <ProgressBar percent={fraction * 100} label="Upload progress" /> : null}
        {checking ? <span className="text-xs text-ink-600">Checking the file on the server…</span> : null}
      </div>
      {missing ? <FieldError>Choose a take file first.</FieldError> : null}
      {upload.error ? <ErrorNotice error={upload.error} /> : null}
      {done ? <Notice>{done}</Notice> : null}
      {duplicate ? (
        <p
          role="status"
          className="rounded border border-amber-300 bg-amber-50 px-3 py-2 text-sm text-amber-900"
        >
          {duplicate}
        </p>
      ) : null}
      <p className="text-xs text-ink-400">
        Vehicle takes: time_s, fx/fy/fz (mps2 or g), wx/wy/wz (radps or degps). Pose and legs takes follow the
        motion conventions. Units are part of each column name.
      </p>
    </form>
  );
}
