/**
 * The line table's filter (search text, area, status) as the browser shows it and the server
 * applies it: one schema for the list route and the bulk actions. Pure, so client components import it.
 */
import { z } from 'zod';

export const LINE_STATUSES = ['stale', 'flagged', 'overridden', 'undecided', 'redecide'] as const;
export type LineStatus = (typeof LINE_STATUSES)[number];

export const LINE_STATUS_LABEL: Record<LineStatus, string> = {
  stale: 'Stale',
  flagged: 'Flagged',
  overridden: 'Manual pick',
  undecided: 'Undecided',
  redecide: 'Needs re-decision',
};

/** An empty field means "no filter" (the table sends '' for "All areas" and "Any"). */
const blankToUndefined = (v: unknown) => (v === '' || v === null ? undefined : v);

export const lineFilterSchema = z.object({
  q: z.preprocess(
    blankToUndefined,
    z
      .string({ error: 'The search text must be text.' })
      .max(100, { error: 'Search with at most 100 characters.' })
      .optional(),
  ),
  area: z.preprocess(
    blankToUndefined,
    z
      .string({ error: 'The area must be text.' })
      .max(200, { error: 'Choose an area from the list.' })
      .optional(),
  ),
  status: z.preprocess(
    blankToUndefined,
    z.enum(LINE_STATUSES, { error: 'Choose a status from the list.' }).optional(),
  ),
});
export type LineFilter = z.infer<typeof lineFilterSchema>;
