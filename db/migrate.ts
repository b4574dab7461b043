import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { Pool } from 'pg';
import { env } from '../lib/env';

async function main() {
  const pool = new Pool({ connectionString: env.databaseUrl(), max: 1 });
  try {
    await migrate(drizzle(pool), { migrationsFolder: new URL('../drizzle', import.meta.url).pathname });
    console.error('[db] migrations applied');
  } finally {
    await pool.end();
  }
}

main().catch((e) => { console.error('[db] migration failed:', e.message); process.exit(1); });
