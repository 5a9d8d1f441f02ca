// Where the app sends a person after signing in, accepting an invitation, or opening `/`.
import type { Me, Membership } from '../../shared/schemas/api';

/** Only same-site paths are followed after sign-in, so a crafted link cannot send someone elsewhere. */
export function safeNextPath(next: string | null): string | null {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return null;
  return next;
}

/** The user's first studio by name, or undefined when they belong to none. */
export function firstStudio(me: Me): Membership | undefined {
  return [...me.memberships].sort((a, b) => a.studioName.localeCompare(b.studioName))[0];
}

/** The page asked for when it is safe, else the first studio's home, else `/`. */
export function landingPath(me: Me, next: string | null): string {
  const safe = safeNextPath(next);
  if (safe) return safe;
  const first = firstStudio(me);
  return first ? `/s/${first.studioId}` : '/';
}
