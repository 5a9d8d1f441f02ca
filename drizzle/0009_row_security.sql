-- Row-level security on every studio-owned table: a second wall behind the application's own
-- `studio_id = ...` conditions. The application's connections run as the role legwork_app (no
-- BYPASSRLS, not the tables' owner) and say per connection checkout which studio they act for, in
-- the settings legwork.studio_id and legwork.scope:
--   legwork.scope = 'studio'  rows of the studio in legwork.studio_id only;
--   legwork.scope = 'all'     every studio (sign-in, token and invitation lookups, the worker);
--   anything else, or unset  nothing at all: a query that forgets its scope finds no row.
-- The role is cluster-wide; several databases of one cluster share it.
DO $$
BEGIN
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'legwork_app') THEN
    CREATE ROLE legwork_app NOLOGIN NOSUPERUSER NOBYPASSRLS NOCREATEDB NOCREATEROLE;
  END IF;
EXCEPTION
  -- Two databases migrating at once: the other one created it first.
  WHEN duplicate_object OR unique_violation THEN NULL;
END
$$;
--> statement-breakpoint
-- The migrating role (the tables' owner) may act as legwork_app. A superuser may already.
DO $$
BEGIN
  IF NOT (SELECT rolsuper FROM pg_roles WHERE rolname = current_user) THEN
    EXECUTE format('GRANT legwork_app TO %I', current_user);
  END IF;
END
$$;
--> statement-breakpoint
GRANT USAGE ON SCHEMA public TO legwork_app;
--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO legwork_app;
--> statement-breakpoint
GRANT USAGE, SELECT, UPDATE ON ALL SEQUENCES IN SCHEMA public TO legwork_app;
--> statement-breakpoint
-- Tables made later by the same role (later migrations, the job queue's schema and its per-queue
-- tables) are usable by legwork_app too.
ALTER DEFAULT PRIVILEGES GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO legwork_app;
--> statement-breakpoint
ALTER DEFAULT PRIVILEGES GRANT USAGE, SELECT, UPDATE ON SEQUENCES TO legwork_app;
--> statement-breakpoint
ALTER DEFAULT PRIVILEGES GRANT USAGE ON SCHEMAS TO legwork_app;
--> statement-breakpoint
DO $$
BEGIN
  IF EXISTS (SELECT 1 FROM pg_namespace WHERE nspname = 'pgboss') THEN
    GRANT USAGE ON SCHEMA pgboss TO legwork_app;
    GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA pgboss TO legwork_app;
    GRANT USAGE, SELECT, UPDATE ON ALL SEQUENCES IN SCHEMA pgboss TO legwork_app;
  END IF;
END
$$;
--> statement-breakpoint
-- The policies read the settings through scalar subqueries, which PostgreSQL evaluates once per
-- query (an InitPlan) rather than once per row: the per-row test is then one comparison.
CREATE OR REPLACE FUNCTION legwork_scope_studio() RETURNS uuid
  LANGUAGE sql STABLE AS $$
  SELECT CASE WHEN current_setting('legwork.scope', true) = 'studio'
    THEN nullif(current_setting('legwork.studio_id', true), '')::uuid END
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION legwork_scope_all() RETURNS boolean
  LANGUAGE sql STABLE AS $$
  SELECT coalesce(current_setting('legwork.scope', true) = 'all', false)
$$;
--> statement-breakpoint
DO $$
DECLARE
  t text;
BEGIN
  FOREACH t IN ARRAY ARRAY[
    'memberships', 'invitations', 'venues', 'audit_events', 'profiles', 'profile_versions',
    'venue_settings', 'tracks', 'takes', 'cue_runs', 'api_tokens', 'reviews', 'releases',
    'release_downloads', 'release_acknowledgements', 'release_problems', 'mail_outbox'
  ] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format(
      'CREATE POLICY studio_wall ON %I'
      ' USING (studio_id = (SELECT legwork_scope_studio()) OR (SELECT legwork_scope_all()))'
      ' WITH CHECK (studio_id = (SELECT legwork_scope_studio()) OR (SELECT legwork_scope_all()))',
      t
    );
  END LOOP;
END
$$;
--> statement-breakpoint
-- A studio's audit log also shows its members' own sign-ins and sign-outs, which belong to no
-- studio (studio_id null): readable in the scope of a studio the actor belongs to, never writable.
CREATE POLICY members_own_events ON audit_events FOR SELECT USING (
  studio_id IS NULL
  AND (SELECT legwork_scope_studio()) IS NOT NULL
  AND actor_user_id IN (SELECT user_id FROM memberships)
);
