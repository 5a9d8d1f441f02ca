// What a venue operator does with a release: download it, say it is installed, or report a problem.
// Used on the operator's home and on the release page.
import { useState } from 'react';
import type { FormEvent } from 'react';
import type { Release } from '../../../shared/schemas/release';
import { useCan } from '../../lib/membership';
import { releasePackageUrl, useAcknowledgeRelease, useReportProblem } from '../../lib/queries/releases';
import { Button } from '../ui/button';
import { TextAreaField } from '../ui/form';
import { ErrorNotice, Notice } from '../ui/status';

/** True when the package can be downloaded (built, and not withdrawn). */
export function isDownloadable(release: Pick<Release, 'state'>): boolean {
  return release.state === 'ready' || release.state === 'superseded';
}

/** The package as a plain link (the server streams it and logs the download). */
export function DownloadLink({ studioId, release }: { studioId: string; release: Release }) {
  if (!isDownloadable(release)) return null;
  return (
    <a
      className="inline-flex items-center rounded border border-tealdeep-700 bg-tealdeep-600 px-3 py-1.5 text-sm font-medium text-white hover:bg-tealdeep-700"
      href={releasePackageUrl(studioId, release.id)}
      download={release.packageName}
    >
      Download package
    </a>
  );
}

/** "Installed" and "Report a problem" for a venue operator; nothing for other roles. */
export function OperatorActions({ studioId, release }: { studioId: string; release: Release }) {
  const canAcknowledge = useCan('releases.acknowledge');
  const canReport = useCan('releases.report');
  const acknowledge = useAcknowledgeRelease(studioId, release);
  const report = useReportProblem(studioId, release);
  const [reporting, setReporting] = useState(false);
  const [text, setText] = useState('');
  const [missing, setMissing] = useState<string | undefined>();
  const [reported, setReported] = useState(false);

  if (!canAcknowledge && !canReport) return null;
  const installedAlready = release.acknowledgements.length > 0;

  const onReport = (event: FormEvent) => {
    event.preventDefault();
    if (text.trim() === '') {
      setMissing('Describe the problem: what you saw, on which seat or leg, and when.');
      return;
    }
    setMissing(undefined);
    report.mutate(text.trim(), {
      onSuccess: () => {
        setReported(true);
        setReporting(false);
        setText('');
      },
    });
  };

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-2">
        {canAcknowledge && isDownloadable(release) && !installedAlready ? (
          <Button busy={acknowledge.isPending} onClick={() => acknowledge.mutate('')}>
            Mark as installed
          </Button>
        ) : null}
        {canAcknowledge && installedAlready ? (
          <span className="text-xs text-ink-600">Installed at the venue.</span>
        ) : null}
        {canReport && !reporting ? (
          <Button variant="quiet" onClick={() => setReporting(true)}>
            Report a problem
          </Button>
        ) : null}
      </div>
      {acknowledge.isError ? <ErrorNotice error={acknowledge.error} /> : null}
      {reporting ? (
        <form className="flex flex-col gap-2" onSubmit={onReport} aria-label="Report a problem">
          <TextAreaField
            label="What is wrong with this package?"
            value={text}
            maxLength={8000}
            onChange={(event) => setText(event.target.value)}
            error={missing}
            hint="The producer and the safety reviewer are told."
          />
          <div className="flex gap-2">
            <Button type="submit" variant="danger" busy={report.isPending}>
              Send the report
            </Button>
            <Button variant="quiet" onClick={() => setReporting(false)}>
              Cancel
            </Button>
          </div>
          {report.isError ? <ErrorNotice error={report.error} /> : null}
        </form>
      ) : null}
      {reported ? <Notice>The problem is reported.</Notice> : null}
    </div>
  );
}
