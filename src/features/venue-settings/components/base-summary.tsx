import { MotionBaseError, parseMotionBase } from '../../../../shared/schemas/motion-base';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import { Table, Td, Th } from '../../../components/ui/table';
import { ErrorNotice } from '../../../components/ui/status';
import { formatRate_hz } from '../../../lib/format';

const KIND_LABELS: Record<MotionBase['kind'], string> = {
  hexapod: 'Hexapod (6-6 Stewart-Gough platform)',
  planar3: 'Planar three-leg stage (x, y, yaw)',
};

const mm = (m: number) => `${(m * 1000).toFixed(0)}`;
const point = (p: readonly number[]) => `(${p.map(mm).join(', ')})`;

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <div className="flex flex-col">
      <dt className="text-xs text-ink-600">{label}</dt>
      <dd className="font-mono text-sm text-ink-900">{value}</dd>
    </div>
  );
}

/** The venue's motion base: kind, controller rate, stroke and actuator limits, seats, and the joints table (mm). */
export function BaseSummary({ base }: { base: unknown }) {
  let parsed: MotionBase;
  try {
    parsed = parseMotionBase(base);
  } catch (error) {
    return (
      <ErrorNotice
        error={
          error instanceof MotionBaseError ? error : new Error('The stored motion base could not be read.')
        }
      />
    );
  }
  const legs = parsed.baseJoints_m.map((b, i) => ({ base: b, platform: parsed.platformJoints_m[i] ?? [] }));
  return (
    <div className="flex flex-col gap-3">
      <dl className="grid grid-cols-2 gap-x-6 gap-y-2 md:grid-cols-4">
        <Fact label="Kind" value={KIND_LABELS[parsed.kind]} />
        <Fact label="Controller rate" value={formatRate_hz(parsed.controllerRate_hz)} />
        <Fact label="Leg stroke" value={`${parsed.leg.min_m.toFixed(3)}–${parsed.leg.max_m.toFixed(3)} m`} />
        <Fact
          label="Leg speed / acceleration limit"
          value={`${parsed.leg.speedMax_mps} m/s / ${parsed.leg.accelMax_mps2} m/s²`}
        />
        {parsed.kind === 'hexapod' ? (
          <Fact label="Neutral height" value={`${parsed.neutralHeight_m.toFixed(3)} m`} />
        ) : null}
        <Fact label="Seats" value={String(parsed.seats_m.length)} />
      </dl>
      <Table caption="Joints (mm; base joints in the base frame, platform joints in the platform frame)">
        <thead>
          <tr>
            <Th>Leg</Th>
            <Th>Base joint (mm)</Th>
            <Th>Platform joint (mm)</Th>
          </tr>
        </thead>
        <tbody>
          {legs.map((leg, i) => (
            <tr key={i}>
              <Td className="font-mono">leg{i + 1}</Td>
              <Td className="font-mono text-xs">{point(leg.base)}</Td>
              <Td className="font-mono text-xs">{point(leg.platform)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      <Table caption="Seats (rider reference points, mm, platform frame)">
        <thead>
          <tr>
            <Th>Seat</Th>
            <Th>Position (mm)</Th>
          </tr>
        </thead>
        <tbody>
          {parsed.seats_m.map((seat, i) => (
            <tr key={i}>
              <Td className="font-mono">seat{i + 1}</Td>
              <Td className="font-mono text-xs">{point(seat)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
    </div>
  );
}
