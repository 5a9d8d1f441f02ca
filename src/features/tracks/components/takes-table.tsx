import { Fragment, useState } from 'react';
import type { Take } from '../../../../shared/schemas/pipeline';
import { formatBytes, formatDuration_s, shortSha } from '../../../components/charts/format-units';
import { Button } from '../../../components/ui/button';
import { Empty } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatDateTime } from '../../../lib/format';
import { CueVenuesForm } from './cue-venues-form';

const KIND_LABELS: Record<Take['kind'], string> = {
  vehicle: 'Vehicle motion',
  pose: 'Platform pose',
  legs: 'Leg lengths',
};

/** The track's takes, newest first; those who may queue runs get a "Cue for venues" form per take. */
export function TakesTable({
  studioId,
  takes,
  canCue,
}: {
  studioId: string;
  takes: readonly Take[];
  canCue: boolean;
}) {
  const [open, setOpen] = useState<string | null>(null);
  if (takes.length === 0) return <Empty>No takes yet. Upload the first one below.</Empty>;
  const sorted = [...takes].sort((a, b) => b.number - a.number);
  return (
    <Table caption="Takes">
      <thead>
        <tr>
          <Th className="text-right">Take</Th>
          <Th>File</Th>
          <Th>Kind</Th>
          <Th className="text-right">Samples</Th>
          <Th className="text-right">Duration</Th>
          <Th className="text-right">Size</Th>
          <Th>SHA-256</Th>
          <Th>Uploaded</Th>
          {canCue ? (
            <Th>
              <span className="sr-only">Actions</span>
            </Th>
          ) : null}
        </tr>
      </thead>
      <tbody>
        {sorted.map((take) => (
          <Fragment key={take.id}>
            <tr>
              <Td className="text-right font-mono">{take.number}</Td>
              <Td className="font-mono text-xs break-all">{take.fileName}</Td>
              <Td>
                {KIND_LABELS[take.kind]}
                {take.kind !== 'vehicle' ? (
                  <span className="ml-1 text-xs text-ink-400">({take.layout})</span>
                ) : null}
              </Td>
              <Td className="text-right font-mono">{take.samples.toLocaleString('en-GB')}</Td>
              <Td className="text-right font-mono whitespace-nowrap">{formatDuration_s(take.duration_s)}</Td>
              <Td className="text-right font-mono whitespace-nowrap">{formatBytes(take.sizeBytes)}</Td>
              <Td className="font-mono text-xs" title={take.sha256}>
                {shortSha(take.sha256)}
              </Td>
              <Td className="text-xs whitespace-nowrap text-ink-600">
                {formatDateTime(take.createdAt)}
                <span className="ml-1 text-ink-400">
                  via {take.uploadedVia === 'token' ? 'API token' : 'browser'}
                </span>
              </Td>
              {canCue ? (
                <Td className="text-right">
                  <Button
                    size="sm"
                    aria-expanded={open === take.id}
                    onClick={() => setOpen(open === take.id ? null : take.id)}
                  >
                    Cue for venues
                  </Button>
                </Td>
              ) : null}
            </tr>
            {canCue && open === take.id ? (
              <tr className="bg-ink-50">
                <Td colSpan={9}>
                  <CueVenuesForm studioId={studioId} take={take} />
                </Td>
              </tr>
            ) : null}
          </Fragment>
        ))}
      </tbody>
    </Table>
  );
}
