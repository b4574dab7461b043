import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import { Pool } from 'pg';
import * as schema from './schema';
import { env } from '@/lib/env';

type Db = NodePgDatabase<typeof schema>;

// One pool per process; kept on globalThis so Next's dev reloads do not open a new pool each time.
const g = globalThis as unknown as { __lagwisePool?: Pool; __lagwiseDb?: Db };

export function getPool(): Pool {
  if (!g.__lagwisePool) {
    g.__lagwisePool = new Pool({ connectionString: env.databaseUrl(), max: 10 });
  }
  return g.__lagwisePool;
}

export const db: Db = g.__lagwiseDb ?? (g.__lagwiseDb = drizzle(getPool(), { schema }));
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export { schema };
