import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { demoLineRows, lineListWorkbook } from '@/seed/line-list';

/** A line-list template: our headers, two example rows, and a sheet of instructions. */
export const GET = route<{ projectId: string }>(async ({ user, params }) => {
  await getProjectAccess({ userId: user.id, projectId: params.projectId, action: 'lines.read' });
  const buf = await lineListWorkbook(demoLineRows(2, 7), { withInstructions: true });
  return new Response(new Uint8Array(buf), {
    headers: {
      'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      'content-disposition': 'attachment; filename="lagwise-line-list-template.xlsx"',
    },
  });
});
