// The top of the run page: where the run stands (state, verdict, findings), every review so far and
// the viewer's next step (clear, hold, release), each refused action saying why in plain words.
import { useState } from 'react';
import type { FormEvent } from 'react';
import { Link } from 'react-router-dom';
import { appPaths } from '../../../../shared/app-paths';
import { RUN_STATE_LABELS } from '../../../../shared/schemas/pipeline';
import type { RunStateName } from '../../../../shared/schemas/pipeline';
import { REVIEW_DECISION_LABELS } from '../../../../shared/schemas/review';
import type { ReviewDecision, RunAction, RunDecision } from '../../../../shared/schemas/review';
import { RunStateBadge } from '../../../components/charts/run-badges';
import { Button } from '../../../components/ui/button';
import { TextAreaField } from '../../../components/ui/form';
import { Section, Stat } from '../../../components/ui/section';
import { Empty, ErrorNotice, Loading, Notice } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatVenueTime } from '../../../lib/format';
import { useCreateRelease } from '../../../lib/queries/releases';
import { useVenues } from '../../../lib/queries/venues';
import { useRunDecision } from '../api/get-run-decision';
import { useSubmitReview } from '../api/submit-review';

function isRunState(state: string): state is RunStateName {
  return state in RUN_STATE_LABELS;
}

/** What the findings mean for the decision, in one sentence. */
export function verdictOf(decision: Pick<RunDecision, 'state' | 'hardFindings' | 'comfortFindings'>): string {
  if (decision.state === 'queued' || decision.state === 'cueing')
    return 'Not judged yet: the run is still being cued.';
  if (decision.state === 'failed') return 'Not judged: the run failed.';
  if (decision.hardFindings > 0) {
    const n = decision.hardFindings;
    return `Cannot be cleared: ${n} hard-limit finding${n === 1 ? '' : 's'}. The run must be cued again.`;
  }
  if (decision.comfortFindings > 0) {
    const n = decision.comfortFindings;
    return `${n} comfort finding${n === 1 ? '' : 's'} and no hard-limit finding: a reviewer may clear it with a written reason.`;
  }
  return 'Within every limit of its budget.';
}

function ActionButton({
  label,
  action,
  variant,
  busy,
  onClick,
  type = 'button',
}: {
  label: string;
  action: RunAction;
  variant: 'primary' | 'secondary' | 'danger';
  busy: boolean;
  onClick?: () => void;
  type?: 'button' | 'submit';
}) {
  return (
    <div className="flex flex-col items-start gap-0.5">
      <Button type={type} variant={variant} disabled={!action.allowed} busy={busy} onClick={onClick}>
        {label}
      </Button>
      {!action.allowed && action.why ? <p className="max-w-64 text-xs text-ink-600">{action.why}</p> : null}
    </div>
  );
}

function ReviewForm({ studioId, decision }: { studioId: string; decision: RunDecision }) {
  const review = useSubmitReview(studioId, decision.runId);
  const [reason, setReason] = useState('');
  const [missing, setMissing] = useState<string | undefined>();
  const [done, setDone] = useState<ReviewDecision | null>(null);
  const { clear, hold } = decision.actions;
  if (!clear.allowed && !hold.allowed && !clear.why && !hold.why) return null;

  const submit = (choice: ReviewDecision) => {
    const action = choice === 'clear' ? clear : hold;
    if (action.reasonRequired && reason.trim() === '') {
      setMissing(
        choice === 'hold'
          ? 'Say why the run is held: the motion engineer and the producer read it.'
          : 'This run has comfort findings: say why it may be cleared anyway.',
      );
      return;
    }
    setMissing(undefined);
    review.mutate(
      { decision: choice, reason: reason.trim() },
      {
        onSuccess: () => {
          setDone(choice);
          setReason('');
        },
      },
    );
  };
  const onSubmit = (event: FormEvent) => {
    event.preventDefault();
  };
  const reasonNeeded = clear.reasonRequired || hold.reasonRequired;
  const canAct = clear.allowed || hold.allowed;

  return (
    <form className="flex flex-col gap-2" onSubmit={onSubmit} aria-label="Review">
      {canAct ? (
        <TextAreaField
          label={
            reasonNeeded ? 'Reason (required to hold, and to clear a run with comfort findings)' : 'Reason'
          }
          value={reason}
          maxLength={4000}
          onChange={(event) => setReason(event.target.value)}
          error={missing}
          hint="Kept with the review, with your name, the time and the budget version."
        />
      ) : null}
      <div className="flex flex-wrap items-start gap-3">
        <ActionButton
          label="Clear for release"
          action={clear}
          variant="primary"
          busy={review.isPending && review.variables?.decision === 'clear'}
          onClick={() => submit('clear')}
        />
        <ActionButton
          label="Hold"
          action={hold}
          variant="danger"
          busy={review.isPending && review.variables?.decision === 'hold'}
          onClick={() => submit('hold')}
        />
      </div>
      {review.isError ? <ErrorNotice error={review.error} /> : null}
      {done ? <Notice>{done === 'clear' ? 'The run is cleared.' : 'The run is held.'}</Notice> : null}
    </form>
  );
}

function ReleaseAction({ studioId, decision }: { studioId: string; decision: RunDecision }) {
  const release = useCreateRelease(studioId);
  const action = decision.actions.release;
  if (!action.allowed && !action.why) return null;
  return (
    <div className="flex flex-col items-start gap-2">
      <ActionButton
        label="Release to the venue"
        action={action}
        variant="primary"
        busy={release.isPending}
        onClick={() => release.mutate(decision.runId)}
      />
      {release.isError ? <ErrorNotice error={release.error} /> : null}
      {release.data ? (
        <Notice>
          The package is being built.{' '}
          <Link className="underline" to={appPaths.release(studioId, release.data.id)}>
            Open the release
          </Link>
        </Notice>
      ) : null}
    </div>
  );
}

/** The decision panel for one run; `venueId` gives the venue whose local time the reviews are shown in. */
export function DecisionPanel({
  studioId,
  runId,
  venueId,
}: {
  studioId: string;
  runId: string;
  venueId?: string | undefined;
}) {
  const decision = useRunDecision(studioId, runId);
  const venues = useVenues(studioId);
  const timeZone = venues.data?.find((venue) => venue.id === venueId)?.timeZone;

  if (decision.isPending) {
    return (
      <Section title="Decision" testId="decision-panel">
        <Loading what="Loading the decision" />
      </Section>
    );
  }
  if (decision.isError) {
    return (
      <Section title="Decision" testId="decision-panel">
        <ErrorNotice error={decision.error} retry={() => void decision.refetch()} />
      </Section>
    );
  }
  const d = decision.data;
  const [latestRelease, ...earlierReleases] = d.releaseIds;

  return (
    <Section
      title="Decision"
      testId="decision-panel"
      aside={
        isRunState(d.state) ? <RunStateBadge state={d.state} /> : <span className="text-xs">{d.state}</span>
      }
    >
      <p
        className={`text-sm ${d.hardFindings > 0 ? 'font-medium text-stop-700' : 'text-ink-800'}`}
        data-testid="verdict"
      >
        {verdictOf(d)}
      </p>
      <div className="flex flex-wrap gap-3">
        <Stat label="Hard-limit findings" value={d.hardFindings} tone="hold" />
        <Stat label="Comfort findings" value={d.comfortFindings} tone="hold" />
        <Stat label="Reviews" value={d.reviews.length} />
      </div>
      {d.reviews.length === 0 ? (
        <Empty>No reviews yet.</Empty>
      ) : (
        <Table caption="Reviews of this run">
          <thead>
            <tr>
              <Th>Decision</Th>
              <Th>Reviewer</Th>
              <Th>When</Th>
              <Th>Reason</Th>
              <Th>Judged against</Th>
            </tr>
          </thead>
          <tbody>
            {d.reviews.map((review) => (
              <tr key={review.id}>
                <Td>{REVIEW_DECISION_LABELS[review.decision]}</Td>
                <Td>
                  <span title={review.reviewer.email}>{review.reviewer.name}</span>
                </Td>
                <Td className="whitespace-nowrap">{formatVenueTime(review.createdAt, timeZone)}</Td>
                <Td className="whitespace-pre-wrap">{review.reason || '(no reason given)'}</Td>
                <Td>
                  {review.budgetVersion.name}, version {review.budgetVersion.version}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
      <ReviewForm studioId={studioId} decision={d} />
      <ReleaseAction studioId={studioId} decision={d} />
      {latestRelease ? (
        <p className="flex flex-wrap gap-3 text-sm">
          <Link className="text-tealdeep-600 underline" to={appPaths.release(studioId, latestRelease)}>
            Latest release of this run
          </Link>
          {earlierReleases.length > 0 ? (
            <span className="text-ink-600">
              and {earlierReleases.length} earlier (see{' '}
              <Link className="text-tealdeep-600 underline" to={appPaths.releases(studioId)}>
                Releases
              </Link>
              )
            </span>
          ) : null}
        </p>
      ) : null}
    </Section>
  );
}
