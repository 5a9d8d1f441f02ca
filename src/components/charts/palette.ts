// Canvas colours for charts come from the app's Tailwind palette, so lines match badges and bars.
import tailwindConfig from '../../../tailwind.config';

const colors = tailwindConfig.theme.extend.colors;

/** Named chart colours (CSS colour strings). */
export const CHART_COLORS = {
  axis: colors.ink[600],
  grid: colors.ink[100],
  input: colors.ink[400],
  cued: colors.tealdeep[500],
  hard: colors.stop[500],
  comfort: colors.signal[400],
  stroke: colors.stop[700],
  series: [
    colors.tealdeep[500],
    colors.signal[600],
    colors.ink[800],
    colors.stop[500],
    colors.ink[400],
    colors.tealdeep[700],
  ],
} as const;

/** `#rrggbb` with an alpha from 0 to 1, as `rgba(...)`. */
export function withAlpha(hex: string, alpha: number): string {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) return hex;
  return `rgba(${parseInt(m[1] ?? '0', 16)}, ${parseInt(m[2] ?? '0', 16)}, ${parseInt(m[3] ?? '0', 16)}, ${alpha})`;
}
