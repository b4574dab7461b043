/**
 * Demo seed. `npm run seed` always runs (idempotent: existing demo users and projects are kept);
 * `--if-empty` (used by npm start) does nothing when any user exists.
 */
import { drizzle } from 'drizzle-orm/node-postgres';
import { and, count, eq, sql } from 'drizzle-orm';
import { Pool } from 'pg';
import { generateIdFromEntropySize } from 'lucia';
import * as schema from '../db/schema';
import { env } from '../lib/env';
import { hashPassword } from '../lib/auth/password';
import { DEMO_ORG, DEMO_PROJECT, DEMO_USERS, OTHER_ORG } from './demo-data';

const { users, organizations, memberships, projects } = schema;

async function main() {
  const pool = new Pool({ connectionString: env.databaseUrl(), max: 2 });
  const db = drizzle(pool, { schema });
  try {
    if (process.argv.includes('--if-empty')) {
      const [{ n }] = await db.select({ n: count() }).from(users);
      if (n > 0) { console.error('[seed] database has users; demo seed skipped'); return; }
    }
    await db.transaction(async (tx) => {
      async function ensureOrg(name: string) {
        const [o] = await tx.select().from(organizations).where(eq(organizations.name, name));
        return o ?? (await tx.insert(organizations).values({ name }).returning())[0];
      }
      async function ensureUser(u: { name: string; email: string; password: string }) {
        const [x] = await tx.select().from(users).where(sql`lower(${users.email}) = ${u.email}`);
        if (x) return x;
        return (await tx.insert(users).values({ id: generateIdFromEntropySize(10), email: u.email, name: u.name, passwordHash: await hashPassword(u.password) }).returning())[0];
      }
      async function ensureMember(organizationId: string, userId: string, role: schema.Role) {
        await tx.insert(memberships).values({ organizationId, userId, role }).onConflictDoNothing();
      }
      async function ensureProject(organizationId: string, p: { code: string; name: string; site: string }) {
        const [x] = await tx.select().from(projects).where(and(eq(projects.organizationId, organizationId), eq(projects.code, p.code)));
        return x ?? (await tx.insert(projects).values({ organizationId, ...p }).returning())[0];
      }
      const org = await ensureOrg(DEMO_ORG.name);
      for (const u of DEMO_USERS) await ensureMember(org.id, (await ensureUser(u)).id, u.role);
      await ensureProject(org.id, DEMO_PROJECT);
      const other = await ensureOrg(OTHER_ORG.name);
      await ensureMember(other.id, (await ensureUser(OTHER_ORG.user)).id, 'owner');
      await ensureProject(other.id, OTHER_ORG.project);
    });
    console.error('[seed] demo organization, project and users in place');
  } finally {
    await pool.end();
  }
}

main().catch((e) => { console.error('[seed] failed:', e); process.exit(1); });
