// `npm run migrate`: applies pending migrations to DATABASE_URL (for a managed PostgreSQL).
import { parseEnv } from '../env';
import { migrateDb } from './migrate';

const env = parseEnv();
await migrateDb(env.DATABASE_URL);
console.log('migrations applied');
