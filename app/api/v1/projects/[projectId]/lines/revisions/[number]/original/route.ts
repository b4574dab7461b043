import { projectAccess, route } from '@/lib/server/route';
import { revisionOriginal } from '@/lib/lines/import-store';
import { safeFileName } from '@/lib/storage/documents';
import { AppError } from '@/lib/errors';

/** The file a line-list revision was imported from, byte for byte as uploaded. */
export const GET = route<{ projectId: string; number: string }>(
  async (ctx) => {
    const { project } = await projectAccess(ctx, ctx.params.projectId, 'lines.read');
    // Strictly digits: Number() would read "0x1", "1e0" or " 1" as 1.
    const n = /^[1-9][0-9]{0,8}$/.test(ctx.params.number) ? Number(ctx.params.number) : NaN;
    if (!Number.isInteger(n)) throw new AppError('not_found', 'No such line-list revision.');
    const { buf, fileName, contentType } = await revisionOriginal({ projectId: project.id, number: n });
    ctx.note({ revision: n, bytes: buf.byteLength });
    const ascii = safeFileName(fileName);
    return new Response(new Uint8Array(buf), {
      headers: {
        'content-type': contentType,
        'content-disposition': `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName.replace(/^.*[\\/]/, ''))}`,
      },
    });
  },
  { scope: 'lines:read' },
);
