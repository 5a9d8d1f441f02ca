// Canvas colours for charts come from the app's Tailwind palette, so lines match badges and bars.
import tailwindConfig from '../../../tailwind.config';

const colors = tailwindConfig.theme.extend.colors;

/** Named chart colours (CSS colour strings). */
export const CHART_COLORS = {
  axis: colors.ink[600],
  grid: colors.ink[100],
  // The vehicle's input in a light slate behind the cue, so the two never read as one line.
  input: '#8796a8',
  cued: colors.tealdeep[500],
  hard: colors.stop[500],
  comfort: colors.signal[400],
  stroke: colors.stop[700],
  // Seats (rider reference points) in the 3-D views.
  seat: '#7446b8',
  // Six lines told apart by hue and lightness (legs, pose axes). No red and no amber: those mean a
  // hard-limit and a comfort finding on every chart.
  series: [colors.tealdeep[500], '#2f5fb3', colors.signal[600], '#7446b8', colors.ink[800], '#5e7d1a'],
} as const;

/** `#rrggbb` with an alpha from 0 to 1, as `rgba(...)`. */
export function withAlpha(hex: string, alpha: number): string {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) return hex;
  return `rgba(${parseInt(m[1] ?? '0', 16)}, ${parseInt(m[2] ?? '0', 16)}, ${parseInt(m[3] ?? '0', 16)}, ${alpha})`;
}
