// Database schema. Every tenant-owned table carries studio_id; queries on them go through
// server/db/scope.ts.
import { sql } from 'drizzle-orm';
import {
  bigserial,
  index,
  jsonb,
  json,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
  varchar,
} from 'drizzle-orm/pg-core';

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();

export const users = pgTable(
  'users',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash'),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('users_email_key').on(t.email)],
);
export type User = typeof users.$inferSelect;

export const studios = pgTable(
  'studios',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    name: text('name').notNull(),
    slug: text('slug').notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('studios_slug_key').on(t.slug)],
);
export type Studio = typeof studios.$inferSelect;

export const memberships = pgTable(
  'memberships',
  {
    studioId: uuid('studio_id')
      .notNull()
      .references(() => studios.id, { onDelete: 'cascade' }),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    roles: text('roles').array().notNull(),
    venueIds: uuid('venue_ids').array().notNull().default(sql`'{}'::uuid[]`),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.studioId, t.userId] }), index('memberships_user_idx').on(t.userId)],
);
export type MembershipRow = typeof memberships.$inferSelect;

export const invitations = pgTable(
  'invitations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: uuid('studio_id')
      .notNull()
      .references(() => studios.id, { onDelete: 'cascade' }),
    email: text('email').notNull(),
    roles: text('roles').array().notNull(),
    venueIds: uuid('venue_ids').array().notNull().default(sql`'{}'::uuid[]`),
    tokenHash: text('token_hash').notNull(),
    invitedBy: uuid('invited_by').references(() => users.id, { onDelete: 'set null' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('invitations_token_key').on(t.tokenHash), index('invitations_studio_idx').on(t.studioId)],
);
export type InvitationRow = typeof invitations.$inferSelect;

export const passwordResets = pgTable(
  'password_resets',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    tokenHash: text('token_hash').notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('password_resets_token_key').on(t.tokenHash)],
);

export const venues = pgTable(
  'venues',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: uuid('studio_id')
      .notNull()
      .references(() => studios.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    site: text('site').notNull(),
    timeZone: text('time_zone').notNull(),
    /** The motion base as validated JSON (shared/schemas/motion-base.ts). */
    base: jsonb('base').notNull(),
    createdAt: createdAt(),
  },
  (t) => [index('venues_studio_idx').on(t.studioId)],
);
export type VenueRow = typeof venues.$inferSelect;

/** Append-only: a trigger in the migrations refuses UPDATE and DELETE. */
export const auditEvents = pgTable(
  'audit_events',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    studioId: uuid('studio_id').references(() => studios.id, { onDelete: 'set null' }),
    actorUserId: uuid('actor_user_id'),
    actorEmail: text('actor_email'),
    action: text('action').notNull(),
    subjectType: text('subject_type').notNull(),
    subjectId: text('subject_id'),
    detail: jsonb('detail').notNull().default(sql`'{}'::jsonb`),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('audit_events_studio_idx').on(t.studioId, t.id)],
);

/** express-session rows (connect-pg-simple's layout). */
export const sessions = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  (t) => [index('IDX_session_expire').on(t.expire)],
);
