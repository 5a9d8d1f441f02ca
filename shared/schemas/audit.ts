// The audit log as the API serves it: every event with its kind, plain words and what it links to,
// the filters of the audit page and its CSV export.
import { z } from 'zod';
import { text } from './text';

/** Kinds people filter the log by; each event's action belongs to one (see auditKindOf). */
export const AUDIT_KINDS = [
  'upload',
  'track',
  'run',
  'review',
  'release',
  'withdrawal',
  'download',
  'acknowledgement',
  'problem',
  'membership',
  'profile',
  'venue',
  'token',
  'sign_in',
] as const;
export const auditKindSchema = z.enum(AUDIT_KINDS);
export type AuditKind = z.infer<typeof auditKindSchema>;

export const AUDIT_KIND_LABELS: Record<AuditKind, string> = {
  upload: 'Uploads',
  track: 'Tracks',
  run: 'Cue runs',
  review: 'Reviews',
  release: 'Releases',
  withdrawal: 'Withdrawals',
  download: 'Downloads',
  acknowledgement: 'Acknowledgements',
  problem: 'Problems reported',
  membership: 'Members and invitations',
  profile: 'Profiles',
  venue: 'Venues',
  token: 'API tokens',
  sign_in: 'Sign-ins',
};

const ACTION_KIND: Record<string, AuditKind> = {
  'take.uploaded': 'upload',
  'track.created': 'track',
  'review.cleared': 'review',
  'review.held': 'review',
  'release.created': 'release',
  'release.ready': 'release',
  'release.failed': 'release',
  'release.superseded': 'release',
  'release.withdrawn': 'withdrawal',
  'release.downloaded': 'download',
  'release.acknowledged': 'acknowledgement',
  'release.problem_reported': 'problem',
};

/** The kind of an action ('run.queued' -> run, 'member.removed' -> membership, ...). */
export function auditKindOf(action: string): AuditKind {
  const exact = ACTION_KIND[action];
  if (exact) return exact;
  const head = action.split('.')[0] ?? '';
  if (head === 'run') return 'run';
  if (head === 'member' || head === 'invitation') return 'membership';
  if (head === 'profile') return 'profile';
  if (head === 'venue') return 'venue';
  if (head === 'token') return 'token';
  if (head === 'auth') return 'sign_in';
  if (head === 'release') return 'release';
  if (head === 'review') return 'review';
  return 'track';
}

/** The actions of a kind among those the product writes (for filtering in SQL). */
export function auditActionsOf(kind: AuditKind): { exact: string[]; prefixes: string[] } {
  const exact = Object.entries(ACTION_KIND)
    .filter(([, k]) => k === kind)
    .map(([a]) => a);
  const prefixes: Partial<Record<AuditKind, string[]>> = {
    run: ['run.'],
    membership: ['member.', 'invitation.'],
    profile: ['profile.'],
    venue: ['venue.'],
    token: ['token.'],
    sign_in: ['auth.'],
  };
  return { exact, prefixes: prefixes[kind] ?? [] };
}

/** What an event is about, for a link on the audit page: the client maps each kind to its page. */
export const AUDIT_LINK_KINDS = [
  'run',
  'release',
  'track',
  'venue',
  'member',
  'profile',
  'invitation',
] as const;
export const auditLinkSchema = z.object({ kind: z.enum(AUDIT_LINK_KINDS), id: z.string() });
export type AuditLink = z.infer<typeof auditLinkSchema>;

/** A day (YYYY-MM-DD, UTC) or a full ISO time. `to` as a day includes that whole day. */
const when = text()
  .trim()
  .refine((s) => !Number.isNaN(Date.parse(s)), 'must be a date (YYYY-MM-DD) or an ISO date-time');

export const auditQuery = z.object({
  kind: auditKindSchema.optional(),
  /** A member's user id or e-mail address. */
  person: text().trim().min(1).max(254).optional(),
  from: when.optional(),
  to: when.optional(),
  before: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
export type AuditQuery = z.infer<typeof auditQuery>;

export const auditEventSchema = z.object({
  id: z.number().int(),
  at: z.string(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  kind: auditKindSchema,
  /** The event in plain words, e.g. "rosa.reviewer@... held run 3f2a... (Harbour Lights Dome): ...". */
  words: z.string(),
  link: auditLinkSchema.nullable(),
  subjectType: z.string(),
  subjectId: z.string().nullable(),
  detail: z.record(z.string(), z.unknown()),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;

export const auditPageSchema = z.object({
  events: z.array(auditEventSchema),
  nextBefore: z.number().int().nullable(),
});
export type AuditPage = z.infer<typeof auditPageSchema>;

/** Columns of GET .../audit.csv, in order. */
export const AUDIT_CSV_COLUMNS = [
  'id',
  'at',
  'kind',
  'action',
  'actor',
  'words',
  'link_kind',
  'link_id',
] as const;

interface RawEvent {
  action: string;
  actorEmail: string | null;
  subjectType: string;
  subjectId: string | null;
  detail: Record<string, unknown>;
}

const str = (v: unknown): string | undefined => (typeof v === 'string' && v !== '' ? v : undefined);
const short = (id: string | null | undefined) => (id ? id.slice(0, 8) : '?');

/** The link target of an event, or null when it is about nothing with a page. */
export function auditLinkOf(e: RawEvent): AuditLink | null {
  const d = e.detail;
  if (!e.subjectId) return null;
  switch (e.subjectType) {
    case 'cue_run':
      return { kind: 'run', id: e.subjectId };
    case 'release':
      return { kind: 'release', id: e.subjectId };
    case 'track':
      return { kind: 'track', id: e.subjectId };
    case 'take':
      return str(d.trackId) ? { kind: 'track', id: str(d.trackId)! } : null;
    case 'venue':
      return { kind: 'venue', id: e.subjectId };
    case 'user':
      return { kind: 'member', id: e.subjectId };
    case 'profile':
    case 'profile_version':
      return { kind: 'profile', id: str(d.profileId) ?? e.subjectId };
    case 'invitation':
      return { kind: 'invitation', id: e.subjectId };
    default:
      return null;
  }
}

/**
 * A change of the profile versions a venue uses, in words: which kind, from what to what (names as
 * they were at the time; older events without names give the version's short id), and the reason.
 */
function venueProfileWords(who: string, e: RawEvent): string {
  const d = e.detail;
  const venue = str(d.venueName) ?? `venue ${short(e.subjectId)}`;
  const named = (label: unknown, id: unknown) =>
    str(label) ?? (str(id) ? `version ${short(str(id))}` : 'none');
  const parts: string[] = [];
  for (const kind of ['cueing', 'budget'] as const) {
    if (!(`${kind}VersionId` in d)) continue;
    parts.push(
      `the ${kind} profile from ${named(d[`${kind}LabelBefore`], d[`${kind}VersionBefore`])} to ${named(d[`${kind}Label`], d[`${kind}VersionId`])}`,
    );
  }
  const what = parts.length > 0 ? parts.join(' and ') : 'the profiles';
  const reason = str(d.reason) ? `. Reason: ${str(d.reason)}` : '';
  return `${who} changed ${what} at ${venue}${reason}`;
}

/** An event in plain words (who did what to which thing), for the audit page and the CSV. */
export function auditWords(e: RawEvent): string {
  const who = e.actorEmail ?? 'Legwork';
  const d = e.detail;
  const venue = str(d.venueName) ? ` for ${str(d.venueName)}` : '';
  const track = str(d.trackTitle) ? ` of ${str(d.trackTitle)}` : '';
  const run = `run ${short(e.subjectId)}${track}${venue}`;
  const release = `release ${short(e.subjectId)}${track}${venue}`;
  const reason = str(d.reason) ? `: "${str(d.reason)}"` : '';
  switch (e.action) {
    case 'take.uploaded':
      return `${who} uploaded take ${str(d.fileName) ?? short(e.subjectId)}${str(d.kind) ? ` (${str(d.kind)} track)` : ''}`;
    case 'track.created':
      return `${who} created the track ${str(d.title) ?? short(e.subjectId)}`;
    case 'run.queued':
      return `${who} asked for ${run}`;
    case 'run.awaiting_review':
      return `${run} finished within its budget and awaits review`;
    case 'run.held_by_budget':
      return `${run} finished over its budget and is held (${String(d.findings ?? '?')} finding(s))`;
    case 'run.failed':
      return `${run} failed${reason}`;
    case 'run.stalled':
      return `The worker cueing ${run} stopped answering (no heartbeat for ${String(d.silent_s ?? '?')} s); it was queued again`;
    case 'run.requeued':
      return `${who} asked again for ${run}${reason}`;
    case 'review.cleared':
      return `${who} cleared ${run}${reason}`;
    case 'review.held':
      return `${who} held ${run}${reason}`;
    case 'release.created':
      return `${who} released run ${short(str(d.runId))}${track}${venue} (release ${short(e.subjectId)})`;
    case 'release.ready':
      return `The package of ${release} was built (SHA-256 ${str(d.sha256)?.slice(0, 12) ?? '?'}...)`;
    case 'release.failed':
      return `The package of ${release} could not be built${reason}`;
    case 'release.superseded':
      return `${release} was superseded by release ${short(str(d.supersededBy))}`;
    case 'release.withdrawn':
      return `${who} withdrew ${release}${reason}`;
    case 'release.downloaded':
      return `${who} downloaded the package of ${release}`;
    case 'release.acknowledged':
      return `${who} acknowledged ${release} as installed${str(d.note) ? `: "${str(d.note)}"` : ''}`;
    case 'release.problem_reported':
      return `${who} reported a problem with ${release}: "${str(d.text) ?? ''}"`;
    case 'member.roles_changed':
      return `${who} changed the roles of ${str(d.email) ?? short(e.subjectId)}`;
    case 'member.removed':
      return `${who} removed ${str(d.email) ?? short(e.subjectId)} from the studio`;
    case 'invitation.sent':
      return `${who} invited ${str(d.email) ?? '?'}`;
    case 'invitation.revoked':
      return `${who} revoked the invitation of ${str(d.email) ?? '?'}`;
    case 'invitation.accepted':
      return `${who} accepted an invitation and joined the studio`;
    case 'venue.created':
      return `${who} added the venue ${str(d.name) ?? short(e.subjectId)}${str(d.kind) ? ` (${str(d.kind)})` : ''}`;
    case 'venue.base_changed':
      return `${who} changed the motion base of ${str(d.venueName) ?? `venue ${short(e.subjectId)}`}`;
    case 'venue.controller_changed':
      return `${who} changed the controller settings of ${str(d.venueName) ?? `venue ${short(e.subjectId)}`}`;
    case 'venue.profiles_changed':
      return venueProfileWords(who, e);
    case 'profile.version_created':
      return `${who} saved ${str(d.name) ?? 'a profile'} v${String(d.version ?? '?')}${str(d.kind) ? ` (${str(d.kind)} profile)` : ''}`;
    case 'take.proxy_video_set':
      return `${who} ${str(d.replaced) ? 'replaced' : 'added'} the proxy video of take ${short(e.subjectId)}`;
    case 'take.proxy_video_removed':
      return `${who} removed the proxy video of take ${short(e.subjectId)}`;
    case 'token.created':
      return `${who} created the API token ${str(d.name) ?? '?'}`;
    case 'token.revoked':
      return `${who} revoked the API token ${str(d.name) ?? '?'}`;
    case 'auth.signed_in':
      return `${who} signed in`;
    case 'auth.signed_out':
      return `${who} signed out`;
    case 'auth.sign_in_refused':
      return `A sign-in as ${who} was refused`;
    default:
      return `${who}: ${e.action.replace(/[._]/g, ' ')} ${e.subjectType.replace(/_/g, ' ')} ${short(e.subjectId)}`.trim();
  }
}
