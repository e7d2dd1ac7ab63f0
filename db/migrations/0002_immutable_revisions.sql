-- Plan versions and arm revisions are never edited, only superseded: refuse UPDATE at the database,
-- whoever issues it. (DELETE stays possible, so deleting a plan or an arm still cascades.)
CREATE FUNCTION jp_refuse_update() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% rows are immutable; add a new one instead', TG_TABLE_NAME USING ERRCODE = 'restrict_violation';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER plan_versions_immutable BEFORE UPDATE ON plan_versions FOR EACH ROW EXECUTE FUNCTION jp_refuse_update();
--> statement-breakpoint
CREATE TRIGGER arm_revisions_immutable BEFORE UPDATE ON arm_revisions FOR EACH ROW EXECUTE FUNCTION jp_refuse_update();
