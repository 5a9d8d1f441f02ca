// The mails about runs, queued in the transaction that moves the run: "a run awaits review" to the
// studio's safety reviewers when the worker finishes a run for review (awaiting review, or held by
// the budget), and "a run is held" to its producers and motion engineers when a reviewer holds it or
// the budget holds it with a hard finding. Each names the track, take, venue and state and links to
// the run page.
import type { Tx } from '../db/client';
import type { LoadedRun } from '../pipeline/run-detail';
import { queueMail, recipientsByRole } from './outbox';
import { appPaths } from '../../shared/app-paths';
import { CHECK_LABELS, subjectLabel } from '../../shared/labels';
import { RUN_STATE_LABELS } from '../../shared/schemas/pipeline';
import type { RunStateName } from '../../shared/schemas/pipeline';
import { ROLE } from '../../shared/schemas/roles';
import type { Finding } from '../../shared/schemas/findings';

/** The caution every run mail carries. */
export const RUN_MAIL_CAUTION =
  "Legwork checks motion against the studio's budget; it does not replace the ride manufacturer's limits, " +
  "the applicable codes or a qualified person's sign-off. Motion decisions rest with the ride engineer.";

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function findingsLine(findings: readonly Finding[]): string {
  const hard = findings.filter((f) => f.severity === 'hard').length;
  const comfort = findings.length - hard;
  if (findings.length === 0) return 'none';
  return [hard ? plural(hard, 'hard') : '', comfort ? plural(comfort, 'comfort') : '']
    .filter(Boolean)
    .join(', ');
}

/** "Breakwater Chase, take 2 (breakwater-chase-cut2.csv), cued for Harbour Lights Dome" */
function runName(l: LoadedRun): string {
  return `${l.trackTitle}, take ${l.take.number} (${l.take.fileName}), cued for ${l.venueName}`;
}

const subjectName = (l: LoadedRun) => `${l.trackTitle} take ${l.take.number} at ${l.venueName}`;

/** The worst hard findings in words: "Stroke (leg 3), Leg speed (leg 1)". */
function hardList(findings: readonly Finding[]): string {
  const hard = findings.filter((f) => f.severity === 'hard').sort((a, b) => b.ratio - a.ratio);
  const named = [...new Set(hard.map((f) => `${CHECK_LABELS[f.check]} (${subjectLabel(f.subject)})`))];
  return named.length > 3 ? `${named.slice(0, 3).join(', ')} and ${named.length - 3} more` : named.join(', ');
}

function text(lines: (string | null)[]): string {
  return lines.filter((l): l is string => l !== null).join('\n');
}

/**
 * Queues the mails of a run the worker just finished: awaiting review (to the reviewers) when it
 * waits for a reviewer, and held (to the producers and motion engineers) when the budget held it
 * with a hard finding. Answers the rows queued. `loaded` is the run as it now stands.
 */
export async function queueRunFinishedMails(tx: Tx, studioId: string, loaded: LoadedRun): Promise<number> {
  const { run } = loaded;
  if (run.state !== 'awaiting_review' && run.state !== 'held_by_budget') return 0;
  const findings = run.summary?.findings ?? [];
  const hard = findings.filter((f) => f.severity === 'hard').length;
  const state = RUN_STATE_LABELS[run.state as RunStateName];
  const path = appPaths.run(studioId, run.id);
  let queued = await queueMail(tx, {
    studioId,
    kind: 'run_awaiting_review',
    userIds: await recipientsByRole(tx, studioId, [ROLE.safety_reviewer]),
    subject: `Legwork: ${subjectName(loaded)} awaits review`,
    text: text([
      `${runName(loaded)}, is ready for safety review.`,
      '',
      `State: ${state}`,
      `Findings: ${findingsLine(findings)}`,
      hard
        ? `A run with a hard finding (${hardList(findings)}) cannot be cleared; hold it so that it is cued again.`
        : null,
      '',
      RUN_MAIL_CAUTION,
      '',
      'Open the run to clear or hold it:',
    ]),
    path,
  });
  if (run.state === 'held_by_budget' && hard > 0) {
    queued += await queueMail(tx, {
      studioId,
      kind: 'run_held',
      userIds: await recipientsByRole(tx, studioId, [ROLE.producer, ROLE.motion_engineer]),
      subject: `Legwork: ${subjectName(loaded)} is held by the budget`,
      text: text([
        `The safety budget held ${runName(loaded)}: ${plural(hard, 'hard finding')} (${hardList(findings)}).`,
        '',
        `State: ${state}`,
        `Findings: ${findingsLine(findings)}`,
        'A run with a hard finding cannot be cleared: cue it again with changed settings or a new take.',
        '',
        RUN_MAIL_CAUTION,
        '',
        'Open the run:',
      ]),
      path,
    });
  }
  return queued;
}

/** Queues "a run is held" for a reviewer's hold, with the reason. `loaded` is the run as now held. */
export async function queueRunHeldMail(
  tx: Tx,
  studioId: string,
  loaded: LoadedRun,
  hold: { reviewerName: string; reason: string },
): Promise<number> {
  const { run } = loaded;
  const findings = run.summary?.findings ?? [];
  return queueMail(tx, {
    studioId,
    kind: 'run_held',
    userIds: await recipientsByRole(tx, studioId, [ROLE.producer, ROLE.motion_engineer]),
    subject: `Legwork: ${subjectName(loaded)} is held`,
    text: text([
      `${hold.reviewerName} held ${runName(loaded)}.`,
      '',
      `State: ${RUN_STATE_LABELS[run.state as RunStateName]}`,
      `Reason: ${hold.reason}`,
      `Findings: ${findingsLine(findings)}`,
      'Cue it again with changed settings or a new take; the reason says what to change.',
      '',
      RUN_MAIL_CAUTION,
      '',
      'Open the run:',
    ]),
    path: appPaths.run(studioId, run.id),
  });
}
