/**
 * Natural order of tags: runs of digits compare as numbers, so 1", 1-½", 2", 10" (and A-20 before
 * A-100) sort as a person reads them. The same key as the database's `natural_sort_key` (migration
 * 0015, the `lines.tag_key` column): upper case, every run of up to 12 digits zero-padded to 12,
 * compared byte by byte (collation "C").
 */
export function naturalSortKey(tag: string): string {
  return tag.toUpperCase().replace(/[0-9]+/g, (d) => (d.length <= 12 ? d.padStart(12, '0') : d));
}

/** Comparator for natural tag order (code-unit order of the keys, as collation "C" compares UTF-8 bytes for these characters). */
export function compareTags(a: string, b: string): number {
  const ka = naturalSortKey(a),
    kb = naturalSortKey(b);
  return ka < kb ? -1 : ka > kb ? 1 : 0;
}
