-- companies.homes_version goes up with every statement that changes a company's homes or sampling
-- plans (what the homes tiles draw). Statement-level triggers with transition tables: an import of
-- 100,000 rows bumps the version once, not 100,000 times.
CREATE FUNCTION bump_homes_version() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE companies SET homes_version = homes_version + 1
  WHERE id IN (SELECT DISTINCT company_id FROM changed_rows);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE FUNCTION bump_homes_version_by_plan() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE companies SET homes_version = homes_version + 1
  WHERE id IN (SELECT DISTINCT p.company_id FROM changed_rows c JOIN sampling_plans p ON p.id = c.plan_id);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER homes_version_insert AFTER INSERT ON homes REFERENCING NEW TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION bump_homes_version();
--> statement-breakpoint
CREATE TRIGGER homes_version_update AFTER UPDATE ON homes REFERENCING NEW TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION bump_homes_version();
--> statement-breakpoint
CREATE TRIGGER homes_version_delete AFTER DELETE ON homes REFERENCING OLD TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION bump_homes_version();
--> statement-breakpoint
CREATE TRIGGER sampling_plans_version_insert AFTER INSERT ON sampling_plans REFERENCING NEW TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION bump_homes_version();
--> statement-breakpoint
CREATE TRIGGER sampling_plans_version_delete AFTER DELETE ON sampling_plans REFERENCING OLD TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION bump_homes_version();
--> statement-breakpoint
CREATE TRIGGER sampling_plan_homes_version_insert AFTER INSERT ON sampling_plan_homes REFERENCING NEW TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION bump_homes_version_by_plan();
