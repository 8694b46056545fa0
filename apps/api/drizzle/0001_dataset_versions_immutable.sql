-- Dataset versions and their rows are immutable: a change is a new version.
CREATE FUNCTION tributary_refuse_update() RETURNS trigger AS $$
BEGIN
  RAISE EXCEPTION 'rows of % are immutable', TG_TABLE_NAME USING ERRCODE = 'restrict_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER dataset_versions_immutable BEFORE UPDATE ON "dataset_versions"
  FOR EACH ROW EXECUTE FUNCTION tributary_refuse_update();
--> statement-breakpoint
CREATE TRIGGER dataset_rows_immutable BEFORE UPDATE ON "dataset_rows"
  FOR EACH ROW EXECUTE FUNCTION tributary_refuse_update();
