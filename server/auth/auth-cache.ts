// A short-lived memory, in this process, of the session rows and the signed-in users that every
// request reads, so that a burst of requests on one session costs no session or user query. Entries
// live AUTH_CACHE_MS at most. Signing out, a password reset and any change to a session made through
// this process take effect here at once; made through another server process, they take effect here
// within AUTH_CACHE_MS. Memberships and roles are not kept here: they are read on every request.
import type session from 'express-session';

/** How long a remembered session or user is trusted without asking the database again. */
export const AUTH_CACHE_MS = 2000;

const MAX_ENTRIES = 20_000;

interface SessionEntry {
  json: string;
  userId: string | null;
  at: number;
}

export class AuthCache {
  private readonly sessions = new Map<string, SessionEntry>();
  private readonly users = new Map<string, { user: Express.User; at: number }>();
  /** Raised by every forget: a database read begun before it may not be remembered. */
  private generation = 0;

  constructor(
    private readonly ttl_ms = AUTH_CACHE_MS,
    private readonly clock: () => number = Date.now,
  ) {}

  private fresh(at: number): boolean {
    return this.clock() - at < this.ttl_ms;
  }

  private static trim<V>(m: Map<string, V>): void {
    while (m.size > MAX_ENTRIES) m.delete(m.keys().next().value as string);
  }

  /** Forgets one session (signed out, regenerated, changed). */
  forgetSession(sid: string): void {
    this.generation++;
    this.sessions.delete(sid);
  }

  /** Forgets a user and every session of theirs (password reset, signed out everywhere). */
  forgetUser(userId: string): void {
    this.generation++;
    this.users.delete(userId);
    for (const [sid, e] of this.sessions) if (e.userId === userId) this.sessions.delete(sid);
  }

  /** The user row for passport's deserializeUser, from memory or from `load`. */
  async user(id: string, load: () => Promise<Express.User | undefined>): Promise<Express.User | undefined> {
    const held = this.users.get(id);
    if (held && this.fresh(held.at)) return { ...held.user };
    const gen = this.generation;
    const at = this.clock();
    const u = await load();
    if (u && gen === this.generation) {
      this.users.set(id, { user: { ...u }, at });
      AuthCache.trim(this.users);
    }
    return u;
  }

  /**
   * Wraps a session store's get, set and destroy. Each get hands out its own copy (a request may
   * change its session), and a row read while something was forgotten is not kept.
   */
  wrapStore(store: session.Store): void {
    const get = store.get.bind(store);
    const set = store.set.bind(store);
    const destroy = store.destroy.bind(store);
    store.get = (sid, done) => {
      const held = this.sessions.get(sid);
      if (held && this.fresh(held.at)) {
        done(null, JSON.parse(held.json) as session.SessionData);
        return;
      }
      const gen = this.generation;
      const at = this.clock();
      get(sid, (err, sess) => {
        if (!err && sess && gen === this.generation) {
          const userId = (sess as { passport?: { user?: unknown } }).passport?.user;
          this.sessions.set(sid, {
            json: JSON.stringify(sess),
            userId: typeof userId === 'string' ? userId : null,
            at,
          });
          AuthCache.trim(this.sessions);
        }
        done(err, sess);
      });
    };
    store.set = (sid, sess, done) => {
      this.forgetSession(sid);
      set(sid, sess, (err) => {
        // Forgotten again once written: a read that began meanwhile may have seen the old row.
        this.forgetSession(sid);
        done?.(err);
      });
    };
    store.destroy = (sid, done) => {
      this.forgetSession(sid);
      destroy(sid, (err) => {
        this.forgetSession(sid);
        done?.(err);
      });
    };
  }
}
