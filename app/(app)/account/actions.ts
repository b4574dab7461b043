'use server';
import { formSchemas } from '@/lib/forms/schemas';
import { formAction } from '@/lib/server/action';
import { setSessionCookie, validateRequest } from '@/lib/auth/session';
import { AppError } from '@/lib/errors';
import * as auth from '@/lib/auth/service';

/** Own account only: the user comes from the session, never from the form. */
export const changePasswordAction = formAction({
  schema: formSchemas.changePassword,
  handler: async ({ user, input }) => {
    const { session } = await auth.changePassword({ userId: user.id, ...input });
    await setSessionCookie(session.id);
  },
});

export const signOutOtherSessionsAction = formAction({
  schema: formSchemas.empty,
  handler: async ({ user }) => {
    const { session } = await validateRequest();
    if (!session) throw new AppError('unauthenticated', 'Your session has ended. Sign in again.');
    return auth.signOutOtherSessions({ userId: user.id, keepSessionId: session.id });
  },
});
