/**
 * Applies the migrations in drizzle/ as the database owner, then grants the application's role
 * exactly what it needs: read and write on the working tables, but only SELECT and INSERT on the
 * append-only records (audit_log, boq_issues, api_token_events) and no ownership anywhere, so the application can
 * neither rewrite history nor disable the triggers that guard it.
 *
 * DATABASE_OWNER_URL: the owner's connection (defaults to DATABASE_URL, for a deployment with one
 * role — then nothing is granted and a warning says the audit trail is not protected from the app).
 */
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { Pool } from 'pg';
import PgBoss from 'pg-boss';
import { env } from '../lib/env';
import { BOSS_SCHEMA, jobExpireSeconds, QUEUES } from '../lib/jobs/queues';

/** Tables the application may only read and append to. */
const APPEND_ONLY_TABLES = ['audit_log', 'boq_issues', 'api_token_events', 'design_reports'] as const;

const ident = (s: string) => `"${s.replace(/"/g, '""')}"`;

function grantStatements(appRole: string): string[] {
  const r = ident(appRole);
  return [
    `GRANT USAGE ON SCHEMA public TO ${r}`,
    `REVOKE ALL ON ALL TABLES IN SCHEMA public FROM ${r}`,
    `GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO ${r}`,
    `GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO ${r}`,
    `REVOKE UPDATE, DELETE, TRUNCATE ON ${APPEND_ONLY_TABLES.join(', ')} FROM ${r}`,
    // pg-boss's schema: the owner creates it and its queues (below); the application sends, fetches,
    // completes and maintains jobs, which is rows only — it creates and alters nothing there.
    `GRANT USAGE ON SCHEMA ${BOSS_SCHEMA} TO ${r}`,
    `GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA ${BOSS_SCHEMA} TO ${r}`,
    `GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA ${BOSS_SCHEMA} TO ${r}`,
    `GRANT EXECUTE ON ALL FUNCTIONS IN SCHEMA ${BOSS_SCHEMA} TO ${r}`,
  ];
}

/** pg-boss's own schema migration and our queues, as the owner (a queue is a table partition). */
async function installQueues(ownerUrl: string) {
  const boss = new PgBoss({
    connectionString: ownerUrl,
    schema: BOSS_SCHEMA,
    max: 1,
    migrate: true,
    supervise: false,
    schedule: false,
  });
  boss.on('error', (e) => console.error('[db] pg-boss:', (e as Error).message));
  await boss.start();
  try {
    for (const [name, o] of Object.entries(QUEUES)) {
      const q = { name, ...o, expireInSeconds: jobExpireSeconds() };
      if (await boss.getQueue(name)) await boss.updateQueue(name, q);
      else await boss.createQueue(name, q);
    }
  } finally {
    await boss.stop({ graceful: false, wait: true });
  }
}

async function main() {
  const ownerUrl = env.databaseOwnerUrl();
  const appRole = decodeURIComponent(new URL(env.databaseUrl()).username);
  const pool = new Pool({ connectionString: ownerUrl, max: 1 });
  try {
    await migrate(drizzle(pool), { migrationsFolder: new URL('../drizzle', import.meta.url).pathname });
    await installQueues(ownerUrl);
    const {
      rows: [{ me }],
    } = await pool.query<{ me: string }>('select current_user as me');
    if (appRole && appRole !== me) {
      for (const s of grantStatements(appRole)) await pool.query(s);
      console.error(`[db] migrations applied as ${me}; ${appRole} granted application rights`);
    } else {
      console.error(
        '[db] migrations applied; warning: the application connects as the owner, so it could alter the audit trail (set DATABASE_OWNER_URL)',
      );
    }
  } finally {
    await pool.end();
  }
}

main().catch((e) => {
  console.error('[db] migration failed:', e?.code ?? '', e?.message);
  process.exit(1);
});
