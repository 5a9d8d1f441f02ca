-- A built package never changes: once its SHA-256 is recorded, the key, hash, size and file list of
-- the release are refused any change. Reviews are kept as written: UPDATE is refused.
CREATE OR REPLACE FUNCTION releases_keep_package() RETURNS trigger AS $$
BEGIN
  IF OLD.package_sha256 IS NOT NULL AND (
       NEW.package_sha256 IS DISTINCT FROM OLD.package_sha256
    OR NEW.package_key IS DISTINCT FROM OLD.package_key
    OR NEW.package_size_bytes IS DISTINCT FROM OLD.package_size_bytes
    OR NEW.files IS DISTINCT FROM OLD.files) THEN
    RAISE EXCEPTION 'the package of release % is immutable once built', OLD.id;
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER releases_package_immutable BEFORE UPDATE ON releases
  FOR EACH ROW EXECUTE FUNCTION releases_keep_package();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION reviews_refuse_update() RETURNS trigger AS $$
BEGIN
  RAISE EXCEPTION 'reviews are kept as written';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER reviews_keep_as_written BEFORE UPDATE ON reviews
  FOR EACH ROW EXECUTE FUNCTION reviews_refuse_update();
