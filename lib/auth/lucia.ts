import { Lucia } from 'lucia';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { db } from '@/db/client';
import { sessions, users } from '@/db/schema';
import { env } from '@/lib/env';

const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users);

export const lucia = new Lucia(adapter, {
  sessionCookie: {
    name: 'lagwise_session',
    expires: false,
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
