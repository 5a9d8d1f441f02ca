// One release: its state, the package and every file in it with SHA-256 and size, who released it
// and when, downloads, installations and problems; the producer's withdraw; how to check a package.
import { useState } from 'react';
import type { FormEvent } from 'react';
import { Link } from 'react-router-dom';
import { appPaths } from '../../../../shared/app-paths';
import type { Release } from '../../../../shared/schemas/release';
import { CAUTION_TEXT } from '../../../components/layout/caution-strip';
import { DownloadLink, OperatorActions } from '../../../components/releases/operator-actions';
import { ReleaseStateBadge, formatBytes } from '../../../components/releases/release-badge';
import { Button } from '../../../components/ui/button';
import { TextAreaField } from '../../../components/ui/form';
import { Section } from '../../../components/ui/section';
import { Empty, ErrorNotice, Loading, Notice } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatVenueTime } from '../../../lib/format';
import { useCan } from '../../../lib/membership';
import { useRelease, useWithdrawRelease } from '../../../lib/queries/releases';
import { useVenues } from '../../../lib/queries/venues';

function CopyButton({ text, label }: { text: string; label: string }) {
  const [copied, setCopied] = useState<'yes' | 'no' | null>(null);
  return (
    <Button
      size="sm"
      aria-label={label}
      onClick={() => {
        const clip = typeof navigator !== 'undefined' ? navigator.clipboard : undefined;
        if (!clip) {
          setCopied('no');
          return;
        }
        clip.writeText(text).then(
          () => setCopied('yes'),
          () => setCopied('no'),
        );
      }}
    >
      {copied === 'yes' ? 'Copied' : copied === 'no' ? 'Select and copy it by hand' : 'Copy'}
    </Button>
  );
}

function Banner({
  release,
  studioId,
  timeZone,
}: {
  release: Release;
  studioId: string;
  timeZone: string | undefined;
}) {
  if (release.state === 'withdrawn') {
    return (
      <div role="alert" className="rounded border-2 border-stop-500 bg-white px-3 py-2 text-sm text-stop-700">
        <p className="font-semibold">Withdrawn: do not load this package.</p>
        <p>
          {release.withdrawnBy ? `${release.withdrawnBy.name} withdrew it` : 'It was withdrawn'}
          {release.withdrawnAt ? ` on ${formatVenueTime(release.withdrawnAt, timeZone)}` : ''}
          {release.withdrawReason ? `: ${release.withdrawReason}` : '.'}
        </p>
      </div>
    );
  }
  if (release.state === 'superseded') {
    return (
      <div
        role="alert"
        className="rounded border-2 border-signal-400 bg-white px-3 py-2 text-sm text-signal-600"
      >
        <p className="font-semibold">Superseded: a newer release of this track is ready for this venue.</p>
        <p>
          {release.supersededAt ? `Since ${formatVenueTime(release.supersededAt, timeZone)}. ` : ''}
          {release.supersededById ? (
            <Link className="underline" to={appPaths.release(studioId, release.supersededById)}>
              Open the newer release
            </Link>
          ) : null}
        </p>
      </div>
    );
  }
  if (release.state === 'failed') {
    return (
      <div role="alert" className="rounded border border-stop-500 bg-white px-3 py-2 text-sm text-stop-700">
        The package could not be built{release.failureReason ? `: ${release.failureReason}` : '.'}
      </div>
    );
  }
  if (release.state === 'building') {
    return <Notice>The package is being built; this page updates when it is ready.</Notice>;
  }
  return null;
}

function WithdrawForm({ studioId, release }: { studioId: string; release: Release }) {
  const withdraw = useWithdrawRelease(studioId, release);
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState('');
  const [missing, setMissing] = useState<string | undefined>();
  if (release.state === 'withdrawn') return null;
  if (!open) {
    return (
      <div>
        <Button variant="danger" onClick={() => setOpen(true)}>
          Withdraw this release
        </Button>
      </div>
    );
  }
  const onSubmit = (event: FormEvent) => {
    event.preventDefault();
    if (reason.trim() === '') {
      setMissing('Say why the release is withdrawn: the venue reads it.');
      return;
    }
    setMissing(undefined);
    withdraw.mutate(reason.trim(), { onSuccess: () => setOpen(false) });
  };
  return (
    <form className="flex flex-col gap-2" onSubmit={onSubmit} aria-label="Withdraw the release">
      <TextAreaField
        label="Why is it withdrawn?"
        value={reason}
        maxLength={4000}
        onChange={(event) => setReason(event.target.value)}
        error={missing}
        hint="After this the package can no longer be downloaded; the venue's operators are told."
      />
      <div className="flex gap-2">
        <Button type="submit" variant="danger" busy={withdraw.isPending}>
          Withdraw
        </Button>
        <Button variant="quiet" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
      {withdraw.isError ? <ErrorNotice error={withdraw.error} /> : null}
    </form>
  );
}

export function ReleaseView({ studioId, releaseId }: { studioId: string; releaseId: string }) {
  const release = useRelease(studioId, releaseId);
  const venues = useVenues(studioId);
  const canWithdraw = useCan('releases.withdraw');
  const canReadRuns = useCan('runs.read');
  if (release.isPending) return <Loading what="Loading the release" />;
  if (release.isError) return <ErrorNotice error={release.error} retry={() => void release.refetch()} />;
  const r = release.data;
  const timeZone = venues.data?.find((venue) => venue.id === r.venueId)?.timeZone;
  const when = (iso: string) => formatVenueTime(iso, timeZone);

  return (
    <>
      <Banner release={r} studioId={studioId} timeZone={timeZone} />
      <Section
        title={`${r.trackTitle}, take ${r.takeNumber}, for ${r.venueName}`}
        aside={<ReleaseStateBadge state={r.state} />}
        testId="release-summary"
      >
        <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-ink-600">Released</dt>
          <dd>
            {when(r.releasedAt)}
            {r.releasedBy ? ` by ${r.releasedBy.name}` : ''}
          </dd>
          <dt className="text-ink-600">Package built</dt>
          <dd>{r.builtAt ? when(r.builtAt) : 'Not yet'}</dd>
          <dt className="text-ink-600">Package</dt>
          <dd className="font-mono">
            {r.packageName} ({formatBytes(r.packageSizeBytes)})
          </dd>
          <dt className="text-ink-600">Package SHA-256</dt>
          <dd className="flex flex-wrap items-center gap-2">
            {r.packageSha256 ? (
              <>
                <code className="break-all font-mono text-xs" data-testid="package-sha256">
                  {r.packageSha256}
                </code>
                <CopyButton text={r.packageSha256} label="Copy the package SHA-256" />
              </>
            ) : (
              'Not built yet'
            )}
          </dd>
          <dt className="text-ink-600">Downloads</dt>
          <dd>
            {r.downloads}
            {r.lastDownloadAt ? `, last on ${when(r.lastDownloadAt)}` : ''}
          </dd>
        </dl>
        <div className="flex flex-wrap items-start gap-3">
          <DownloadLink studioId={studioId} release={r} />
          {canReadRuns ? (
            <Link
              className="self-center text-sm text-tealdeep-600 underline"
              to={appPaths.run(studioId, r.runId)}
            >
              Open the cue run
            </Link>
          ) : null}
        </div>
        <OperatorActions studioId={studioId} release={r} />
        <p
          role="note"
          className="rounded border border-signal-400 bg-white px-3 py-2 text-xs text-ink-800"
          data-testid="release-caution"
        >
          {CAUTION_TEXT}
        </p>
      </Section>

      <Section title="Files in the package">
        {r.files.length === 0 ? (
          <Empty>The file list appears once the package is built.</Empty>
        ) : (
          <Table caption="Files in the package">
            <thead>
              <tr>
                <Th>File</Th>
                <Th className="text-right">Size</Th>
                <Th>SHA-256</Th>
              </tr>
            </thead>
            <tbody>
              {r.files.map((file) => (
                <tr key={file.name}>
                  <Td className="font-mono text-xs">{file.name}</Td>
                  <Td className="text-right font-mono text-xs whitespace-nowrap">
                    {formatBytes(file.size_bytes)}
                  </Td>
                  <Td className="break-all font-mono text-xs">{file.sha256}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        )}
        <p className="text-xs text-ink-600">
          Before loading, check the package against its manifest:{' '}
          <code className="font-mono">
            legwork verify --sha256 {r.packageSha256 ?? '...'} {r.packageName}
          </code>{' '}
          exits 0 when the zip and every file in it match, and names each file that does not (exit 5).
        </p>
      </Section>

      <Section title="Installed at the venue">
        {r.acknowledgements.length === 0 ? (
          <Empty>Nobody at the venue has marked it installed yet.</Empty>
        ) : (
          <ul className="flex flex-col gap-1 text-sm">
            {r.acknowledgements.map((ack) => (
              <li key={`${ack.by.id}-${ack.at}`}>
                {ack.by.name}, {when(ack.at)}
                {ack.note ? `: ${ack.note}` : ''}
              </li>
            ))}
          </ul>
        )}
      </Section>

      <Section title="Problems reported">
        {r.problems.length === 0 ? (
          <Empty>No problems reported.</Empty>
        ) : (
          <ul className="flex flex-col gap-2 text-sm">
            {r.problems.map((problem) => (
              <li key={problem.id} className="rounded border border-signal-400 px-3 py-2">
                <p className="text-xs text-ink-600">
                  {problem.by.name}, {when(problem.at)}
                </p>
                <p className="whitespace-pre-wrap">{problem.text}</p>
              </li>
            ))}
          </ul>
        )}
      </Section>

      {canWithdraw ? (
        <Section title="Withdraw">
          <WithdrawForm studioId={studioId} release={r} />
        </Section>
      ) : null}
    </>
  );
}
