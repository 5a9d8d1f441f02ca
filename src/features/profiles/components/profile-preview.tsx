import { Button } from '../../../components/ui/button';
import { useEffect, useId, useMemo, useState } from 'react';
import { CHECK_LABELS, subjectLabel } from '../../../../shared/labels';
import { budgetSchema } from '../../../../shared/schemas/budget';
import type { Budget } from '../../../../shared/schemas/budget';
import type { CueingProfile } from '../../../../shared/schemas/cueing-profile';
import { parseMotionBase } from '../../../../shared/schemas/motion-base';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import type { Take } from '../../../../shared/schemas/pipeline';
import type { Use } from '../../../../shared/schemas/findings';
import { BandChart } from '../../../components/charts/band-chart';
import type { ChartBand } from '../../../components/charts/band-chart';
import { CHART_COLORS } from '../../../components/charts/palette';
import { UseRatioBar } from '../../../components/charts/run-badges';
import { ErrorNotice, Loading } from '../../../components/ui/status';
import { useProfiles } from '../../../lib/queries/profiles';
import { useVenue, useVenues } from '../../../lib/queries/venues';
import { usePreviewRun, usePreviewTrack, usePreviewTracks } from '../api/get-preview-sources';
import { useProfilePreview } from '../hooks/use-profile-preview';
import { readTakeFile, trackFromRunSeries } from './preview-take';
import type { PreviewTakeData } from './preview-take';

/** The take and venue the preview runs on, which "cue again" uses too. */
export interface PreviewChoice {
  takeId: string;
  takeNumber: number;
  venueId: string;
  venueName: string;
}

const DEG = 180 / Math.PI;
const FINISHED = new Set([
  'awaiting_review',
  'held_by_budget',
  'cleared',
  'held',
  'released',
  'withdrawn',
  'superseded',
]);

function Select({
  label,
  value,
  onChange,
  options,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  options: readonly { value: string; label: string }[];
}) {
  const id = useId();
  return (
    <div className="flex min-w-0 flex-col gap-0.5">
      <label htmlFor={id} className="text-xs font-medium text-ink-700">
        {label}
      </label>
      <select
        id={id}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        className="min-w-0 rounded border border-ink-200 bg-white px-1.5 py-1 text-sm"
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

function fmt(v: number, digits = 2): string {
  return v.toFixed(digits);
}

function UsesList({
  strokeUse,
  checks,
  checksBusy,
  checksError,
  hasBudget,
}: {
  strokeUse: readonly number[];
  checks: readonly Use[] | null;
  checksBusy: boolean;
  checksError: string | null;
  hasBudget: boolean;
}) {
  const uses: { key: string; label: string; ratio: number }[] = checks
    ? [...checks]
        .sort((a, b) => b.ratio - a.ratio)
        .map((u, i) => ({
          key: `${u.check}-${u.subject}-${u.axis ?? ''}-${i}`,
          label: `${CHECK_LABELS[u.check]} · ${subjectLabel(u.subject)}${u.axis && u.axis !== u.subject ? ` ${u.axis}` : ''}`,
          ratio: u.ratio,
        }))
    : strokeUse.map((r, i) => ({
        key: `stroke-${i}`,
        label: `${CHECK_LABELS.stroke} · Leg ${i + 1}`,
        ratio: r,
      }));
  return (
    <section
      aria-label="Budget use"
      className="flex flex-col gap-1.5"
      data-checks={checks ? 'done' : 'pending'}
    >
      <h4 className="text-xs font-semibold text-ink-900">
        Budget use (worst value / limit){' '}
        <span className="font-normal text-ink-500">
          {checks
            ? checksBusy
              ? '· updating the checks…'
              : '· every check of the venue’s budget, as a run would record it'
            : hasBudget
              ? '· stroke now; the other checks follow (about a second)'
              : '· stroke only: the venue has no budget profile'}
        </span>
      </h4>
      {checksError ? <p className="text-xs text-stop-700">{checksError}</p> : null}
      <ul className="flex max-h-72 flex-col gap-0.5 overflow-y-auto pr-1">
        {uses.map((u) => (
          <li key={u.key} className="flex items-center justify-between gap-2 text-xs text-ink-800">
            <span className="truncate">{u.label}</span>
            <UseRatioBar ratio={u.ratio} label={u.label} />
          </li>
        ))}
      </ul>
    </section>
  );
}

/**
 * The live preview beside the cueing profile form: pick a track, a vehicle take and a venue; each
 * change of the profile is recomputed in a Web Worker with the shared motion code (the cue, the seat
 * specific force, the leg lengths) and the budget's checks follow from a second worker.
 */
export function ProfilePreview({
  studioId,
  profile,
  stale,
  onChoice,
}: {
  studioId: string;
  profile: CueingProfile | null;
  /** True while the form has problems: the preview then shows the last profile without any. */
  stale: boolean;
  onChoice: (choice: PreviewChoice | null) => void;
}) {
  const tracks = usePreviewTracks(studioId);
  const [trackId, setTrackId] = useState<string | null>(null);
  const firstTrack = tracks.data?.items[0]?.id ?? null;
  const chosenTrack = trackId ?? firstTrack;
  const track = usePreviewTrack(studioId, chosenTrack);
  const vehicleTakes = useMemo(
    () => (track.data?.takes ?? []).filter((t) => t.kind === 'vehicle').sort((a, b) => b.number - a.number),
    [track.data],
  );
  const [takeId, setTakeId] = useState<string | null>(null);
  const take: Take | undefined = vehicleTakes.find((t) => t.id === takeId) ?? vehicleTakes[0];
  const venues = useVenues(studioId);
  const [venueId, setVenueId] = useState<string | null>(null);
  const chosenVenue = venueId ?? venues.data?.[0]?.id ?? null;
  const venue = useVenue(studioId, chosenVenue ?? '');
  const budgets = useProfiles(studioId, 'budget');

  const base: MotionBase | null = useMemo(() => {
    if (!venue.data) return null;
    try {
      return parseMotionBase(venue.data.base);
    } catch {
      return null;
    }
  }, [venue.data]);
  const ramp = venue.data?.controller.ramp ?? null;
  const budget: Budget | null = useMemo(() => {
    const id = venue.data?.budgetVersion?.id;
    if (!id || !budgets.data) return null;
    for (const p of budgets.data) {
      const v = p.versions.find((x) => x.id === id);
      if (v) {
        const r = budgetSchema.safeParse(v.params);
        return r.success ? r.data : null;
      }
    }
    return null;
  }, [venue.data, budgets.data]);

  // The take's samples: the latest finished run of the take (at the chosen venue first), or its file.
  const runs = (track.data?.runs ?? []).filter((r) => take && r.takeId === take.id && FINISHED.has(r.state));
  const run = runs.find((r) => r.venueId === chosenVenue) ?? runs[0] ?? null;
  const runData = usePreviewRun(studioId, run?.id ?? null);
  const [fileData, setFileData] = useState<{ takeId: string; data: PreviewTakeData } | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const fromRun = useMemo(
    () => (runData.data ? trackFromRunSeries(runData.data.series, runData.data.detail) : null),
    [runData.data],
  );
  const data = fileData && take && fileData.takeId === take.id ? fileData.data : fromRun;
  const takeKey = data && take ? `${take.id}:${data.fullRate ? 'file' : (run?.id ?? '')}` : null;

  useEffect(() => {
    const name = venue.data?.name;
    onChoice(
      take && chosenVenue && name
        ? { takeId: take.id, takeNumber: take.number, venueId: chosenVenue, venueName: name }
        : null,
    );
  }, [take, chosenVenue, venue.data?.name, onChoice]);

  const preview = useProfilePreview({
    takeKey,
    track: data?.track ?? null,
    base,
    ramp,
    budget,
    profile,
  });
  const out = preview.motion;
  const busy = preview.motionBusy;
  const fileId = useId();

  const [fetching, setFetching] = useState(false);
  /** The take's stored file, fetched and read in the browser exactly as a file opened from disk. */
  const loadStoredFile = async () => {
    if (!take) return;
    setFileError(null);
    setFetching(true);
    try {
      const answer = await fetch(
        `/api/studios/${encodeURIComponent(studioId)}/takes/${encodeURIComponent(take.id)}/file`,
        { credentials: 'same-origin' },
      );
      if (!answer.ok) throw new Error(`The take's file could not be loaded (HTTP ${answer.status}).`);
      await openFile(
        new File([await answer.blob()], take.fileName),
        'loaded from Legwork and read in the browser',
      );
    } catch (e) {
      setFileError(e instanceof Error ? e.message : String(e));
    } finally {
      setFetching(false);
    }
  };

  const openFile = async (file: File | undefined, origin = 'read in the browser') => {
    setFileError(null);
    if (!file || !take) return;
    try {
      const { track: t, sha256 } = await readTakeFile(file);
      if (t.kind !== 'vehicle') throw new Error(`${file.name} is not a vehicle take`);
      const same = sha256 === take.sha256;
      setFileData({
        takeId: take.id,
        data: {
          track: t,
          fullRate: true,
          source:
            `${file.name}: ${t.length} samples ${origin}` +
            (same
              ? `, the same bytes as take ${take.number} (SHA-256 matches).`
              : `. Its SHA-256 differs from take ${take.number}'s: it is another file.`),
        },
      });
    } catch (e) {
      setFileError(e instanceof Error ? e.message : String(e));
    }
  };

  // The chart bands change only with a new answer: built once per answer, so a re-render for a keystroke
  // in the form (before the new answer arrives) keeps every chart as it is instead of rebuilding it.
  const charts = useMemo(() => {
    if (!out) return null;
    const bandsOf = (
      keys: readonly ['x_m' | 'roll_rad', 'y_m' | 'pitch_rad', 'z_m' | 'yaw_rad'],
      labels: string[],
    ): ChartBand[] =>
      keys.map((k, i) => ({
        label: labels[i] ?? k,
        color: CHART_COLORS.series[i] ?? CHART_COLORS.cued,
        min: out.series.pose[k].min,
        max: out.series.pose[k].max,
      }));
    return {
      x: out.series.time_s,
      position: bandsOf(['x_m', 'y_m', 'z_m'], ['x', 'y', 'z']),
      attitude: bandsOf(['roll_rad', 'pitch_rad', 'yaw_rad'], ['roll', 'pitch', 'yaw']),
      seat: (['x', 'y', 'z'] as const).map((a, i) => ({
        label: `f${a}`,
        color: CHART_COLORS.series[i] ?? CHART_COLORS.cued,
        min: out.series.seatForce[a].min,
        max: out.series.seatForce[a].max,
      })),
      legs: out.series.legs.map((b, i) => ({
        label: `leg ${i + 1}`,
        color: CHART_COLORS.series[i % CHART_COLORS.series.length] ?? CHART_COLORS.cued,
        min: b.min,
        max: b.max,
      })),
      strokeLines: [
        { value: out.series.stroke.low_m, label: 'stroke band low', color: CHART_COLORS.stroke },
        { value: out.series.stroke.high_m, label: 'stroke band high', color: CHART_COLORS.stroke },
        { value: out.series.stroke.mid_m, label: 'mid-stroke', color: CHART_COLORS.axis, thin: true },
      ],
    };
  }, [out]);

  return (
    <section
      aria-label="Live preview"
      className="flex min-w-0 flex-col gap-3 rounded border border-ink-200 bg-white p-3 xl:sticky xl:top-2 xl:self-start"
      data-state={preview.error ? 'error' : !out ? 'empty' : busy ? 'computing' : 'ready'}
      data-generation={preview.motionGeneration}
      data-peak-pitch-deg={out ? fmt(out.peaks.pose.pitch_rad * DEG, 3) : undefined}
      data-peak-x-mm={out ? fmt(out.peaks.pose.x_m * 1000, 2) : undefined}
    >
      <div className="flex flex-col gap-1">
        <h3 className="text-sm font-semibold text-ink-900">Live preview</h3>
        <p className="text-xs text-signal-800">
          Caution: a preview for tuning only. Motion systems can injure riders and staff; what a base plays is
          a run checked against the venue’s budget, cleared by a safety reviewer and released, within the ride
          maker’s limits and the applicable codes.
        </p>
      </div>
      {tracks.isPending || venues.isPending ? <Loading what="Loading tracks and venues" /> : null}
      {tracks.isError ? <ErrorNotice error={tracks.error} /> : null}
      <div className="grid grid-cols-1 gap-2 sm:grid-cols-3">
        <Select
          label="Track"
          value={chosenTrack ?? ''}
          onChange={(v) => (setTrackId(v), setTakeId(null))}
          options={(tracks.data?.items ?? []).map((t) => ({ value: t.id, label: t.title }))}
        />
        <Select
          label="Vehicle take"
          value={take?.id ?? ''}
          onChange={setTakeId}
          options={vehicleTakes.map((t) => ({
            value: t.id,
            label: `Take ${t.number} · ${t.duration_s.toFixed(0)} s`,
          }))}
        />
        <Select
          label="Venue (motion base)"
          value={chosenVenue ?? ''}
          onChange={setVenueId}
          options={(venues.data ?? []).map((v) => ({ value: v.id, label: v.name }))}
        />
      </div>
      {track.data && vehicleTakes.length === 0 ? (
        <p className="text-xs text-ink-600">
          This track has no vehicle take; a cueing profile changes vehicle takes only.
        </p>
      ) : null}
      {take ? (
        <div className="flex flex-col gap-1 text-xs text-ink-700">
          {data ? <p data-source={data.fullRate ? 'file' : 'series'}>Samples: {data.source}</p> : null}
          {!data && !run ? (
            <p>Take {take.number} has no finished run to read its motion from: open its file.</p>
          ) : null}
          {runData.isPending && run && !data ? <Loading what="Loading the take's samples" /> : null}
          <div className="flex flex-wrap items-center gap-2">
            <Button size="sm" busy={fetching} onClick={() => void loadStoredFile()}>
              Load take {take.number}’s file from Legwork (full rate)
            </Button>
            <label htmlFor={fileId} className="font-medium">
              or open a take file from disk:
            </label>
            <input
              id={fileId}
              type="file"
              accept=".csv,.gz,text/csv"
              onChange={(e) => void openFile(e.target.files?.[0])}
              className="text-xs"
            />
          </div>
          {fileError ? <p className="text-stop-700">{fileError}</p> : null}
        </div>
      ) : null}
      {venue.data && !base ? (
        <p className="text-xs text-stop-700">This venue’s motion base cannot be read.</p>
      ) : null}
      {preview.error ? (
        <p className="text-xs text-stop-700" role="alert">
          Preview: {preview.error}
        </p>
      ) : null}
      {stale && out ? (
        <p className="text-xs text-signal-800">
          Showing the last profile without problems; fix the fields marked to update.
        </p>
      ) : null}
      {out && charts ? (
        <>
          <p className="text-xs text-ink-600" aria-live="polite">
            {busy
              ? 'Updating…'
              : `${out.samples.toLocaleString('en')} samples at ${out.rate_hz} Hz, computed in ${Math.round(preview.motionMs ?? 0)} ms`}
          </p>
          <dl className="grid grid-cols-3 gap-x-3 gap-y-1 text-xs sm:grid-cols-6" aria-label="Peaks">
            {(
              [
                ['x', out.peaks.pose.x_m * 1000, 'mm'],
                ['y', out.peaks.pose.y_m * 1000, 'mm'],
                ['z', out.peaks.pose.z_m * 1000, 'mm'],
                ['roll', out.peaks.pose.roll_rad * DEG, '°'],
                ['pitch', out.peaks.pose.pitch_rad * DEG, '°'],
                ['yaw', out.peaks.pose.yaw_rad * DEG, '°'],
              ] as const
            ).map(([k, v, u]) => (
              <div key={k} className="flex flex-col">
                <dt className="text-ink-500">peak {k}</dt>
                <dd className="font-mono text-ink-900" data-peak={k}>
                  {fmt(v, 1)} {u}
                </dd>
              </div>
            ))}
          </dl>
          <BandChart
            title="Platform position (pose offset)"
            yLabel="mm"
            x={charts.x}
            scale={1000}
            bands={charts.position}
            height_px={150}
            syncKey="profile-preview"
          />
          <BandChart
            title="Platform attitude (pose offset)"
            yLabel="°"
            x={charts.x}
            scale={DEG}
            bands={charts.attitude}
            height_px={150}
            syncKey="profile-preview"
          />
          <BandChart
            title="Seat 1 specific force (platform frame, before the rider low-pass)"
            yLabel="m/s²"
            x={charts.x}
            bands={charts.seat}
            height_px={150}
            syncKey="profile-preview"
          />
          <BandChart
            title="Leg lengths"
            yLabel="m"
            x={charts.x}
            bands={charts.legs}
            lines={charts.strokeLines}
            height_px={170}
            syncKey="profile-preview"
          />
          <UsesList
            strokeUse={out.strokeUse}
            checks={preview.checks?.uses ?? null}
            checksBusy={preview.checksBusy}
            checksError={preview.checksError}
            hasBudget={budget !== null}
          />
        </>
      ) : null}
    </section>
  );
}
