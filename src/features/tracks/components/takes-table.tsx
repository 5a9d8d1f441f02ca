import { Fragment, useState } from 'react';
import type { Take } from '../../../../shared/schemas/pipeline';
import { formatBytes, formatDuration_s, shortSha } from '../../../components/charts/format-units';
import { Button } from '../../../components/ui/button';
import { Empty } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatDateTime } from '../../../lib/format';
import { useCan } from '../../../lib/membership';
import { useSetProxyVideo } from '../api/set-proxy-video';
import { CueVenuesForm } from './cue-venues-form';

/** The take's film proxy (watched in step with the motion on run pages); producers may set it. */
function ProxyVideoCell({ studioId, take }: { studioId: string; take: Take }) {
  const canUpload = useCan('takes.upload');
  const set = useSetProxyVideo(studioId);
  const v = take.proxyVideo;
  return (
    <div className="flex flex-col gap-1 text-xs">
      <span className={v ? 'text-ink-800' : 'text-ink-400'}>
        {v ? `${v.type === 'video/mp4' ? 'MP4' : 'WebM'}, ${formatBytes(v.sizeBytes)}` : 'none'}
      </span>
      {canUpload ? (
        <label className="cursor-pointer text-tealdeep-600 underline">
          {set.isPending ? 'Uploading…' : v ? 'Replace' : 'Add a proxy video'}
          <input
            type="file"
            accept="video/mp4,video/webm,.mp4,.m4v,.webm"
            className="sr-only"
            disabled={set.isPending}
            onChange={(e) => {
              const file = e.target.files?.[0];
              if (file) set.mutate({ studioId, takeId: take.id, file });
              e.target.value = '';
            }}
          />
        </label>
      ) : null}
      {set.error ? <span className="text-stop-700">{set.error.message}</span> : null}
    </div>
  );
}

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
          <Th>Film proxy</Th>
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
              <Td className="font-mono text-xs break-words">{take.fileName}</Td>
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
              <Td>
                <ProxyVideoCell studioId={studioId} take={take} />
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
                <Td colSpan={10}>
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
