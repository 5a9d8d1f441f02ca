import { useMemo, useState } from 'react';
import { CHECK_LABELS, TIER_LABELS, checkUnit, subjectLabel } from '../../../../shared/labels';
import type { RunDetail } from '../../../../shared/schemas/pipeline';
import { UseRatioBar } from '../../../components/charts/run-badges';
import { Button } from '../../../components/ui/button';
import { Table, Td, Th } from '../../../components/ui/table';
import { budgetRows, deltaText, findingCounts } from '../utils/compare-diff';
import type { BudgetRow } from '../utils/compare-diff';
import { runLetter, versionWords } from '../utils/run-identity';
import { runStyle } from '../utils/run-styles';

function subjectText(row: Pick<BudgetRow, 'subject' | 'axis'>): string {
  return row.axis && row.axis !== row.subject
    ? `${subjectLabel(row.subject)} (${subjectLabel(row.axis)})`
    : subjectLabel(row.subject);
}

const SHIFT_WORDS = { worse: 'into a higher tier', better: 'into a lower tier', same: '' } as const;

function Change({ delta, shift }: { delta: number | null; shift: BudgetRow['shifts'][number] }) {
  if (delta === null || shift === null) return null;
  // A change of tier is what a reviewer must see: it is coloured and said; a change within a tier stays neutral.
  const tone =
    shift === 'worse'
      ? 'font-semibold text-stop-700'
      : shift === 'better'
        ? 'font-semibold text-tealdeep-700'
        : 'text-ink-600';
  return (
    <span
      className={`font-mono text-xs ${tone}`}
      title={`Change from ${runLetter(0)}${shift !== 'same' ? `, ${SHIFT_WORDS[shift]}` : ''}`}
    >
      {deltaText(delta)}
      {shift !== 'same' ? (
        <span className="ml-1 font-sans">{shift === 'worse' ? 'worse tier' : 'better tier'}</span>
      ) : null}
    </span>
  );
}

/** "0.231 of 0.25 m", or "limit 0.25 m" when only the limit is known. */
function ValueOfLimit({ value, limit, unit }: { value: number | null; limit: number | null; unit: string }) {
  if (limit === null) return null;
  const n = (x: number) => Number(x.toPrecision(3));
  return (
    <span className="text-xs text-ink-600" data-limit={limit}>
      {value !== null ? `${n(value)} of ` : 'limit '}
      {n(limit)}
      {unit ? ` ${unit}` : ''}
    </span>
  );
}

/** The budget uses of every run side by side, with each run's change from the first and its findings. */
export function CompareBudget({ runs, shortList = 15 }: { runs: readonly RunDetail[]; shortList?: number }) {
  const [all, setAll] = useState(false);
  const venuesDiffer = new Set(runs.map((r) => r.venueId)).size > 1;
  const rows = useMemo(
    () =>
      budgetRows(
        runs.map((r) => ({ uses: r.result?.uses ?? [], findings: r.result?.findings ?? [] })),
        { legsComparable: !venuesDiffer },
      ),
    [runs, venuesDiffer],
  );
  const budgetsDiffer = new Set(runs.map((r) => r.budgetVersion.id)).size > 1;
  const shown = all ? rows : rows.slice(0, shortList);
  return (
    <div className="flex flex-col gap-2">
      {budgetsDiffer ? (
        <p className="text-xs text-ink-800">
          The runs are checked against different budgets (
          {runs.map((r, k) => `${runLetter(k)}: ${versionWords(r.budgetVersion)}`).join('; ')}): each use is
          of that run’s own limit, shown where a finding gives it.
        </p>
      ) : null}
      {venuesDiffer ? (
        <p className="text-xs text-ink-800">
          The runs play on different motion bases: actuator checks (stroke, leg speed, acceleration and force)
          show each run’s own use but no change, as a leg of one base is not the same leg of another.
        </p>
      ) : null}
      <Table caption="Budget uses side by side">
        <thead>
          <tr>
            <Th>Check</Th>
            <Th>Subject</Th>
            <Th>Tier</Th>
            {runs.map((run, k) => (
              <Th key={run.id} style={{ borderTop: `3px solid ${runStyle(k).color}` }}>
                {runLetter(k)}
                <span className="block font-normal">
                  take {run.take.number}, {run.venueName}
                </span>
              </Th>
            ))}
          </tr>
        </thead>
        <tbody>
          {shown.map((row) => (
            <tr key={row.key}>
              <Td className="text-xs">{CHECK_LABELS[row.check]}</Td>
              <Td className="text-xs">{subjectText(row)}</Td>
              <Td className="text-xs text-ink-600">{TIER_LABELS[row.severity]}</Td>
              {row.ratios.map((ratio, k) => (
                <Td key={runs[k]?.id ?? k}>
                  {ratio === null ? (
                    <span className="text-xs text-ink-400">not checked</span>
                  ) : (
                    <span className="flex flex-col gap-0.5">
                      <UseRatioBar
                        ratio={ratio}
                        label={`${runLetter(k)}, ${CHECK_LABELS[row.check]}, ${subjectText(row)}`}
                      />
                      <Change delta={row.deltas[k] ?? null} shift={row.shifts[k] ?? null} />
                      <ValueOfLimit
                        value={row.values[k] ?? null}
                        limit={row.limits[k] ?? null}
                        unit={checkUnit(row.check)}
                      />
                    </span>
                  )}
                </Td>
              ))}
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr>
            <Th scope="row" colSpan={3}>
              Findings
            </Th>
            {runs.map((run, k) => {
              const counts = findingCounts(run.result?.findings ?? []);
              const first = findingCounts(runs[0]?.result?.findings ?? []);
              const change = k === 0 ? 0 : counts.hard + counts.comfort - first.hard - first.comfort;
              return (
                <Td key={run.id} className="text-xs" data-findings={runLetter(k)}>
                  {run.result ? (
                    <>
                      <span className={counts.hard > 0 ? 'font-semibold text-stop-700' : ''}>
                        {counts.hard} hard
                      </span>
                      {', '}
                      <span className={counts.comfort > 0 ? 'font-semibold text-signal-600' : ''}>
                        {counts.comfort} comfort
                      </span>
                      {k > 0 && change !== 0 ? (
                        <span className="ml-1 font-mono text-ink-600">
                          ({change > 0 ? '+' : '−'}
                          {Math.abs(change)})
                        </span>
                      ) : null}
                    </>
                  ) : (
                    'no result'
                  )}
                </Td>
              );
            })}
          </tr>
        </tfoot>
      </Table>
      <p className="text-xs text-ink-600">
        Each cell is the run’s worst use of its limit (value / limit); below it the change from {runLetter(0)}
        , with ▲ more use and ▼ less, named when it moves the use into another tier (below 0.8, 0.8 to 1, at
        or over 1).
      </p>
      {rows.length > shortList ? (
        <div>
          <Button size="sm" variant="quiet" onClick={() => setAll(!all)} aria-expanded={all}>
            {all ? `Show the ${shortList} largest only` : `Show all ${rows.length} checks`}
          </Button>
        </div>
      ) : null}
    </div>
  );
}
