// Who may clear or hold a run, and when: the one statement of the review rules. The server enforces
// it (each refusal carries its HTTP status) and the decision panel shows the same answers.
//
// - Only a role with 'runs.review' reviews (403).
// - A run can be reviewed once it is finished and judged: awaiting review, held by budget or held;
//   a cleared run can still be held until it is released (409 otherwise).
// - A run with any hard finding cannot be cleared by anyone: it must be cued again (409).
// - Separation of duties: a reviewer cannot clear a run they asked for or whose take they uploaded (403).
// - A hold always needs a written reason; so does clearing a run with comfort findings (400).
// - Only a producer releases, and only a cleared run with no release building or ready (403, 409).
import { allows } from './permissions';
import { RUN_STATE_LABELS } from './schemas/pipeline';

/** A run state in the words of the screens, lower case for use inside a sentence. */
const stateWords = (state: string): string =>
  (RUN_STATE_LABELS[state as keyof typeof RUN_STATE_LABELS] ?? state.replace(/_/g, ' ')).toLowerCase();

export const CLEARABLE_STATES: readonly string[] = ['awaiting_review', 'held_by_budget', 'held'];
export const HOLDABLE_STATES: readonly string[] = ['awaiting_review', 'held_by_budget', 'cleared'];

export interface ReviewSubject {
  state: string;
  finished: boolean;
  hardFindings: number;
  comfortFindings: number;
  requestedBy: string | null;
  uploadedBy: string | null;
  /** A release of this run is building or ready (a cleared run is then no longer held by review). */
  activeRelease: boolean;
}

export interface ReviewViewer {
  userId: string | null;
  roles: readonly string[];
}

export interface RuleAnswer {
  allowed: boolean;
  reasonRequired: boolean;
  why: string | null;
  /** The HTTP status of a refusal (403, 409), 200 when allowed. */
  status: 200 | 403 | 409;
}

const refuse = (status: 403 | 409, why: string, reasonRequired = false): RuleAnswer => ({
  allowed: false,
  reasonRequired,
  why,
  status,
});
const allow = (reasonRequired: boolean): RuleAnswer => ({
  allowed: true,
  reasonRequired,
  why: null,
  status: 200,
});

export function clearRule(run: ReviewSubject, viewer: ReviewViewer): RuleAnswer {
  const reasonRequired = run.comfortFindings > 0;
  if (!allows(viewer.roles, 'runs.review'))
    return refuse(403, 'Clearing a run is the work of a safety reviewer.', reasonRequired);
  if (!run.finished || !CLEARABLE_STATES.includes(run.state))
    return refuse(409, stateWhy(run.state, 'cleared'), reasonRequired);
  if (run.hardFindings > 0)
    return refuse(
      409,
      `This run has ${plural(run.hardFindings, 'hard finding')}: no one can clear it. Cue the take again with other settings.`,
      reasonRequired,
    );
  if (viewer.userId && viewer.userId === run.requestedBy)
    return refuse(403, 'You asked for this run: another safety reviewer must clear it.', reasonRequired);
  if (viewer.userId && viewer.userId === run.uploadedBy)
    return refuse(
      403,
      "You uploaded this run's take: another safety reviewer must clear it.",
      reasonRequired,
    );
  return allow(reasonRequired);
}

export function holdRule(run: ReviewSubject, viewer: ReviewViewer): RuleAnswer {
  if (!allows(viewer.roles, 'runs.review'))
    return refuse(403, 'Holding a run is the work of a safety reviewer.', true);
  if (!run.finished || !HOLDABLE_STATES.includes(run.state))
    return refuse(409, stateWhy(run.state, 'held'), true);
  if (run.activeRelease)
    return refuse(409, 'This run has a release: the producer withdraws the release instead.', true);
  return allow(true);
}

/** The run states from which a producer may release a run to its venue. */
export const RELEASABLE_STATES: readonly string[] = ['cleared'];

/**
 * A producer releases a cleared run to its venue (the worker then builds the package). A run that is
 * released, superseded or withdrawn is not released again: a new release comes from a new run.
 */
export function releaseRule(run: ReviewSubject, viewer: ReviewViewer): RuleAnswer {
  if (!allows(viewer.roles, 'releases.create'))
    return refuse(403, 'Releasing a run to its venue is the work of a producer.');
  if (run.activeRelease) return refuse(409, 'This run already has a release that is building or ready.');
  if (!RELEASABLE_STATES.includes(run.state))
    return refuse(
      409,
      run.state === 'released' || run.state === 'superseded' || run.state === 'withdrawn'
        ? `This run was already released (now ${stateWords(run.state)}); a new release comes from a new run.`
        : 'Only a run a safety reviewer has cleared can be released.',
    );
  if (run.hardFindings > 0)
    return refuse(409, `This run has ${plural(run.hardFindings, 'hard finding')}: it cannot be released.`);
  return allow(false);
}

function stateWhy(state: string, verb: 'cleared' | 'held'): string {
  switch (state) {
    case 'queued':
    case 'cueing':
      return `The run is not finished yet: it can be ${verb} once it has been cued and checked.`;
    case 'failed':
      return 'The run failed: there is nothing to review. Ask for the run again.';
    case 'cleared':
      return 'The run is already cleared.';
    case 'held':
      return 'The run is already held.';
    default:
      return `A run in this state (${stateWords(state)}) cannot be ${verb}.`;
  }
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
