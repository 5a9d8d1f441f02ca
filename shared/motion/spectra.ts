// Power spectral density by Welch's method (Welch 1967, IEEE Trans. Audio Electroacoust. 15(2)):
// periodic Hann window, 50 % overlap, each segment's mean removed, one-sided density in unit^2/Hz, so
// that the PSD summed over the bins times df equals the signal's variance (Parseval).
import FFT from 'fft.js';

/** The band where motion sickness is most provoked (docs/motion-conventions.md section 5), Hz. */
export const SICKNESS_BAND_HZ = { low: 0.1, high: 0.5 } as const;

export interface WelchPsd {
  rate_hz: number;
  /** Segment length in samples (a power of two). */
  segment_n: number;
  segments: number;
  df_hz: number;
  /** One-sided PSD at k * df_hz for k = 0 .. segment_n / 2, in unit^2/Hz. */
  psd: Float64Array;
}

/**
 * Segment length (power of two, samples) for a track of n samples at rate_hz: about 40 s, so the bins
 * (about 0.025 Hz apart) resolve the 0.1-0.5 Hz band, halved until at least three half-overlapping
 * segments fit. Returns 0 when the track is too short for a spectrum (fewer than 32 samples).
 */
export function welchSegmentLength(n: number, rate_hz: number): number {
  let seg = 16;
  while (seg < rate_hz * 40 && seg < 1 << 20) seg *= 2;
  while (seg > 16 && 2 * seg > n) seg /= 2;
  return n >= 2 * seg ? seg : 0;
}

/**
 * Welch PSD of signal[offset + i * stride], i < n, sampled at rate_hz (unit of the signal, squared, per
 * Hz). segment_n must be a power of two no longer than n; defaults to welchSegmentLength.
 */
export function welchPsd(
  signal: Float64Array,
  offset: number,
  stride: number,
  n: number,
  rate_hz: number,
  segment_n = welchSegmentLength(n, rate_hz),
): WelchPsd {
  const N = segment_n;
  if (!(N >= 2) || (N & (N - 1)) !== 0 || N > n) {
    throw new RangeError(`segment length ${N} must be a power of two between 2 and the ${n} samples`);
  }
  const fft = new FFT(N);
  const window = new Float64Array(N);
  let windowPower = 0;
  for (let k = 0; k < N; k++) {
    // Periodic (DFT-even) Hann: the overlapped windows then add up to a constant.
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * k) / N);
    window[k] = w;
    windowPower += w * w;
  }
  const seg = new Float64Array(N);
  const spectrum = new Float64Array(2 * N);
  const half = N / 2;
  const acc = new Float64Array(half + 1);
  const step = N / 2;
  let segments = 0;
  for (let start = 0; start + N <= n; start += step) {
    let mean = 0;
    for (let k = 0; k < N; k++) mean += signal[offset + (start + k) * stride] as number;
    mean /= N;
    for (let k = 0; k < N; k++)
      seg[k] = ((signal[offset + (start + k) * stride] as number) - mean) * (window[k] as number);
    fft.realTransform(spectrum, seg);
    for (let k = 0; k <= half; k++) {
      const re = spectrum[2 * k] as number;
      const im = spectrum[2 * k + 1] as number;
      acc[k] = (acc[k] as number) + re * re + im * im;
    }
    segments++;
  }
  const scale = 1 / (segments * rate_hz * windowPower);
  for (let k = 0; k <= half; k++) {
    // One-sided: every bin except DC and Nyquist also carries its negative-frequency twin.
    const twice = k === 0 || k === half ? 1 : 2;
    acc[k] = (acc[k] as number) * scale * twice;
  }
  return { rate_hz, segment_n: N, segments, df_hz: rate_hz / N, psd: acc };
}

/** Power (unit^2) in [low_hz, high_hz]: PSD times df over the bins whose centre lies in the band. */
export function bandPower(p: WelchPsd, low_hz: number, high_hz: number): number {
  let sum = 0;
  for (let k = 0; k < p.psd.length; k++) {
    const f = k * p.df_hz;
    if (f >= low_hz && f <= high_hz) sum += p.psd[k] as number;
  }
  return sum * p.df_hz;
}

/** Total power (unit^2): PSD summed over all bins times df; equals the variance of the signal. */
export function totalPower(p: WelchPsd): number {
  let sum = 0;
  for (let k = 0; k < p.psd.length; k++) sum += p.psd[k] as number;
  return sum * p.df_hz;
}

/** Frequency (Hz) of the largest PSD bin above DC. */
export function peakFrequency(p: WelchPsd): number {
  let best = 1;
  for (let k = 2; k < p.psd.length; k++) if ((p.psd[k] as number) > (p.psd[best] as number)) best = k;
  return best * p.df_hz;
}
