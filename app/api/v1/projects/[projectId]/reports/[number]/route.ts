import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { draftReport, getReportPdf } from '@/lib/documents/report-store';
import { download } from '@/lib/documents/requests';
import { can } from '@/lib/auth/permissions';
import { AppError } from '@/lib/errors';

/**
 * An issued design-report revision, byte for byte as issued (`/reports/3`), or a draft print of the
 * report as it stands (`/reports/draft`, for those who read the line list).
 */
export const GET = route<{ projectId: string; number: string }>(async ({ user, params }) => {
  const { project, role } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'report.read',
  });
  if (params.number === 'draft') {
    if (!can(role, 'lines.read'))
      throw new AppError('forbidden', 'Only issued revisions of the design report are open to your role.');
    const { buf, fileName } = await draftReport({ projectId: project.id, userId: user.id });
    return download(buf, fileName, 'application/pdf');
  }
  // Strictly digits: Number() would read "0x1", "1e0" or " 1" as 1.
  const n = /^[1-9][0-9]{0,8}$/.test(params.number) ? Number(params.number) : NaN;
  if (!Number.isInteger(n))
    throw new AppError('not_found', 'Only issued revisions of the design report can be downloaded.');
  const { buf, fileName } = await getReportPdf({ projectId: project.id, number: n });
  return download(buf, fileName, 'application/pdf');
});
