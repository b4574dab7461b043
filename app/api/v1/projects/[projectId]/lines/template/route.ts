import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { TEMPLATE_EXAMPLE_ROWS, lineListWorkbook } from '@/lib/lines/template';

/** A line-list template: our headers, example rows, and a sheet of instructions. */
export const GET = route<{ projectId: string }>(async ({ user, params }) => {
  await getProjectAccess({ userId: user.id, projectId: params.projectId, action: 'lines.read' });
  const buf = await lineListWorkbook(TEMPLATE_EXAMPLE_ROWS, { withInstructions: true });
  return new Response(new Uint8Array(buf), {
    headers: {
      'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      'content-disposition': 'attachment; filename="lagwise-line-list-template.xlsx"',
    },
  });
});
