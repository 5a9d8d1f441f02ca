// How each compared run is drawn: a colour from the Okabe-Ito palette (Okabe and Ito, "Color
// Universal Design", 2008: eight colours told apart with the common colour-vision deficiencies) and a
// line dash of its own, so a run is still told apart in grey print or by a reader who sees no colour.

export interface RunStyle {
  color: string;
  /** Canvas dash pattern in CSS pixels ([] for a solid line). */
  dash: number[];
  /** The dash as words, for the legend's text alternative. */
  dashName: string;
}

export const RUN_STYLES: readonly RunStyle[] = [
  { color: '#0072B2', dash: [], dashName: 'solid' },
  { color: '#D55E00', dash: [9, 4], dashName: 'dashed' },
  { color: '#009E73', dash: [2, 3], dashName: 'dotted' },
  { color: '#CC79A7', dash: [10, 3, 2, 3], dashName: 'dash-dot' },
];

export function runStyle(k: number): RunStyle {
  return RUN_STYLES[k % RUN_STYLES.length] ?? { color: '#000000', dash: [], dashName: 'solid' };
}
