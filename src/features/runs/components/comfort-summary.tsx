import type { ComfortSummary as Comfort } from '../../../../shared/schemas/findings';
import { formatValue } from '../../../components/charts/format-units';
import { Table, Td, Th } from '../../../components/ui/table';
import { subjectLabel } from '../../../../shared/labels';

const AXES = ['x', 'y', 'z'] as const;

/** Whole-track rider figures (ISO 2631-1): weighted r.m.s. and VDV per axis, MSDV_z and the vomiting share. */
export function ComfortSummary({ comfort }: { comfort: Comfort }) {
  return (
    <div className="flex flex-col gap-2">
      <Table caption="Weighted acceleration per axis">
        <thead>
          <tr>
            <Th>Axis</Th>
            <Th className="text-right">Weighted r.m.s. (m/s²)</Th>
            <Th>Worst seat</Th>
            <Th className="text-right">VDV (m/s^1.75)</Th>
          </tr>
        </thead>
        <tbody>
          {AXES.map((axis) => (
            <tr key={axis}>
              <Td className="font-mono">{axis}</Td>
              <Td className="text-right font-mono">{formatValue(comfort.wrms_mps2[axis])}</Td>
              <Td className="text-xs">{subjectLabel(comfort.wrmsSeat[axis])}</Td>
              <Td className="text-right font-mono">{formatValue(comfort.vdv_mps1_75[axis])}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      <p className="text-sm text-ink-800">
        MSDV<sub>z</sub> {formatValue(comfort.msdvZ_mps1_5)} m/s^1.5 at{' '}
        {subjectLabel(comfort.msdvSeat).toLowerCase()}; by ISO 2631-1 Annex D about{' '}
        <span className="font-mono">{formatValue(comfort.vomitShare_pct, 3)} %</span> of unadapted adults may
        vomit over this exposure.
      </p>
      <p className="text-xs text-ink-600">{comfort.weightingNote}</p>
    </div>
  );
}
