// Every request under /studios/:id reads the member's roles and venues and the studio's data version
// afresh (never from memory, so a removed member or a changed role applies at once in every process).
// Requests for one studio that arrive together share one query: the look-ups asked for during one
// turn of the event loop, and those asked for while the studio's previous query is still out, go
// together in the next query. That query is sent only after each of its requests arrived, so it sees
// every change committed before any of them: the answer is as fresh as a query of its own would be.
import type pg from 'pg';
import { inStudioScope } from '../db/wall';

export interface MembershipRow {
  roles: string[];
  venueIds: string[];
  /** The studio's data version (0 before its first counted change). */
  dataVersion: number;
}

interface Waiter {
  resolve: (row: MembershipRow | undefined) => void;
  reject: (e: unknown) => void;
}

interface StudioQueue {
  waiting: Map<string, Waiter[]>;
  inFlight: boolean;
  scheduled: boolean;
}

const STATEMENT = {
  name: 'legwork_memberships_and_data_version',
  // The studio condition is explicit besides the row policies' own (the query runs in the studio's
  // scope, server/db/wall.ts).
  text: `SELECT m.user_id, m.roles, m.venue_ids, v.version
    FROM memberships m JOIN studios s ON s.id = m.studio_id
    LEFT JOIN studio_data_versions v ON v.studio_id = m.studio_id
    WHERE m.studio_id = $1 AND m.user_id = ANY($2::uuid[])`,
};

export class MembershipLoader {
  private readonly studios = new Map<string, StudioQueue>();
  constructor(private readonly pool: pg.Pool) {}

  /** The membership of `userId` in `studioId` with the studio's data version, or undefined. */
  load(studioId: string, userId: string): Promise<MembershipRow | undefined> {
    let q = this.studios.get(studioId);
    if (!q) {
      q = { waiting: new Map(), inFlight: false, scheduled: false };
      this.studios.set(studioId, q);
    }
    const queue = q;
    return new Promise((resolve, reject) => {
      const list = queue.waiting.get(userId);
      if (list) list.push({ resolve, reject });
      else queue.waiting.set(userId, [{ resolve, reject }]);
      this.schedule(studioId, queue);
    });
  }

  private schedule(studioId: string, q: StudioQueue): void {
    if (q.inFlight || q.scheduled) return;
    q.scheduled = true;
    setImmediate(() => {
      q.scheduled = false;
      void this.flush(studioId, q);
    });
  }

  private async flush(studioId: string, q: StudioQueue): Promise<void> {
    if (q.inFlight || q.waiting.size === 0) return;
    const batch = q.waiting;
    q.waiting = new Map();
    q.inFlight = true;
    try {
      const found = await inStudioScope(studioId, () =>
        this.pool.query<{ user_id: string; roles: string[]; venue_ids: string[]; version: string | null }>({
          ...STATEMENT,
          values: [studioId, [...batch.keys()]],
        }),
      );
      const byUser = new Map(found.rows.map((r) => [r.user_id, r]));
      for (const [userId, waiters] of batch) {
        const r = byUser.get(userId);
        const row = r
          ? {
              roles: r.roles,
              venueIds: r.venue_ids,
              dataVersion: r.version === null ? 0 : Number(r.version),
            }
          : undefined;
        // Each request gets its own arrays (a handler may change them).
        for (const w of waiters)
          w.resolve(row && { ...row, roles: [...row.roles], venueIds: [...row.venueIds] });
      }
    } catch (e) {
      for (const waiters of batch.values()) for (const w of waiters) w.reject(e);
    } finally {
      q.inFlight = false;
      if (q.waiting.size) this.schedule(studioId, q);
      else this.studios.delete(studioId);
    }
  }
}
