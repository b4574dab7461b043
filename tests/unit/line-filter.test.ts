import { describe, expect, it } from 'vitest';
import { lineFilterSchema } from '@/lib/lines/filter';

const messages = (input: unknown) => {
  const r = lineFilterSchema.safeParse(input);
  return r.success ? [] : r.error.issues.map((i) => i.message);
};

describe('the line table filter', () => {
  it("reads the table's values, an empty field meaning no filter", () => {
    expect(lineFilterSchema.parse({ q: '', area: '', status: '' })).toEqual({});
    expect(lineFilterSchema.parse({ q: 'HW-2', area: 'U20 Boiler house', status: 'overridden' })).toEqual({
      q: 'HW-2',
      area: 'U20 Boiler house',
      status: 'overridden',
    });
    expect(lineFilterSchema.parse({})).toEqual({});
  });
  it("answers bad input with a sentence for the user, not the validator's wording", () => {
    expect(messages({ status: 'everything' })).toEqual(['Choose a status from the list.']);
    expect(messages({ q: 'x'.repeat(101) })).toEqual(['Search with at most 100 characters.']);
    expect(messages({ q: 42, area: ['a'] })).toEqual([
      'The search text must be text.',
      'The area must be text.',
    ]);
  });
});
