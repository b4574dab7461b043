import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { resultsExport } from '@/lib/documents/results-export';
import { download, readExportQuery } from '@/lib/documents/requests';

/** Results export (.xlsx or .csv): exactly the lines the table's filter shows, or all of them (`scope=all`). */
export const GET = route<{ projectId: string }>(async ({ req, user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  const { format, filter } = readExportQuery(req.nextUrl.searchParams);
  const r = await resultsExport({ projectId: project.id, filter, format });
  return download(r.body, r.fileName, r.type);
});
