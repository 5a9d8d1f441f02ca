import { useMemo } from 'react';
import { motionBaseWorkspace } from '../../../../shared/motion/workspace';
import type { WorkspaceAxis, WorkspaceEnd, WorkspaceRow } from '../../../../shared/motion/workspace';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import { Table, Td, Th } from '../../../components/ui/table';

const AXIS_LABELS: Record<WorkspaceAxis, { name: string; negative: string; positive: string }> = {
  surge: { name: 'Surge (x)', negative: 'back', positive: 'forward' },
  sway: { name: 'Sway (y)', negative: 'right', positive: 'left' },
  heave: { name: 'Heave (z)', negative: 'down', positive: 'up' },
  roll: { name: 'Roll', negative: 'left side down', positive: 'right side down' },
  pitch: { name: 'Pitch', negative: 'nose up', positive: 'nose down' },
  yaw: { name: 'Yaw', negative: 'clockwise', positive: 'anticlockwise' },
};

function reachText(row: WorkspaceRow, end: WorkspaceEnd): string {
  const value = row.unit === 'm' ? end.reach.toFixed(3) : end.reach.toFixed(1);
  return `${end.limitedBy ? '' : '≥ '}${value} ${row.unit}`;
}

function stopText(end: WorkspaceEnd): string {
  if (!end.limitedBy) return 'none within the search';
  return `leg${end.limitedBy.leg + 1} ${end.limitedBy.end === 'min' ? 'shortest' : 'longest'}`;
}

/** One end of an axis, chosen to be shown in the 3-D view. */
export interface WorkspacePick {
  axis: WorkspaceAxis;
  sign: 1 | -1;
  /** The displacement in SI (m or rad). */
  value: number;
}

/**
 * The reach of the base from neutral along each axis alone (shared/motion/workspace.ts), with the leg
 * that stops it; `onPick` shows an extreme in the 3-D view.
 */
export function BaseWorkspaceTable({
  base,
  picked,
  onPick,
}: {
  base: MotionBase | null;
  picked: WorkspacePick | null;
  onPick: (pick: WorkspacePick | null) => void;
}) {
  const rows = useMemo(() => (base ? motionBaseWorkspace(base) : null), [base]);
  const pickButton = (row: WorkspaceRow, sign: 1 | -1, end: WorkspaceEnd) => {
    const on = picked?.axis === row.axis && picked.sign === sign;
    const value = sign * (row.unit === 'deg' ? (end.reach * Math.PI) / 180 : end.reach);
    return (
      <button
        type="button"
        aria-pressed={on}
        title={`Show ${AXIS_LABELS[row.axis].name.toLowerCase()} ${sign < 0 ? AXIS_LABELS[row.axis].negative : AXIS_LABELS[row.axis].positive} in the 3-D view`}
        onClick={() => onPick(on ? null : { axis: row.axis, sign, value })}
        className={`rounded px-1 font-mono ${on ? 'bg-tealdeep-600 text-white' : 'text-ink-900 hover:bg-ink-100'}`}
      >
        {reachText(row, end)}
      </button>
    );
  };
  return (
    <div className="flex flex-col gap-2" data-testid="base-workspace">
      <Table caption="Workspace: reach from neutral, one axis at a time, within the leg stroke">
        <thead>
          <tr>
            <Th>Axis</Th>
            <Th className="text-right">Negative</Th>
            <Th className="text-right">Positive</Th>
            <Th>Stopped by (negative / positive)</Th>
          </tr>
        </thead>
        <tbody>
          {rows ? (
            rows.map((row) => (
              <tr key={row.axis} data-axis={row.axis}>
                <Td>{AXIS_LABELS[row.axis].name}</Td>
                <Td className="text-right text-xs" title={AXIS_LABELS[row.axis].negative}>
                  {pickButton(row, -1, row.negative)}
                  <div className="text-ink-400">{AXIS_LABELS[row.axis].negative}</div>
                </Td>
                <Td className="text-right text-xs" title={AXIS_LABELS[row.axis].positive}>
                  {pickButton(row, 1, row.positive)}
                  <div className="text-ink-400">{AXIS_LABELS[row.axis].positive}</div>
                </Td>
                <Td className="text-xs text-ink-600">
                  {stopText(row.negative)} / {stopText(row.positive)}
                </Td>
              </tr>
            ))
          ) : (
            <tr>
              <Td className="text-xs text-ink-600" colSpan={4}>
                Shown once the base has no problems.
              </Td>
            </tr>
          )}
        </tbody>
      </Table>
      <p className="text-xs text-ink-400">
        Each axis alone, the others at neutral; combined motions reach less. Limited by the legs&apos; stroke
        (shortest to longest leg) only: the budget&apos;s stroke margin, speed, acceleration and force limits
        come on top. Press a value to see that pose in the view. A guide for the ride engineer, not a rating
        of the machine.
      </p>
    </div>
  );
}
