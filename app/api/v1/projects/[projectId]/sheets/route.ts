import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { SHEETS_INLINE_LIMIT, sheetsBatchPdf } from '@/lib/documents/sheets';
import { download, readFilterQuery } from '@/lib/documents/requests';

/** The calculation sheets of the lines the table's filter shows, in one PDF (small sets only; larger ones run as a job). */
export const GET = route<{ projectId: string }>(async ({ req, user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  const filter = readFilterQuery(req.nextUrl.searchParams);
  const { buf, fileName } = await sheetsBatchPdf({ projectId: project.id, filter, max: SHEETS_INLINE_LIMIT });
  return download(buf, fileName, 'application/pdf');
});
