// The numbers of the finding the charts are brought to: what, where (seat, leg, axis), how far over
// (value, limit, ratio) and when (span, length, timecodes), with steps to the previous and next finding.
import type { ReactNode } from 'react';
import { CHECK_LABELS, TIER_LABELS, checkUnit, siUnit } from '../../../../shared/labels';
import type { Finding } from '../../../../shared/schemas/findings';
import type { FilmSync } from '../../../../shared/schemas/film-sync';
import { formatValue } from '../../../components/charts/format-units';
import { Button } from '../../../components/ui/button';
import { subjectText } from './budget-table';
import { runTimecode } from '../utils/film-time';

function Figure({ label, children, name }: { label: string; children: ReactNode; name: string }) {
  return (
    <div className="flex flex-col">
      <dt className="text-xs text-ink-600">{label}</dt>
      <dd className="font-mono text-sm text-ink-900" data-readout={name}>
        {children}
      </dd>
    </div>
  );
}

export function FindingReadout({
  finding,
  position,
  count,
  filmSync = null,
  onStep,
}: {
  finding: Finding | null;
  /** The finding's place in time order (0-based) and how many there are, for the steps. */
  position: number;
  count: number;
  filmSync?: FilmSync | null;
  onStep: (by: -1 | 1) => void;
}) {
  if (!finding) {
    return (
      <p className="text-xs text-ink-600" data-testid="finding-readout">
        {count > 0
          ? 'No finding selected: select one on the timeline or in the list to bring every chart to it.'
          : 'This take has no findings to step through.'}
      </p>
    );
  }
  const f = finding;
  const unit = f.unit ? siUnit(f.unit) : checkUnit(f.check);
  const hard = f.severity === 'hard';
  const timecodes = filmSync ? `${runTimecode(f.start_s, filmSync)}–${runTimecode(f.end_s, filmSync)}` : null;
  return (
    <div
      className={`flex flex-wrap items-center gap-x-5 gap-y-1 border-l-4 pl-3 ${hard ? 'border-stop-500' : 'border-signal-400'}`}
      data-testid="finding-readout"
      aria-live="polite"
    >
      <div className="flex flex-col">
        <span className={`text-xs font-semibold ${hard ? 'text-stop-700' : 'text-signal-600'}`}>
          {TIER_LABELS[f.severity]} · finding {position + 1} of {count}
        </span>
        <span className="text-sm font-semibold text-ink-900" data-readout="check">
          {CHECK_LABELS[f.check]}
          {f.row !== undefined ? ` row ${f.row}` : ''}, {subjectText(f)}
          {f.quantity ? ` (${f.quantity})` : ''}
        </span>
      </div>
      <dl className="flex flex-wrap gap-x-5 gap-y-1">
        <Figure label="Value" name="value">
          {formatValue(f.value)} {unit}
        </Figure>
        <Figure label="Limit" name="limit">
          {formatValue(f.limit)} {unit}
        </Figure>
        <Figure label="Ratio" name="ratio">
          {f.ratio.toFixed(3)} ×
        </Figure>
        <Figure label="Span" name="span">
          {f.start_s.toFixed(3)}–{f.end_s.toFixed(3)} s
          <span className="text-ink-600"> ({formatValue(f.end_s - f.start_s, 3)} s)</span>
          {timecodes ? <span className="block text-xs text-ink-600">TC {timecodes}</span> : null}
        </Figure>
        {f.totalOutside_s !== undefined ? (
          <Figure label="Outside this row, whole take" name="outside">
            {formatValue(f.totalOutside_s, 3)} s{f.excursions !== undefined ? `, ${f.excursions}×` : ''}
          </Figure>
        ) : null}
      </dl>
      <div className="flex gap-1">
        <Button size="sm" onClick={() => onStep(-1)} disabled={position <= 0}>
          Previous finding
        </Button>
        <Button size="sm" onClick={() => onStep(1)} disabled={position >= count - 1}>
          Next finding
        </Button>
      </div>
    </div>
  );
}
