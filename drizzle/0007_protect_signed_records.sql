-- Signed and issued records are kept as they were signed or issued, whatever the application does:
-- a signed-off review round and its items cannot be changed or removed, and an issued bill of
-- quantities cannot be changed or removed. (The application's database role also lacks UPDATE and
-- DELETE on audit_log and boq_issues; see db/migrate.ts.)
CREATE FUNCTION review_round_is_kept() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF OLD.status = 'signed-off' THEN
    RAISE EXCEPTION 'review round % is signed off and cannot be changed', OLD.number USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER review_rounds_signed_off_kept BEFORE UPDATE OR DELETE ON review_rounds FOR EACH ROW EXECUTE FUNCTION review_round_is_kept();
--> statement-breakpoint
CREATE FUNCTION review_item_is_kept() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF EXISTS (SELECT 1 FROM review_rounds r WHERE r.id = OLD.round_id AND r.status = 'signed-off') THEN
    -- A line leaving the list in a later revision only loses its link (ON DELETE SET NULL); the item keeps its tag.
    IF TG_OP = 'UPDATE' AND NEW.line_id IS NULL AND (to_jsonb(NEW) - 'line_id') = (to_jsonb(OLD) - 'line_id') THEN
      RETURN NEW;
    END IF;
    RAISE EXCEPTION 'review items of a signed-off round cannot be changed' USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER review_items_signed_off_kept BEFORE UPDATE OR DELETE ON review_items FOR EACH ROW EXECUTE FUNCTION review_item_is_kept();
--> statement-breakpoint
CREATE FUNCTION boq_issue_is_kept() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'an issued bill of quantities cannot be changed or removed' USING ERRCODE = 'insufficient_privilege';
END $$;
--> statement-breakpoint
CREATE TRIGGER boq_issues_kept BEFORE UPDATE OR DELETE ON boq_issues FOR EACH ROW EXECUTE FUNCTION boq_issue_is_kept();
--> statement-breakpoint
CREATE TRIGGER boq_issues_no_truncate BEFORE TRUNCATE ON boq_issues FOR EACH STATEMENT EXECUTE FUNCTION boq_issue_is_kept();
