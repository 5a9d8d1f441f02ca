import { useRef, useState } from 'react';
import type { FormEvent } from 'react';
import { ProgressBar } from '../../../components/charts/run-badges';
import { Button } from '../../../components/ui/button';
import { FieldError } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { useUploadTake } from '../api/upload-take';
import { FRAME_RATES, FRAME_RATE_IDS } from '../../../../shared/motion/timecode';
import { uploadQuery } from '../../../../shared/schemas/pipeline';

type SyncFields = { frameRate: string; startTimecode: string; offset_frames: string };
const NO_SYNC: SyncFields = { frameRate: '', startTimecode: '', offset_frames: '' };

/** Problems of the film sync fields by field name, checked with the server's own schema. */
function syncProblems(fileName: string, sync: SyncFields): Partial<Record<keyof SyncFields, string>> {
  const r = uploadQuery.safeParse({ fileName, ...sync });
  if (r.success) return {};
  const out: Partial<Record<keyof SyncFields, string>> = {};
  for (const issue of r.error.issues) {
    const key = issue.path[0];
    if (key === 'frameRate' || key === 'startTimecode' || key === 'offset_frames') out[key] ??= issue.message;
  }
  return out;
}

/** Uploads a take file with a progress bar; the server's reason for refusing a file is shown word for word. */
export function UploadTakeForm({ studioId, trackId }: { studioId: string; trackId: string }) {
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [fraction, setFraction] = useState(0);
  const [missing, setMissing] = useState(false);
  const [done, setDone] = useState<string | null>(null);
  const [duplicate, setDuplicate] = useState<string | null>(null);
  const [sync, setSync] = useState<SyncFields>(NO_SYNC);
  const [syncErrors, setSyncErrors] = useState<Partial<Record<keyof SyncFields, string>>>({});
  const setField = (key: keyof SyncFields, value: string) => {
    setSync((s) => ({ ...s, [key]: value }));
    setSyncErrors((e) => ({ ...e, [key]: undefined }));
  };
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
    const problems = syncProblems(file.name, sync);
    setSyncErrors(problems);
    if (Object.keys(problems).length > 0) return;
    setFraction(0);
    upload.mutate(
      { studioId, trackId, file, filmSync: sync, onProgress: setFraction },
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
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
          Film frame rate
          <select
            value={sync.frameRate}
            onChange={(event) => setField('frameRate', event.target.value)}
            aria-invalid={syncErrors.frameRate ? true : undefined}
            className="rounded border border-ink-200 bg-white px-2 py-1.5 text-sm text-ink-900"
          >
            <option value="">No film sync</option>
            {FRAME_RATE_IDS.map((id) => (
              <option key={id} value={id}>
                {FRAME_RATES[id].label}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
          Start timecode
          <input
            value={sync.startTimecode}
            onChange={(event) => setField('startTimecode', event.target.value)}
            placeholder={sync.frameRate === '29.97df' ? '00:00:00;00' : '00:00:00:00'}
            aria-invalid={syncErrors.startTimecode ? true : undefined}
            className="w-32 rounded border border-ink-200 bg-white px-2 py-1.5 font-mono text-sm text-ink-900"
          />
        </label>
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
          Motion offset (frames)
          <input
            value={sync.offset_frames}
            onChange={(event) => setField('offset_frames', event.target.value)}
            inputMode="numeric"
            placeholder="0"
            aria-invalid={syncErrors.offset_frames ? true : undefined}
            className="w-24 rounded border border-ink-200 bg-white px-2 py-1.5 font-mono text-sm text-ink-900"
          />
        </label>
        <Button type="submit" variant="primary" busy={sending}>
          Upload take
        </Button>
        {sending || done ? <ProgressBar percent={fraction * 100} label="Upload progress" /> : null}
        {checking ? <span className="text-xs text-ink-600">Checking the file on the server…</span> : null}
      </div>
      {missing ? <FieldError>Choose a take file first.</FieldError> : null}
      {(['frameRate', 'startTimecode', 'offset_frames'] as const).map((key) =>
        syncErrors[key] ? (
          <FieldError key={key}>
            {key === 'frameRate'
              ? 'Film frame rate'
              : key === 'startTimecode'
                ? 'Start timecode'
                : 'Motion offset'}
            : {syncErrors[key]}
          </FieldError>
        ) : null,
      )}
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
        motion conventions. Units are part of each column name. Film sync is optional: the picture&apos;s
        frame rate, the timecode of its first frame, and how many frames the motion plays after the picture
        (negative: before).
      </p>
    </form>
  );
}
