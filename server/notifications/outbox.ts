// Queuing mail: rows in mail_outbox, written with the caller's handle (a transaction, so the mail
// exists exactly when the change it tells about is committed). Nothing here talks to SMTP: the worker
// sends the rows (./sender.ts), so a request never waits on, or fails because of, the mail server.
import { and, eq, inArray } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { mailOptOuts, mailOutbox, memberships, users } from '../db/schema';
import { inStudio } from '../db/scope';
import { ROLE } from '../../shared/schemas/roles';
import type { Role } from '../../shared/schemas/roles';
import type { MailKind } from '../../shared/schemas/notifications';

export interface QueuedMail {
  studioId: string;
  kind: MailKind;
  /** Who receives it; duplicates and users who turned this kind off are skipped. */
  userIds: string[];
  subject: string;
  /** Plain text; the sender ends it with the full link to `path`. */
  text: string;
  /** The app page the mail is about (shared/app-paths.ts), e.g. /s/<studio>/releases/<release>. */
  path: string;
}

/**
 * Queues one row per recipient address (users who opted out of `kind` are skipped) and answers how
 * many rows were queued. The link (PUBLIC_URL + path) is appended when the mail is sent.
 */
export async function queueMail(db: Db | Tx, mail: QueuedMail): Promise<number> {
  const ids = [...new Set(mail.userIds)];
  if (ids.length === 0) return 0;
  const people = await db
    .select({ id: users.id, email: users.email })
    .from(users)
    .where(inArray(users.id, ids));
  const optedOut = new Set(
    (
      await db
        .select({ userId: mailOptOuts.userId })
        .from(mailOptOuts)
        .where(and(eq(mailOptOuts.kind, mail.kind), inArray(mailOptOuts.userId, ids)))
    ).map((r) => r.userId),
  );
  // One row per address: two accounts never share one, but compare as mail servers do (case aside).
  const byAddress = new Map<string, string>();
  for (const p of people) {
    if (!optedOut.has(p.id) && !byAddress.has(p.email.toLowerCase()))
      byAddress.set(p.email.toLowerCase(), p.email);
  }
  const addresses = [...byAddress.values()];
  if (addresses.length === 0) return 0;
  await db.insert(mailOutbox).values(
    addresses.map((toEmail) => ({
      studioId: mail.studioId,
      kind: mail.kind,
      toEmail,
      subject: mail.subject,
      text: mail.text,
      path: mail.path,
    })),
  );
  return addresses.length;
}

/**
 * The user ids of the studio's members holding any of `roles`. With `venueId`, a member counts as a
 * venue operator only when that venue is assigned to them; their other roles count as usual.
 */
export async function recipientsByRole(
  db: Db | Tx,
  studioId: string,
  roles: Role[],
  opts: { venueId?: string } = {},
): Promise<string[]> {
  if (roles.length === 0) return [];
  const rows = await db
    .select({ userId: memberships.userId, roles: memberships.roles, venueIds: memberships.venueIds })
    .from(memberships)
    .where(inStudio(memberships, studioId));
  const wanted = new Set<string>(roles);
  return rows
    .filter((m) =>
      m.roles.some(
        (r) =>
          wanted.has(r) &&
          (r !== ROLE.venue_operator || opts.venueId === undefined || m.venueIds.includes(opts.venueId)),
      ),
    )
    .map((m) => m.userId)
    .sort();
}
