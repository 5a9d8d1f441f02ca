// Takes the browser tests upload, made here so every walk uses the same fictional motion.

// Standard gravity, 3rd CGPM (1901): a level vehicle at rest feels +g0 on z (docs/motion-conventions.md section 3).
const G0_MPS2 = 9.80665;

/**
 * A fictional 20 s vehicle take at 100 Hz: gentle surge (0.2 Hz, up to 0.6 m/s^2) and heave
 * (0.5 Hz, up to 0.3 m/s^2) faded in and out by a raised-cosine window, so it starts and ends at rest.
 */
export function gentleVehicleCsv(duration_s = 20, rate_hz = 100): string {
  const lines = ['time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps,wz_radps'];
  const n = Math.round(duration_s * rate_hz);
  for (let i = 0; i <= n; i++) {
    const t = i / rate_hz;
    const window = 0.5 - 0.5 * Math.cos((2 * Math.PI * t) / duration_s);
    const fx = 0.6 * window * Math.sin(2 * Math.PI * 0.2 * t);
    const fz = G0_MPS2 + 0.3 * window * Math.sin(2 * Math.PI * 0.5 * t);
    lines.push(`${t.toFixed(2)},${fx.toFixed(5)},0,${fz.toFixed(5)},0,0,0`);
  }
  return `${lines.join('\n')}\n`;
}
