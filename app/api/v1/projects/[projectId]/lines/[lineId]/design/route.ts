import { z } from 'zod';
import { projectAccess, readJson, route } from '@/lib/server/route';
import { pickDesign } from '@/lib/lines/picks-store';

const bodySchema = z.object(
  {
    thicknessMm: z
      .number({ error: 'thicknessMm must be a number' })
      .min(0, { error: 'thicknessMm must be 0 or more' })
      .max(2000, { error: 'thicknessMm must be at most 2000' }),
    reason: z
      .string({ error: 'reason must be text' })
      .max(500, { error: 'reason may have at most 500 characters' })
      .optional(),
    expectedVersion: z
      .number({ error: 'expectedVersion must be the design version you read (0 when the line has none)' })
      .int({ error: 'expectedVersion must be a whole number' })
      .min(0, { error: 'expectedVersion must be 0 or more' }),
  },
  { error: 'send an object { thicknessMm, expectedVersion, reason? }' },
);

/**
 * Chooses a line's thickness (the same rules as the line page: a candidate of the line's system, a
 * reason for a manual pick or one below a hard criterion, `expectedVersion` guarding against
 * overwriting someone else's newer choice). Browser session or an API token with `lines:write`.
 */
export const POST = route<{ projectId: string; lineId: string }>(
  async (ctx) => {
    const { project } = await projectAccess(ctx, ctx.params.projectId, 'design.pick');
    const input = await readJson(ctx.req, bodySchema);
    const r = await pickDesign({
      projectId: project.id,
      lineId: ctx.params.lineId,
      userId: ctx.user.id,
      ...input,
      via: ctx.token ? `API token "${ctx.token.name}"` : undefined,
    });
    ctx.note({ lineId: ctx.params.lineId, thicknessMm: input.thicknessMm });
    return Response.json(r);
  },
  { scope: 'lines:write' },
);
