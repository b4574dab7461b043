-- The line table's order and the parsed design basis are kept in each web process
-- (lib/lines/table-read-cache.ts) and dropped when a statement changes the lines, results, picks or
-- design basis of a project: one notification per statement
-- naming the projects it touched (statement-level, from the transition tables: no row locks, no
-- counter row that writers would queue on). NOTIFY is sent at commit, so a listener never hears of
-- a change it cannot yet read.
CREATE FUNCTION line_table_changed() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  ids text;
BEGIN
  IF TG_OP = 'INSERT' THEN
    SELECT string_agg(DISTINCT project_id::text, ',') INTO ids FROM new_rows;
  ELSIF TG_OP = 'DELETE' THEN
    SELECT string_agg(DISTINCT project_id::text, ',') INTO ids FROM old_rows;
  ELSE
    SELECT string_agg(DISTINCT p::text, ',') INTO ids
      FROM (SELECT project_id AS p FROM new_rows UNION SELECT project_id FROM old_rows) AS t;
  END IF;
  IF ids IS NOT NULL THEN
    -- A payload is at most 8000 bytes: past that, "*" (every project's order is dropped).
    PERFORM pg_notify('line_table_changed', CASE WHEN length(ids) > 7900 THEN '*' ELSE ids END);
  END IF;
  RETURN NULL;
END
$$;
--> statement-breakpoint
CREATE TRIGGER lines_table_ins AFTER INSERT ON lines REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER lines_table_upd AFTER UPDATE ON lines REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER lines_table_del AFTER DELETE ON lines REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER line_results_table_ins AFTER INSERT ON line_results REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER line_results_table_upd AFTER UPDATE ON line_results REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER line_results_table_del AFTER DELETE ON line_results REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER line_designs_table_ins AFTER INSERT ON line_designs REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER line_designs_table_upd AFTER UPDATE ON line_designs REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER line_designs_table_del AFTER DELETE ON line_designs REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER design_bases_table_ins AFTER INSERT ON design_bases REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER design_bases_table_upd AFTER UPDATE ON design_bases REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();--> statement-breakpoint
CREATE TRIGGER design_bases_table_del AFTER DELETE ON design_bases REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION line_table_changed();
--> statement-breakpoint
CREATE FUNCTION line_table_truncated() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('line_table_changed', '*');
  RETURN NULL;
END
$$;
--> statement-breakpoint
CREATE TRIGGER lines_table_trunc AFTER TRUNCATE ON lines FOR EACH STATEMENT EXECUTE FUNCTION line_table_truncated();--> statement-breakpoint
CREATE TRIGGER line_results_table_trunc AFTER TRUNCATE ON line_results FOR EACH STATEMENT EXECUTE FUNCTION line_table_truncated();--> statement-breakpoint
CREATE TRIGGER line_designs_table_trunc AFTER TRUNCATE ON line_designs FOR EACH STATEMENT EXECUTE FUNCTION line_table_truncated();--> statement-breakpoint
CREATE TRIGGER design_bases_table_trunc AFTER TRUNCATE ON design_bases FOR EACH STATEMENT EXECUTE FUNCTION line_table_truncated();
