import argon2 from 'argon2';

/** argon2id hash of a password. */
export const hashPassword = (password: string): Promise<string> =>
  argon2.hash(password, { type: argon2.argon2id });

// Verifying against this when the user is unknown keeps the timing of "unknown user" and
// "wrong password" alike.
let dummyHash: Promise<string> | null = null;

/** True when `password` matches `hash`; with no hash, spends the same time and answers false. */
export async function verifyPassword(hash: string | null | undefined, password: string): Promise<boolean> {
  if (!hash) {
    dummyHash ??= hashPassword('not-a-real-password-for-timing');
    await argon2.verify(await dummyHash, password).catch(() => false);
    return false;
  }
  return argon2.verify(hash, password).catch(() => false);
}
