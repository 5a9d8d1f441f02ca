import { CHECK_LABELS, checkUnit, siUnit } from '../../../../shared/labels';
import type { Finding } from '../../../../shared/schemas/findings';
import { formatValue } from '../../../components/charts/format-units';
import { UseRatioBar } from '../../../components/charts/run-badges';
import { Empty } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { SeverityText, subjectText } from './budget-table';
import type { FilmSync } from '../../../../shared/schemas/film-sync';
import { runTimecode } from '../utils/film-time';

/**
 * The checks at or over their limit, in time order, with the span a plot marks. With `onSelect`, each
 * finding's check is a button that selects it (its index into `findings`).
 */
export function FindingsTable({
  findings,
  filmSync = null,
  selected = null,
  onSelect,
}: {
  findings: readonly Finding[];
  /** With film sync, each span also shows the picture's timecodes. */
  filmSync?: FilmSync | null;
  selected?: number | null;
  onSelect?: (index: number) => void;
}) {
  if (findings.length === 0) return <Empty>No findings: every check stayed below its limit.</Empty>;
  const sorted = findings
    .map((f, index) => ({ f, index }))
    .sort((a, b) => a.f.start_s - b.f.start_s || b.f.ratio - a.f.ratio);
  return (
    <Table caption="Findings">
      <thead>
        <tr>
          <Th>Finding</Th>
          <Th>{filmSync ? 'Span (s, timecode)' : 'Span (s)'}</Th>
          <Th className="text-right">Value / limit</Th>
          <Th>Ratio</Th>
        </tr>
      </thead>
      <tbody>
        {sorted.map(({ f, index }) => {
          const unit = f.unit ? siUnit(f.unit) : checkUnit(f.check);
          const on = index === selected;
          return (
            <tr
              key={`${f.check}-${f.subject}-${f.start_s}-${index}`}
              className={on ? 'bg-ink-50 outline-2 -outline-offset-2 outline-ink-800' : undefined}
              aria-current={on ? 'true' : undefined}
            >
              <Td className="text-xs">
                {onSelect ? (
                  <button
                    type="button"
                    onClick={() => onSelect(index)}
                    aria-pressed={on}
                    aria-label={`Show ${CHECK_LABELS[f.check]}, ${subjectText(f)}, ${f.start_s.toFixed(2)}–${f.end_s.toFixed(2)} s`}
                    className="text-left font-medium text-tealdeep-700 underline decoration-dotted underline-offset-2 hover:decoration-solid"
                  >
                    {CHECK_LABELS[f.check]}
                  </button>
                ) : (
                  <span className="font-medium">{CHECK_LABELS[f.check]}</span>
                )}
                {f.row !== undefined ? <span className="text-ink-600"> row {f.row}</span> : null}
                <span className="block">
                  <span className="whitespace-nowrap">{subjectText(f)}</span>
                  {f.quantity !== undefined ? ` (${f.quantity})` : null} ·{' '}
                  <span className="whitespace-nowrap">
                    <SeverityText severity={f.severity} />
                  </span>
                </span>
              </Td>
              <Td className="font-mono text-xs whitespace-nowrap">
                {f.start_s.toFixed(2)}–{f.end_s.toFixed(2)}
                {filmSync ? (
                  <span className="block text-ink-600">
                    {runTimecode(f.start_s, filmSync)}–{runTimecode(f.end_s, filmSync)}
                  </span>
                ) : null}
              </Td>
              <Td className="text-right font-mono text-xs whitespace-nowrap">
                {formatValue(f.value)} {unit}
                <span className="block text-ink-600">
                  of {formatValue(f.limit)} {unit}
                </span>
              </Td>
              <Td>
                <UseRatioBar ratio={f.ratio} label={`${CHECK_LABELS[f.check]}, ${subjectText(f)}`} />
              </Td>
            </tr>
          );
        })}
      </tbody>
    </Table>
  );
}
