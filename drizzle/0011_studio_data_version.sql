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
-- Raises the version of every studio whose rows a statement changed, once per statement (transition
-- tables), in the writer's own transaction: whoever sees the new version sees the change. A studio
-- being deleted (its rows going with it) gets no row.
CREATE OR REPLACE FUNCTION legwork_bump_studio_data_version() RETURNS trigger
  LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'INSERT' THEN
    INSERT INTO studio_data_versions AS v (studio_id, version)
      SELECT DISTINCT n.studio_id, 1 FROM new_rows n JOIN studios s ON s.id = n.studio_id ORDER BY 1
      ON CONFLICT (studio_id) DO UPDATE SET version = v.version + 1;
  ELSIF TG_OP = 'DELETE' THEN
    INSERT INTO studio_data_versions AS v (studio_id, version)
      SELECT DISTINCT o.studio_id, 1 FROM old_rows o JOIN studios s ON s.id = o.studio_id ORDER BY 1
      ON CONFLICT (studio_id) DO UPDATE SET version = v.version + 1;
  ELSE
    INSERT INTO studio_data_versions AS v (studio_id, version)
      SELECT c.studio_id, 1 FROM (
        SELECT n.studio_id FROM new_rows n UNION SELECT o.studio_id FROM old_rows o
      ) c JOIN studios s ON s.id = c.studio_id ORDER BY 1
      ON CONFLICT (studio_id) DO UPDATE SET version = v.version + 1;
  END IF;
  RETURN NULL;
END
$$;
--> statement-breakpoint
-- Runs change often in ways the tracks table does not show (progress, heartbeat, attempts): an update
-- counts only when a run's state, summary, venue, track or creation time changed.
CREATE OR REPLACE FUNCTION legwork_bump_studio_data_version_runs() RETURNS trigger
  LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO studio_data_versions AS v (studio_id, version)
    SELECT c.studio_id, 1 FROM (
      SELECT n.studio_id FROM new_rows n JOIN old_rows o ON o.id = n.id
      WHERE (n.studio_id, n.track_id, n.venue_id, n.state, n.created_at)
              IS DISTINCT FROM (o.studio_id, o.track_id, o.venue_id, o.state, o.created_at)
         OR n.summary IS DISTINCT FROM o.summary
      UNION
      SELECT o.studio_id FROM new_rows n JOIN old_rows o ON o.id = n.id
      WHERE n.studio_id IS DISTINCT FROM o.studio_id
    ) c JOIN studios s ON s.id = c.studio_id ORDER BY 1
    ON CONFLICT (studio_id) DO UPDATE SET version = v.version + 1;
  RETURN NULL;
END
$$;
--> statement-breakpoint
DO $$
DECLARE
  t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['tracks', 'takes', 'venues', 'cue_runs'] LOOP
    EXECUTE format(
      'CREATE TRIGGER studio_data_version_ins AFTER INSERT ON %I REFERENCING NEW TABLE AS new_rows'
      ' FOR EACH STATEMENT EXECUTE FUNCTION legwork_bump_studio_data_version()', t);
    EXECUTE format(
      'CREATE TRIGGER studio_data_version_del AFTER DELETE ON %I REFERENCING OLD TABLE AS old_rows'
      ' FOR EACH STATEMENT EXECUTE FUNCTION legwork_bump_studio_data_version()', t);
    EXECUTE format(
      'CREATE TRIGGER studio_data_version_upd AFTER UPDATE ON %I'
      ' REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION %I()',
      t,
      CASE WHEN t = 'cue_runs' THEN 'legwork_bump_studio_data_version_runs' ELSE 'legwork_bump_studio_data_version' END);
  END LOOP;
END
$$;
