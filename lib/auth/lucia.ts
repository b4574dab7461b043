import { Lucia, TimeSpan } from 'lucia';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { db } from '@/db/client';
import { sessions, users } from '@/db/schema';
import { env } from '@/lib/env';

const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users);

/** A session lasts 30 days (extended while in use); its cookie expires with it, not ~400 days later. */
export const SESSION_LIFETIME = new TimeSpan(30, 'd');

export const lucia = new Lucia(adapter, {
  sessionExpiresIn: SESSION_LIFETIME,
  sessionCookie: {
    name: 'lagwise_session',
    expires: true,
    // httpOnly is lucia's default; SameSite=Lax and Secure (in production) are stated here.
    attributes: { secure: env.isProduction(), sameSite: 'lax' },
  },
  getUserAttributes: (a) => ({ email: a.email, name: a.name }),
});

declare module 'lucia' {
  interface Register {
    Lucia: typeof lucia;
    DatabaseUserAttributes: { email: string; name: string };
  }
}
