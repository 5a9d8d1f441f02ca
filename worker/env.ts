// The worker reads the same variables as the server (database, storage, mail).
export { parseEnv, publicUrl } from '../server/env';
export type { Env } from '../server/env';
