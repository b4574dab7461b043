import { sql } from 'drizzle-orm';
import { db } from '@/db/client';

export const dynamic = 'force-dynamic';

/** Readiness: the app answers and PostgreSQL does. */
export async function GET() {
  try {
    await db.execute(sql`select 1`);
    return Response.json({ status: 'ok' });
  } catch {
    return Response.json({ status: 'database unavailable' }, { status: 503 });
  }
}
