CREATE FUNCTION natural_sort_key(t text) RETURNS text LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE AS $$
  SELECT coalesce(string_agg(CASE WHEN m.a[1] ~ '^[0-9]' AND length(m.a[1]) <= 12 THEN lpad(m.a[1], 12, '0') ELSE m.a[1] END, '' ORDER BY m.ord), '')
  FROM regexp_matches(upper(t), '([0-9]+|[^0-9]+)', 'g') WITH ORDINALITY AS m(a, ord)
$$;
--> statement-breakpoint
ALTER TABLE "lines" ADD COLUMN "tag_key" text GENERATED ALWAYS AS (natural_sort_key(tag)) STORED;--> statement-breakpoint
CREATE INDEX "lines_project_tag_sort_idx" ON "lines" USING btree ("project_id","tag_key" collate "C");