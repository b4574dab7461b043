/** Query strings of the document downloads, read into sentences that name the field (never raw validation text). */
import { z } from 'zod';
import { AppError } from '@/lib/errors';
import { lineFilterSchema, type LineFilter } from '@/lib/lines/filter';

const exportSchema = lineFilterSchema.extend({
  format: z.enum(['xlsx', 'csv'], { error: 'Format: choose xlsx or csv.' }).default('xlsx'),
  scope: z
    .enum(['filtered', 'all'], { error: 'Scope: choose the filtered lines or all lines.' })
    .default('filtered'),
});

function parse<S extends z.ZodType>(schema: S, params: URLSearchParams): z.infer<S> {
  const r = schema.safeParse(Object.fromEntries(params));
  if (!r.success) {
    const fields: Record<string, string[]> = {};
    for (const i of r.error.issues) (fields[i.path.join('.') || 'query'] ??= []).push(i.message);
    throw new AppError('invalid', [...new Set(r.error.issues.map((i) => i.message))].join(' '), fields);
  }
  return r.data;
}

export function readExportQuery(params: URLSearchParams): {
  format: 'xlsx' | 'csv';
  filter: LineFilter | null;
} {
  const q = parse(exportSchema, params);
  return { format: q.format, filter: q.scope === 'all' ? null : { q: q.q, area: q.area, status: q.status } };
}

export function readFilterQuery(params: URLSearchParams): LineFilter {
  const q = parse(lineFilterSchema, params);
  return { q: q.q, area: q.area, status: q.status };
}

/** Attachment headers with a file name reduced to safe characters by the caller. */
export function download(body: Buffer | Uint8Array, fileName: string, type: string) {
  return new Response(new Uint8Array(body), {
    headers: {
      'content-type': type,
      'content-disposition': `attachment; filename="${fileName}"`,
      'cache-control': 'private, no-store',
    },
  });
}
