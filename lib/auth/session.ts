import 'server-only';
import { cache } from 'react';
import { cookies, headers } from 'next/headers';
import { redirect } from 'next/navigation';
import type { Session, User } from 'lucia';
import { lucia } from './lucia';
import { clientAddressFrom } from '@/lib/server/client-address';

/** The request's session, validated once per request; refreshes or clears the cookie when it can. */
export const validateRequest = cache(
  async (): Promise<{ user: User; session: Session } | { user: null; session: null }> => {
    const jar = await cookies();
    const sessionId = jar.get(lucia.sessionCookieName)?.value ?? null;
    if (!sessionId) return { user: null, session: null };
    const result = await lucia.validateSession(sessionId);
    // Server components cannot set cookies; actions and route handlers can.
    try {
      if (result.session?.fresh) {
        const c = lucia.createSessionCookie(result.session.id);
        jar.set(c.name, c.value, c.attributes);
      }
      if (!result.session) {
        const c = lucia.createBlankSessionCookie();
        jar.set(c.name, c.value, c.attributes);
      }
    } catch {
      /* rendering a server component */
    }
    return result;
  },
);

export async function requireUser(): Promise<{ user: User; session: Session }> {
  const r = await validateRequest();
  if (!r.user) redirect('/sign-in');
  return r;
}

/**
 * Puts a new session in this browser's cookie. The session the browser held before (another
 * sign-in, possibly someone else's account) ends at once: sign-in always rotates the session.
 */
export async function setSessionCookie(sessionId: string) {
  const jar = await cookies();
  const previous = jar.get(lucia.sessionCookieName)?.value;
  if (previous && previous !== sessionId) await lucia.invalidateSession(previous);
  const c = lucia.createSessionCookie(sessionId);
  jar.set(c.name, c.value, c.attributes);
}

export async function clearSessionCookie() {
  const c = lucia.createBlankSessionCookie();
  (await cookies()).set(c.name, c.value, c.attributes);
}

/** The client address as far as it can be trusted (lib/server/client-address.ts; TRUST_PROXY). */
export async function clientIp(): Promise<string> {
  return clientAddressFrom(await headers());
}
