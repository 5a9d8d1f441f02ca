import { useState } from 'react';
import { CHECK_SEVERITY } from '../../../../shared/schemas/findings';
import { CHECK_LABELS, TIER_LABELS, checkUnit, subjectLabel } from '../../../../shared/labels';
import type { Use } from '../../../../shared/schemas/findings';
import { UseRatioBar } from '../../../components/charts/run-badges';
import { Button } from '../../../components/ui/button';
import { Empty } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';

/** "Seat 2 (z axis)": the subject with the axis when the check has one. */
export function subjectText(use: Pick<Use, 'subject' | 'axis'>): string {
  return use.axis && use.axis !== use.subject
    ? `${subjectLabel(use.subject)} (${subjectLabel(use.axis)})`
    : subjectLabel(use.subject);
}

/**
 * A finding's tier: red for a hard limit, amber for a comfort limit (docs/motion-conventions.md
 * section 6). Only findings (a limit reached) are coloured.
 */
export function SeverityText({ severity }: { severity: 'hard' | 'comfort' }) {
  return severity === 'hard' ? (
    <span className="text-xs font-medium text-stop-700">{TIER_LABELS.hard}</span>
  ) : (
    <span className="text-xs font-medium text-signal-600">{TIER_LABELS.comfort}</span>
  );
}

/** The tier of a check in neutral ink, where no limit has been reached (the use bar carries the colour). */
export function TierText({ severity }: { severity: 'hard' | 'comfort' }) {
  return <span className="text-xs text-ink-600">{TIER_LABELS[severity]}</span>;
}

/** "0.231 of 0.38 m": the worst value against its limit, or a dash where the check has no single limit. */
function valueText(use: Use): string {
  if (use.value === undefined || use.limit === undefined) return '—';
  const n = (x: number) => Number(x.toPrecision(3));
  const unit = checkUnit(use.check);
  return `${n(use.value)} of ${n(use.limit)}${unit ? ` ${unit}` : ''}`;
}

/** Every check's worst use of its limit, largest first: the budget at a glance. */
export function BudgetTable({ uses, shortList = 12 }: { uses: readonly Use[]; shortList?: number }) {
  const [all, setAll] = useState(false);
  if (uses.length === 0) return <Empty>The run reported no uses.</Empty>;
  const sorted = [...uses].sort((a, b) => b.ratio - a.ratio);
  // A run reports every check on every leg, seat and axis; the largest uses are what a reviewer reads first.
  const shown = all ? sorted : sorted.slice(0, shortList);
  return (
    <div className="flex flex-col gap-2">
      <Table caption="Budget uses, largest first">
        <thead>
          <tr>
            <Th>Check</Th>
            <Th>Subject</Th>
            <Th>Use of limit</Th>
            <Th>Tier</Th>
            <Th>Worst value</Th>
          </tr>
        </thead>
        <tbody>
          {shown.map((use, i) => (
            <tr key={`${use.check}-${use.subject}-${use.axis ?? ''}-${i}`}>
              <Td className="text-xs">{CHECK_LABELS[use.check]}</Td>
              <Td className="text-xs">{subjectText(use)}</Td>
              <Td>
                <UseRatioBar ratio={use.ratio} label={`${CHECK_LABELS[use.check]}, ${subjectText(use)}`} />
              </Td>
              <Td>
                {use.ratio >= 1 ? (
                  <SeverityText severity={CHECK_SEVERITY[use.check]} />
                ) : (
                  <TierText severity={CHECK_SEVERITY[use.check]} />
                )}
              </Td>
              <Td className="font-mono text-xs text-ink-600">{valueText(use)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      {sorted.length > shortList ? (
        <div>
          <Button size="sm" variant="quiet" onClick={() => setAll(!all)} aria-expanded={all}>
            {all ? `Show the ${shortList} largest only` : `Show all ${sorted.length} uses`}
          </Button>
        </div>
      ) : null}
    </div>
  );
}
