import { afterAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { db, getPool } from '@/db/client';
import { compareTags, naturalSortKey } from '@/lib/lines/natural-sort';

afterAll(async () => {
  await getPool().end();
});

const TAGS = [
  '10"-LS-101',
  '1"-LS-101',
  '1-½"-LS-101',
  '2"-LS-101',
  'a-100',
  'A-20',
  'A-3',
  'P-0007',
  'P-8',
  'V-10B',
  'V-10A',
];
const NATURAL = [
  '1"-LS-101',
  '1-½"-LS-101',
  '2"-LS-101',
  '10"-LS-101',
  'A-3',
  'A-20',
  'a-100',
  'P-0007',
  'P-8',
  'V-10A',
  'V-10B',
];

describe('natural order of tags', () => {
  it('sorts sizes and numbers as a person reads them', () => {
    expect([...TAGS].sort(compareTags)).toEqual(NATURAL);
    expect(naturalSortKey('1-½"')).toBe('000000000001-½"');
  });
  it('the database key (lines.tag_key, natural_sort_key) orders the same way as the TypeScript one', async () => {
    const r = await db.execute<{ tag: string; key: string }>(sql`
      select tag, natural_sort_key(tag) as key from jsonb_array_elements_text(${JSON.stringify(TAGS)}::jsonb) as t(tag) order by natural_sort_key(tag) collate "C"`);
    expect(r.rows.map((x) => x.tag)).toEqual(NATURAL);
    for (const x of r.rows) expect(x.key).toBe(naturalSortKey(x.tag));
  });
});
