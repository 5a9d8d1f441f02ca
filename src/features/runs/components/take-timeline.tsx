// The take on one time axis across the page: each finding a mark in a lane of its check and subject,
// hard-limit lanes first, coloured and edged by tier. Selecting a mark zooms every chart to it.
import { useMemo, useRef } from 'react';
import type { KeyboardEvent } from 'react';
import { CHECK_LABELS, TIER_LABELS } from '../../../../shared/labels';
import type { Finding } from '../../../../shared/schemas/findings';
import type { XRange } from '../../../components/charts/band-chart';
import { subjectText } from './budget-table';
import { SpanKey } from './run-charts';
import { niceTicks, timelineLanes } from '../utils/finding-view';

const LABEL_WIDTH = 'w-40 shrink-0 lg:w-52';

const MARK_TONE = {
  hard: 'bg-stop-500 border-stop-700 border-solid',
  comfort: 'bg-signal-400 border-signal-600 border-dashed',
} as const;

/** "Rider jerk, x axis, comfort limit, 36.24–36.33 s, 1.33 × the limit": what a mark says to a screen reader. */
export function findingName(f: Finding): string {
  return `${CHECK_LABELS[f.check]}, ${subjectText(f)}${f.quantity ? ` (${f.quantity})` : ''}, ${TIER_LABELS[
    f.severity
  ].toLowerCase()}, ${f.start_s.toFixed(2)}–${f.end_s.toFixed(2)} s, ${f.ratio.toFixed(2)} × the limit`;
}

export function TakeTimeline({
  findings,
  range,
  view,
  selected,
  onSelect,
}: {
  findings: readonly Finding[];
  /** The take's whole time axis (s). */
  range: XRange;
  /** The window the charts show, outlined on the timeline; null, the whole take. */
  view: XRange | null;
  selected: number | null;
  onSelect: (index: number) => void;
}) {
  const span_s = Math.max(range.max - range.min, 1e-9);
  // Marks closer than 0.4 % of the take would touch: they go to separate rows of their lane.
  const lanes = useMemo(() => timelineLanes(findings, span_s * 0.004), [findings, span_s]);
  const ticks = useMemo(() => niceTicks(range.min, range.max, 12), [range.min, range.max]);
  const order = useMemo(
    () =>
      findings.map((f, i) => ({ f, i })).sort((a, b) => a.f.start_s - b.f.start_s || b.f.ratio - a.f.ratio),
    [findings],
  );
  const marks = useRef(new Map<number, HTMLButtonElement>());
  const pct = (t: number) => `${(((t - range.min) / span_s) * 100).toFixed(3)}%`;
  const tabStop = selected ?? order[0]?.i ?? null;

  // One tab stop for the whole timeline; the arrow keys step through the findings in time order.
  const onKey = (event: KeyboardEvent<HTMLButtonElement>, index: number) => {
    const k = order.findIndex((o) => o.i === index);
    const to =
      event.key === 'ArrowRight' || event.key === 'ArrowDown'
        ? k + 1
        : event.key === 'ArrowLeft' || event.key === 'ArrowUp'
          ? k - 1
          : event.key === 'Home'
            ? 0
            : event.key === 'End'
              ? order.length - 1
              : null;
    if (to === null) return;
    event.preventDefault();
    const next = order[Math.min(Math.max(to, 0), order.length - 1)];
    if (!next) return;
    onSelect(next.i);
    marks.current.get(next.i)?.focus();
  };

  return (
    <section
      className="flex flex-col gap-3 rounded border border-ink-200 bg-white p-4"
      aria-labelledby="take-timeline-title"
      data-testid="take-timeline"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="take-timeline-title" className="text-base font-semibold text-ink-900">
          Findings along the take
        </h2>
        <p className="flex flex-wrap items-center gap-3 text-xs text-ink-600">
          <SpanKey />
          <span>Select a mark (or use the arrow keys) to bring every chart to it.</span>
        </p>
      </div>
      {findings.length === 0 ? (
        <p className="text-sm text-ink-600">
          No findings: every check stayed below its limit over the whole take.
        </p>
      ) : null}
      <div className="flex flex-col">
        <div role="group" aria-label="Findings on the take's time axis" className="flex flex-col">
          {lanes.map((lane) => (
            <div key={lane.key} className="flex gap-x-3" data-lane={lane.key}>
              <div
                className={`${LABEL_WIDTH} flex flex-col justify-center border-t border-ink-100 py-1 text-xs leading-tight`}
              >
                <span className="font-medium text-ink-900">
                  {CHECK_LABELS[lane.first.check]}
                  {lane.first.row !== undefined ? (
                    <span className="text-ink-600"> row {lane.first.row}</span>
                  ) : null}
                </span>
                <span className={lane.severity === 'hard' ? 'text-stop-700' : 'text-signal-600'}>
                  {subjectText(lane.first)}
                  {lane.first.quantity ? ` (${lane.first.quantity})` : ''} · {TIER_LABELS[lane.severity]}
                </span>
              </div>
              <div className="relative min-w-0 flex-1 border-t border-ink-100 py-1">
                {lane.rows.map((row, r) => (
                  <div key={r} className="relative h-6">
                    {row.map((i) => {
                      const f = findings[i];
                      if (!f) return null;
                      const on = i === selected;
                      return (
                        <button
                          key={i}
                          ref={(el) => {
                            if (el) marks.current.set(i, el);
                            else marks.current.delete(i);
                          }}
                          type="button"
                          aria-label={findingName(f)}
                          aria-pressed={on}
                          title={findingName(f)}
                          tabIndex={i === tabStop ? 0 : -1}
                          onClick={() => onSelect(i)}
                          onKeyDown={(event) => onKey(event, i)}
                          data-finding={i}
                          className={`absolute top-1 h-4 min-w-2 -translate-x-px rounded-sm border ${MARK_TONE[f.severity]} ${
                            on
                              ? 'z-10 -top-0 h-6 ring-2 ring-ink-900 ring-offset-1'
                              : 'hover:ring-1 hover:ring-ink-800'
                          }`}
                          style={{
                            left: pct(Math.min(f.start_s, f.end_s)),
                            width: `${((Math.abs(f.end_s - f.start_s) / span_s) * 100).toFixed(3)}%`,
                          }}
                        />
                      );
                    })}
                  </div>
                ))}
              </div>
            </div>
          ))}
        </div>
        <div className="flex gap-x-3" aria-hidden="true">
          <div className={LABEL_WIDTH} />
          <div className="relative h-6 min-w-0 flex-1 border-t border-ink-400">
            {ticks.map((t) => (
              <span
                key={t}
                className="absolute top-0 -translate-x-1/2 pt-1 font-mono text-xs text-ink-600 before:absolute before:top-0 before:left-1/2 before:h-1 before:border-l before:border-ink-400"
                style={{ left: pct(t) }}
              >
                {t}
              </span>
            ))}
          </div>
        </div>
        <p className="text-right text-xs text-ink-600">Time (s)</p>
      </div>
      {view ? (
        <p className="sr-only" aria-live="polite">
          The charts show {view.min.toFixed(2)} to {view.max.toFixed(2)} s.
        </p>
      ) : null}
      <ViewOutline range={range} view={view} />
    </section>
  );
}

/** A strip under the axis showing which part of the take the charts show. */
function ViewOutline({ range, view }: { range: XRange; view: XRange | null }) {
  const span_s = Math.max(range.max - range.min, 1e-9);
  const from = Math.max(view?.min ?? range.min, range.min);
  const to = Math.min(view?.max ?? range.max, range.max);
  return (
    <div className="flex items-center gap-x-3">
      <span className={`${LABEL_WIDTH} text-xs text-ink-600`}>Charts show</span>
      <div className="relative h-2 min-w-0 flex-1 rounded-sm bg-ink-100" data-testid="timeline-view">
        <span
          className={`absolute inset-y-0 rounded-sm ${view ? 'bg-tealdeep-600' : 'bg-ink-400'}`}
          style={{
            left: `${(((from - range.min) / span_s) * 100).toFixed(3)}%`,
            width: `max(3px, ${(((to - from) / span_s) * 100).toFixed(3)}%)`,
          }}
        />
      </div>
    </div>
  );
}
