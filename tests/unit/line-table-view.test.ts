import { describe, expect, it } from 'vitest';
import {
  HIDEABLE_COLUMNS,
  KEY_COLUMNS,
  LINE_TABLE_COLUMNS,
  lineTableViewSchema,
  readLineTableView,
} from '@/lib/preferences/line-table-view';

describe('line-table view (hidden columns, density)', () => {
  it('never lets tag, status or chosen thickness be hidden', () => {
    expect(KEY_COLUMNS).toEqual(['tag', 'status', 'pick']);
    expect(HIDEABLE_COLUMNS.map((c) => c.id)).not.toContain('tag');
    expect(HIDEABLE_COLUMNS).toHaveLength(LINE_TABLE_COLUMNS.length - 3);
    const r = lineTableViewSchema.safeParse({ hiddenColumns: ['service', 'status'], density: 'compact' });
    expect(r.success).toBe(false);
    expect(r.error?.issues.map((i) => i.message)).toEqual([
      'The Status column cannot be hidden: tag, status and chosen thickness stay in view.',
    ]);
  });

  it('names an unknown column and a wrong density in a sentence', () => {
    const col = lineTableViewSchema.safeParse({ hiddenColumns: ['colour'], density: 'compact' });
    expect(col.error?.issues.map((i) => i.message)).toEqual(['"colour" is not a column of the line table.']);
    const dens = lineTableViewSchema.safeParse({ hiddenColumns: [], density: 'airy' });
    expect(dens.error?.issues.map((i) => i.message)).toEqual([
      'Row density is either compact or comfortable.',
    ]);
  });

  it('keeps a good view, each column once', () => {
    expect(
      lineTableViewSchema.parse({ hiddenColumns: ['service', 'margin', 'service'], density: 'comfortable' }),
    ).toEqual({ hiddenColumns: ['service', 'margin'], density: 'comfortable' });
  });

  it('reads a stored view tolerantly: gone or key columns dropped, defaults for nothing stored', () => {
    expect(readLineTableView(null)).toEqual({ hiddenColumns: [], density: 'compact' });
    expect(
      readLineTableView({ hiddenColumns: ['area', 'oldColumn', 'tag', 7], density: 'comfortable' }),
    ).toEqual({ hiddenColumns: ['area'], density: 'comfortable' });
    expect(readLineTableView({ density: 'huge' })).toEqual({ hiddenColumns: [], density: 'compact' });
  });
});
