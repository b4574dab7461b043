import { z } from 'zod';
import { projectAccess, readJson, route } from '@/lib/server/route';
import { pickDesign, pickVesselParts } from '@/lib/lines/picks-store';

const thickness = (path: string) =>
  z
    .number({ error: `${path} must be a number` })
    .min(0, { error: `${path} must be 0 or more` })
    .max(2000, { error: `${path} must be at most 2000` });
const shellPart = z.object(
  { thicknessMm: thickness('parts.shell.thicknessMm') },
  { error: 'parts.shell must be an object { thicknessMm }' },
);
const headPart = (path: string) =>
  z.object(
    {
      thicknessMm: thickness(`${path}.thicknessMm`),
      guarded: z.boolean({ error: `${path}.guarded must be true or false` }).optional(),
    },
    { error: `${path} must be an object { thicknessMm, guarded? }` },
  );
const common = {
  reason: z
    .string({ error: 'reason must be text' })
    .max(500, { error: 'reason may have at most 500 characters' })
    .optional(),
  expectedVersion: z
    .number({ error: 'expectedVersion must be the design version you read (0 when the line has none)' })
    .int({ error: 'expectedVersion must be a whole number' })
    .min(0, { error: 'expectedVersion must be 0 or more' }),
};
const bodySchema = z
  .object(
    {
      thicknessMm: thickness('thicknessMm').optional(),
      parts: z
        .object(
          { shell: shellPart, top: headPart('parts.top'), bottom: headPart('parts.bottom') },
          { error: 'parts must be an object { shell, top, bottom }' },
        )
        .optional(),
      ...common,
    },
    {
      error:
        'send an object { thicknessMm, expectedVersion, reason? } or, for a vessel, { parts: { shell, top, bottom }, expectedVersion, reason? }',
    },
  )
  .refine((b) => (b.thicknessMm === undefined) !== (b.parts === undefined), {
    error: 'send either thicknessMm or, for a vessel, parts { shell, top, bottom } (one of them)',
  });

/**
 * Chooses a line's thickness — or, for a vessel, each part's (`parts`: shell, top and bottom head, a
 * head may be `guarded`) — with the same rules as the line page: a candidate of the line's system, a
 * reason for a manual pick or one below a hard criterion, `expectedVersion` guarding against
 * overwriting someone else's newer choice. Browser session or an API token with `lines:write`.
 */
export const POST = route<{ projectId: string; lineId: string }>(
  async (ctx) => {
    const { project } = await projectAccess(ctx, ctx.params.projectId, 'design.pick');
    const input = await readJson(ctx.req, bodySchema);
    const via = ctx.token ? `API token "${ctx.token.name}"` : undefined;
    const base = { projectId: project.id, lineId: ctx.params.lineId, userId: ctx.user.id, via };
    const { thicknessMm, parts, ...rest } = input;
    const r = parts
      ? await pickVesselParts({ ...base, ...rest, parts })
      : await pickDesign({ ...base, ...rest, thicknessMm: thicknessMm! });
    ctx.note({
      lineId: ctx.params.lineId,
      ...(parts
        ? { parts: Object.fromEntries(Object.entries(parts).map(([k, v]) => [k, v.thicknessMm])) }
        : { thicknessMm }),
    });
    return Response.json(r);
  },
  { scope: 'lines:write' },
);
