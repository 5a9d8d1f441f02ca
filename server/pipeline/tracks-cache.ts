// Serialised answers of the tracks table, kept in this process per studio, per query and per the
// studio's data version (studioDataVersions in server/db/schema.ts). Triggers raise the version in
// the same transaction as every change the table shows, whichever process makes it, and each request
// reads the version afresh with its membership: an answer is served only while the version it was
// made under is still the current one, so the next read after any committed write is made anew.
import { createHash } from 'node:crypto';

export interface CachedAnswer {
  /** The JSON text, encoded once (a kept answer is sent as these bytes, not encoded again). */
  body: Buffer;
  etag: string;
}

interface Entry extends CachedAnswer {
  version: number;
}

/** At most `maxEntries` answers (least recently used go first). */
export class VersionedAnswers {
  private readonly entries = new Map<string, Entry>();
  constructor(private readonly maxEntries = 500) {}

  private static key(studioId: string, query: string): string {
    return `${studioId}\n${query}`;
  }

  /** The answer made for this studio and query under `version`, if that is the one kept. */
  get(studioId: string, version: number, query: string): CachedAnswer | undefined {
    const k = VersionedAnswers.key(studioId, query);
    const e = this.entries.get(k);
    if (!e) return undefined;
    if (e.version !== version) {
      // Only ever newer versions come (the counter only rises): this answer is of no more use.
      if (e.version < version) this.entries.delete(k);
      return undefined;
    }
    this.entries.delete(k);
    this.entries.set(k, e);
    return e;
  }

  /** Keeps `json` as the answer to this query under `version` (read before the answer was made). */
  set(studioId: string, version: number, query: string, json: string): CachedAnswer {
    const k = VersionedAnswers.key(studioId, query);
    const body = Buffer.from(json, 'utf8');
    const etag = `W/"${createHash('sha1').update(body).digest('base64url')}"`;
    const held = this.entries.get(k);
    // A slower request that read an older version must not replace a newer answer.
    if (held && held.version > version) return { body, etag };
    this.entries.delete(k);
    this.entries.set(k, { version, body, etag });
    while (this.entries.size > this.maxEntries) {
      const oldest = this.entries.keys().next().value as string;
      this.entries.delete(oldest);
    }
    return { body, etag };
  }

  get size(): number {
    return this.entries.size;
  }
}
