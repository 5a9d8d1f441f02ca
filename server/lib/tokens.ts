import { createHash, randomBytes } from 'node:crypto';

/** A random URL-safe token for e-mailed links and API tokens. */
export const newToken = (bytes = 32): string => randomBytes(bytes).toString('base64url');
/** Tokens are stored as SHA-256 hashes, so a database leak does not leak working links. */
export const hashToken = (token: string): string => createHash('sha256').update(token).digest('hex');
