import { useState } from 'react';
import type { ChangeEvent, FormEvent } from 'react';
import type { ControllerOutput, RampProfile } from '../../../../shared/schemas/controller-output';
import type { VenueDetail } from '../../../../shared/schemas/pipeline';
import { Button } from '../../../components/ui/button';
import { issuesByField, TextField } from '../../../components/ui/form';
import { ErrorNotice, Notice } from '../../../components/ui/status';
import { ApiRequestError } from '../../../lib/api-client';
import { useUpdateVenueController } from '../api/update-venue-controller';

const PROFILE_LABELS: Record<RampProfile, string> = {
  quintic: 'Quintic from rest (meets the show in position, speed and acceleration)',
  raisedCosine: 'Raised cosine (meets the show in position only)',
};

/** One line saying how the venue's controller takes its track, for members who cannot change it. */
export function describeController(c: ControllerOutput): string {
  const ramp =
    c.ramp.duration_s > 0
      ? `ramps of ${c.ramp.duration_s} s from and to neutral (${c.ramp.profile === 'quintic' ? 'quintic' : 'raised cosine'})`
      : 'no ramps from neutral';
  const enc = c.encoder
    ? `encoder counts at ${c.encoder.countsPerMm} per mm, zero offset ${c.encoder.zeroOffset_counts}`
    : 'millimetres only';
  return `${ramp}; ${enc}.`;
}

// A number field's text as sent: a number when it reads as one, else the text itself, so the server
// names the field that is wrong instead of the form guessing.
const asNumber = (text: string): number | string => {
  const t = text.trim();
  return t !== '' && Number.isFinite(Number(t)) ? Number(t) : t;
};

/** Edits how the venue's controller takes its track: the ramps from and to neutral and encoder counts. */
export function ControllerForm({ studioId, venue }: { studioId: string; venue: VenueDetail }) {
  const c = venue.controller;
  const [duration, setDuration] = useState(String(c.ramp.duration_s));
  const [profile, setProfile] = useState<RampProfile>(c.ramp.profile);
  const [useEncoder, setUseEncoder] = useState(c.encoder !== undefined);
  const [countsPerMm, setCountsPerMm] = useState(String(c.encoder?.countsPerMm ?? ''));
  const [zeroOffset, setZeroOffset] = useState(String(c.encoder?.zeroOffset_counts ?? 0));
  const [saved, setSaved] = useState(false);
  const update = useUpdateVenueController(studioId, venue.id);
  // One message per field path the server named (ramp.duration_s, encoder.countsPerMm, ...).
  const errors: Record<string, string> =
    update.error instanceof ApiRequestError ? issuesByField(update.error.issues, 'path') : {};
  const edited = () => setSaved(false);
  /** A text field's change handler: keeps the text and marks the form as edited. */
  const typed = (set: (v: string) => void) => (e: ChangeEvent<HTMLInputElement>) => {
    set(e.target.value);
    edited();
  };

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setSaved(false);
    update.mutate(
      {
        studioId,
        venueId: venue.id,
        controller: {
          ramp: { duration_s: asNumber(duration), profile },
          ...(useEncoder
            ? { encoder: { countsPerMm: asNumber(countsPerMm), zeroOffset_counts: asNumber(zeroOffset) } }
            : {}),
        },
      },
      { onSuccess: () => setSaved(true) },
    );
  };

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={`Controller output of ${venue.name}`}
      className="flex max-w-xl flex-col gap-3"
    >
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField
          label="Ramp length (s)"
          inputMode="decimal"
          value={duration}
          onChange={typed(setDuration)}
          error={errors['ramp.duration_s']}
          hint="From neutral at rest into the first pose, and from the last pose back; 0 for none (default 3 s)."
        />
        <div className="flex flex-col gap-1">
          <label htmlFor="ramp-profile" className="text-xs font-medium text-ink-600">
            Ramp shape
          </label>
          <select
            id="ramp-profile"
            value={profile}
            onChange={(e) => {
              setProfile(e.target.value as RampProfile);
              edited();
            }}
            className="rounded border border-ink-200 bg-white px-2 py-1.5 text-sm text-ink-900"
          >
            {(Object.keys(PROFILE_LABELS) as RampProfile[]).map((p) => (
              <option key={p} value={p}>
                {PROFILE_LABELS[p]}
              </option>
            ))}
          </select>
          {errors['ramp.profile'] ? <p className="text-xs text-stop-700">{errors['ramp.profile']}</p> : null}
        </div>
      </div>
      <label className="flex items-center gap-2 text-sm text-ink-800">
        <input
          type="checkbox"
          checked={useEncoder}
          onChange={(e) => {
            setUseEncoder(e.target.checked);
            edited();
          }}
        />
        The controller takes encoder counts as well as millimetres
      </label>
      {useEncoder ? (
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField
            label="Counts per mm"
            inputMode="decimal"
            value={countsPerMm}
            onChange={typed(setCountsPerMm)}
            error={errors['encoder.countsPerMm']}
            hint="From the actuator's data sheet."
          />
          <TextField
            label="Zero offset (counts)"
            inputMode="numeric"
            value={zeroOffset}
            onChange={typed(setZeroOffset)}
            error={errors['encoder.zeroOffset_counts']}
            hint="Counts at the fully retracted length: counts = round(mm × counts per mm + offset)."
          />
        </div>
      ) : null}
      {update.error ? <ErrorNotice error={update.error} /> : null}
      {saved ? <Notice>Controller settings saved; new runs use them.</Notice> : null}
      <div>
        <Button type="submit" variant="primary" busy={update.isPending}>
          Save controller settings
        </Button>
      </div>
      <p className="text-xs text-ink-400">
        Each run records these settings when it is queued: its ramps are solved and checked with the show, and
        its release package carries the counts. Runs already made keep theirs; cue a take again to use new
        ones.
      </p>
      <p className="text-xs text-ink-400">
        The ramps keep the files from starting or ending away from neutral; they are not an emergency stop or
        a park sequence. Confirm the counts, the zero and the ramps with the ride manufacturer before the
        track runs on the platform.
      </p>
    </form>
  );
}
