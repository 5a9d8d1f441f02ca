import { defineConfig } from 'drizzle-kit';

export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './drizzle',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5481/legwork' },
  // pg-boss keeps its own schema; never let drizzle-kit touch it.
  schemaFilter: ['public'],
});
