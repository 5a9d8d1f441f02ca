CREATE TABLE "studio_data_versions" (
	"studio_id" uuid PRIMARY KEY NOT NULL,
	"version" bigint DEFAULT 0 NOT NULL
);
--> statement-breakpoint
ALTER TABLE "studio_data_versions" ADD CONSTRAINT "studio_data_versions_studio_id_studios_id_fk" FOREIGN KEY ("studio_id") REFERENCES "public"."studios"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE, DELETE ON "studio_data_versions" TO legwork_app;
--> statement-breakpoint
-- Behind the same wall as the other studio-owned tables (0009_row_security.sql).
ALTER TABLE "studio_data_versions" ENABLE ROW LEVEL SECURITY;
--> statement-breakpoint
CREATE POLICY studio_wall ON "studio_data_versions"
  USING (studio_id = (SELECT legwork_scope_studio()) OR (SELECT legwork_scope_all()))
  WITH CHECK (studio_id = (SELECT legwork_scope_studio()) OR (SELECT legwork_scope_all()));
--> statement-breakpoint
-- Raises a studio's version once per transaction that changed its rows, as that transaction commits:
-- whoever sees the new version sees the change. Deferred to the commit (constraint triggers), the
-- counter's row lock is the last lock a writer takes, so two writers cannot deadlock over it; the
-- first change of a transaction per studio counts, the rest of the transaction's changes skip at once
-- (a transaction-local flag). A studio being deleted (its rows going with it) gets no row.
CREATE OR REPLACE FUNCTION legwork_bump_studio(sid uuid) RETURNS void
  LANGUAGE plpgsql AS $$
DECLARE
  flag text := 'legwork.bumped_' || replace(sid::text, '-', '');
BEGIN
  IF sid IS NULL OR current_setting(flag, true) = '1' THEN
    RETURN;
  END IF;
  PERFORM set_config(flag, '1', true);
  INSERT INTO studio_data_versions AS v (studio_id, version)
    SELECT sid, 1 WHERE EXISTS (SELECT 1 FROM studios s WHERE s.id = sid)
    ON CONFLICT (studio_id) DO UPDATE SET version = v.version + 1;
END
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION legwork_bump_studio_data_version() RETURNS trigger
  LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    PERFORM legwork_bump_studio(OLD.studio_id);
  ELSE
    PERFORM legwork_bump_studio(NEW.studio_id);
    IF TG_OP = 'UPDATE' AND OLD.studio_id IS DISTINCT FROM NEW.studio_id THEN
      PERFORM legwork_bump_studio(OLD.studio_id);
    END IF;
  END IF;
  RETURN NULL;
END
$$;
--> statement-breakpoint
DO $$
DECLARE
  t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['tracks', 'takes', 'venues'] LOOP
    EXECUTE format(
      'CREATE CONSTRAINT TRIGGER studio_data_version AFTER INSERT OR UPDATE OR DELETE ON %I'
      ' DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION legwork_bump_studio_data_version()', t);
  END LOOP;
END
$$;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER studio_data_version AFTER INSERT OR DELETE ON cue_runs
  DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION legwork_bump_studio_data_version();
--> statement-breakpoint
-- Runs change often in ways the tracks table does not show (progress, heartbeat, attempts): an update
-- counts only when a run's state, summary, venue, track, studio or creation time changed.
CREATE CONSTRAINT TRIGGER studio_data_version_shown AFTER UPDATE ON cue_runs
  DEFERRABLE INITIALLY DEFERRED FOR EACH ROW
  WHEN (OLD.state IS DISTINCT FROM NEW.state OR OLD.summary IS DISTINCT FROM NEW.summary
    OR OLD.venue_id IS DISTINCT FROM NEW.venue_id OR OLD.track_id IS DISTINCT FROM NEW.track_id
    OR OLD.studio_id IS DISTINCT FROM NEW.studio_id OR OLD.created_at IS DISTINCT FROM NEW.created_at)
  EXECUTE FUNCTION legwork_bump_studio_data_version();
