import { CHECK_LABELS, checkUnit, siUnit } from '../../../../shared/labels';
import type { Finding } from '../../../../shared/schemas/findings';
import { formatValue } from '../../../components/charts/format-units';
import { UseRatioBar } from '../../../components/charts/run-badges';
import { Empty } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { SeverityText, subjectText } from './budget-table';
import type { FilmSync } from '../../../../shared/schemas/film-sync';
import { runTimecode } from '../utils/film-time';

/** The checks at or over their limit, in time order, with the span a plot marks. */
export function FindingsTable({
  findings,
  filmSync = null,
}: {
  findings: readonly Finding[];
  /** With film sync, each span also shows the picture's timecodes. */
  filmSync?: FilmSync | null;
}) {
  if (findings.length === 0) return <Empty>No findings: every check stayed below its limit.</Empty>;
  const sorted = [...findings].sort((a, b) => a.start_s - b.start_s || b.ratio - a.ratio);
  return (
    <Table caption="Findings">
      <thead>
        <tr>
          <Th>Check</Th>
          <Th>Subject</Th>
          <Th>{filmSync ? 'Span (s, timecode)' : 'Span (s)'}</Th>
          <Th className="text-right">Value</Th>
          <Th className="text-right">Limit</Th>
          <Th>Ratio</Th>
          <Th>Tier</Th>
        </tr>
      </thead>
      <tbody>
        {sorted.map((f, i) => (
          <tr key={`${f.check}-${f.subject}-${f.start_s}-${i}`}>
            <Td className="text-xs">
              {CHECK_LABELS[f.check]}
              {f.row !== undefined ? <span className="text-ink-400"> row {f.row}</span> : null}
            </Td>
            <Td className="text-xs">
              {subjectText(f)}
              {f.quantity !== undefined ? ` (${f.quantity})` : null}
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
              {formatValue(f.value)} {f.unit ? siUnit(f.unit) : checkUnit(f.check)}
            </Td>
            <Td className="text-right font-mono text-xs whitespace-nowrap">
              {formatValue(f.limit)} {f.unit ? siUnit(f.unit) : checkUnit(f.check)}
            </Td>
            <Td>
              <UseRatioBar ratio={f.ratio} label={`${CHECK_LABELS[f.check]}, ${subjectText(f)}`} />
            </Td>
            <Td>
              <SeverityText severity={f.severity} />
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
