import { useMemo } from 'react';
import { BandChart } from '../../../components/charts/band-chart';
import type { ChartBand, ChartSpan } from '../../../components/charts/band-chart';
import { formatValue } from '../../../components/charts/format-units';
import { CHART_COLORS } from '../../../components/charts/palette';
import { ErrorNotice, Loading } from '../../../components/ui/status';
import { useRunSpectra } from '../api/get-run-spectra';
import type { RunSpectra as Spectra } from '../api/get-run-spectra';

// Ride motion and the sickness band sit far below this; the rest of the spectrum up to Nyquist is in the file.
const SHOWN_UP_TO_HZ = 5;
const AXES = ['x', 'y', 'z'] as const;

/** Frequencies and per-axis PSD lines up to SHOWN_UP_TO_HZ, floored above 0 for the log axis. */
export function spectraLines(spectra: Spectra): { f_hz: number[]; bands: ChartBand[] } {
  const count = Math.min(
    Math.floor(SHOWN_UP_TO_HZ / spectra.df_hz) + 1,
    ...AXES.map((axis) => spectra.axes[axis].psd.length),
  );
  const f_hz = Array.from({ length: count }, (_, k) => k * spectra.df_hz);
  let peak = 0;
  for (const axis of AXES)
    for (let k = 0; k < count; k++) peak = Math.max(peak, spectra.axes[axis].psd[k] ?? 0);
  // A log axis cannot show 0; eight decades below the peak is far under anything a rider feels.
  const floor = peak > 0 ? peak * 1e-8 : 1e-12;
  const colors = [CHART_COLORS.series[0], CHART_COLORS.series[1], CHART_COLORS.series[2]];
  const bands = AXES.map((axis, a) => {
    const values = spectra.axes[axis].psd.slice(0, count).map((v) => (v > floor ? v : floor));
    return {
      label: `${axis} (${spectra.axes[axis].seat})`,
      color: colors[a] ?? CHART_COLORS.cued,
      min: values,
      max: values,
    };
  });
  return { f_hz, bands };
}

/** Power spectral density of the rider's specific force per axis, with the motion-sickness band shaded. */
export function RunSpectra({ studioId, runId }: { studioId: string; runId: string }) {
  const spectra = useRunSpectra(studioId, runId, true);
  const lines = useMemo(() => (spectra.data ? spectraLines(spectra.data) : null), [spectra.data]);
  const band = useMemo<ChartSpan[]>(
    () =>
      spectra.data
        ? [{ from: spectra.data.band.low_hz, to: spectra.data.band.high_hz, color: CHART_COLORS.comfort }]
        : [],
    [spectra.data],
  );
  if (spectra.isPending) return <Loading what="Loading the spectra" />;
  if (spectra.isError) return <ErrorNotice error={spectra.error} retry={() => void spectra.refetch()} />;
  if (!lines) return null;
  const data = spectra.data;
  return (
    <div className="flex flex-col gap-2">
      <BandChart
        title={`Power spectral density up to ${SHOWN_UP_TO_HZ} Hz`}
        xLabel="Frequency (Hz)"
        yLabel="(m/s²)²/Hz"
        yLog
        x={lines.f_hz}
        bands={lines.bands}
        spans={band}
        height_px={300}
      />
      <p className="text-xs text-ink-600">
        Shaded: {data.band.low_hz}–{data.band.high_hz} Hz. {data.band.note} Share of power in that band:{' '}
        {AXES.map((axis) => `${axis} ${formatValue(data.axes[axis].bandShare * 100, 3)} %`).join(', ')}.{' '}
        {data.method}, {data.segments} segments of {data.segment_n} samples, Δf {formatValue(data.df_hz, 3)}{' '}
        Hz.
      </p>
    </div>
  );
}
