/**
 * The line table's view as a person leaves it — which columns are hidden and the row density — kept per
 * user on the server (`user_preferences.line_table`), so it follows them to another browser. Pure: the
 * table (client), the page (server) and the action share it.
 */
import { z } from 'zod';

/** Every column of the line table in its order, with the name the column menu shows. */
export const LINE_TABLE_COLUMNS = [
  { id: 'tag', label: 'Tag' },
  { id: 'service', label: 'Service' },
  { id: 'area', label: 'Area' },
  { id: 'outsideDiameterMm', label: 'Size' },
  { id: 'normalTempC', label: 'Normal temperature' },
  { id: 'recommendedMm', label: 'Recommended thickness' },
  { id: 'governing', label: 'Governing criterion' },
  { id: 'surfaceTempC', label: 'Surface temperature' },
  { id: 'heatLossLinear', label: 'Heat loss per length' },
  { id: 'heatLossAreal', label: 'Heat loss per area' },
  { id: 'margin', label: 'Worst margin' },
  { id: 'status', label: 'Status' },
  { id: 'pick', label: 'Chosen thickness' },
] as const;
export type LineTableColumnId = (typeof LINE_TABLE_COLUMNS)[number]['id'];

/** What a row is and what is decided on it: never hidden. */
export const KEY_COLUMNS: readonly LineTableColumnId[] = ['tag', 'status', 'pick'];
export const HIDEABLE_COLUMNS = LINE_TABLE_COLUMNS.filter((c) => !KEY_COLUMNS.includes(c.id));

export const DENSITIES = ['compact', 'comfortable'] as const;
export type Density = (typeof DENSITIES)[number];

export interface LineTableView {
  hiddenColumns: LineTableColumnId[];
  density: Density;
}
export const DEFAULT_LINE_TABLE_VIEW: LineTableView = { hiddenColumns: [], density: 'compact' };

const label = (id: string) => LINE_TABLE_COLUMNS.find((c) => c.id === id)?.label ?? id;
const isColumn = (id: string): id is LineTableColumnId => LINE_TABLE_COLUMNS.some((c) => c.id === id);

/** What a save sends: checked strictly, each refusal a sentence naming the column or the setting. */
export const lineTableViewSchema = z
  .object({
    hiddenColumns: z
      .array(z.string().max(40), { error: 'The hidden columns must be a list.' })
      .max(LINE_TABLE_COLUMNS.length, { error: 'Too many hidden columns.' }),
    density: z.enum(DENSITIES, { error: 'Row density is either compact or comfortable.' }),
  })
  .superRefine((v, ctx) => {
    for (const id of v.hiddenColumns) {
      if (!isColumn(id))
        ctx.addIssue({
          code: 'custom',
          path: ['hiddenColumns'],
          message: `"${id}" is not a column of the line table.`,
        });
      else if (KEY_COLUMNS.includes(id))
        ctx.addIssue({
          code: 'custom',
          path: ['hiddenColumns'],
          message: `The ${label(id)} column cannot be hidden: tag, status and chosen thickness stay in view.`,
        });
    }
  })
  .transform(
    (v): LineTableView => ({
      hiddenColumns: [...new Set(v.hiddenColumns)].filter(isColumn),
      density: v.density,
    }),
  );

/**
 * A stored view read back tolerantly: a column that no longer exists, or has become a key column, is
 * dropped rather than refused, so a renamed column never breaks the table.
 */
export function readLineTableView(stored: unknown): LineTableView {
  if (!stored || typeof stored !== 'object') return DEFAULT_LINE_TABLE_VIEW;
  const s = stored as Partial<Record<keyof LineTableView, unknown>>;
  const hidden = Array.isArray(s.hiddenColumns) ? s.hiddenColumns : [];
  return {
    hiddenColumns: [
      ...new Set(
        hidden.filter(
          (id): id is LineTableColumnId =>
            typeof id === 'string' && isColumn(id) && !KEY_COLUMNS.includes(id),
        ),
      ),
    ],
    density: s.density === 'comfortable' ? 'comfortable' : 'compact',
  };
}
