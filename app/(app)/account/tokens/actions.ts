'use server';
import { z } from 'zod';
import { organizationAction, ownAction } from '@/lib/server/action';
import { createApiToken, MAX_TOKEN_DAYS, revokeApiToken } from '@/lib/auth/api-tokens';
import { TOKEN_SCOPES } from '@/lib/auth/permissions';

const createInput = z.object({
  name: z
    .string({ error: 'Give the token a name.' })
    .trim()
    .min(1, { error: 'Give the token a name.' })
    .max(80, { error: 'A token name may have at most 80 characters.' }),
  scopes: z
    .array(z.enum(TOKEN_SCOPES, { error: 'Choose scopes from the list.' }), {
      error: 'Choose at least one scope.',
    })
    .min(1, { error: 'Choose at least one scope.' }),
  days: z
    .number({ error: 'Choose how long the token lives.' })
    .int({ error: 'Choose how long the token lives.' })
    .min(1, { error: `Choose between 1 and ${MAX_TOKEN_DAYS} days.` })
    .max(MAX_TOKEN_DAYS, { error: `Choose between 1 and ${MAX_TOKEN_DAYS} days.` }),
});

/** Makes a token in the organization; the role there must allow tokens and each scope (lib/auth/api-tokens.ts checks). */
export const createTokenAction = organizationAction(
  'tokens.create',
  createInput,
  async ({ user, organizationId, input }) => {
    const t = await createApiToken({ userId: user.id, organizationId, ...input });
    return {
      token: t.token,
      name: t.name,
      prefix: t.prefix,
      scopes: t.scopes,
      expiresAt: t.expiresAt.toISOString(),
    };
  },
);

/** Revokes one of the person's own tokens (whatever their role now: taking power away is always allowed). */
export const revokeTokenAction = ownAction(
  z.object({ tokenId: z.uuid({ error: 'That token is not known; reload the page.' }) }),
  async ({ user, input }) => revokeApiToken({ userId: user.id, tokenId: input.tokenId }),
);
