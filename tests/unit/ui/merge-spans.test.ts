// How finding spans are drawn on a chart: spans of one kind that overlap or touch on screen become one
// band with one pair of edges; a selected span always stands alone; a one-instant finding keeps a sliver.
import { describe, expect, it } from 'vitest';
import { mergeSpans } from '../../../src/components/charts/band-chart';
import type { ChartSpan } from '../../../src/components/charts/band-chart';

// 10 px per second from t = 0: a stand-in for uPlot's valToPos on a 0–100 s axis 1000 px wide.
const toPx = (t: number) => 10 * t;
const comfort = (from: number, to: number, selected = false): ChartSpan => ({
  from,
  to,
  color: '#f2a93b',
  edge: 'dashed',
  selected,
});
const hard = (from: number, to: number): ChartSpan => ({ from, to, color: '#c2412d', edge: 'solid' });

describe('mergeSpans', () => {
  it('joins spans of one kind that overlap or lie within a pixel, and keeps apart those further off', () => {
    const drawn = mergeSpans(
      [comfort(10, 12), comfort(11.5, 13), comfort(13.05, 14), comfort(20, 21)],
      toPx,
      3,
    );
    expect(drawn.map(({ x0, x1 }) => [x0, x1])).toEqual([
      [100, 140],
      [200, 210],
    ]);
    expect(drawn[0]!.to).toBe(14);
  });

  it('never joins spans of different kinds, nor the selected span', () => {
    const drawn = mergeSpans(
      [comfort(10, 12), hard(11, 12.5), comfort(12, 13, true), comfort(12, 14)],
      toPx,
      3,
    );
    // Two comfort spans joined (10–12 and 12–14, touching), the hard one alone, the selected one alone and last.
    expect(drawn.map((d) => [d.color, d.x0, d.x1, d.selected ?? false])).toEqual([
      ['#f2a93b', 100, 140, false],
      ['#c2412d', 110, 125, false],
      ['#f2a93b', 120, 130, true],
    ]);
  });

  it('gives a finding at one instant a sliver of the minimum width', () => {
    expect(mergeSpans([hard(5, 5)], toPx, 3).map(({ x0, x1 }) => [x0, x1])).toEqual([[50, 53]]);
  });
});
