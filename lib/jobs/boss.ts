import PgBoss from 'pg-boss';
import { env } from '@/lib/env';
import { BOSS_SCHEMA } from './queues';

// One pg-boss per process, on globalThis so Next's dev reloads do not open another.
const g = globalThis as unknown as { __lagwiseBoss?: Promise<PgBoss> };

/**
 * pg-boss as the application's role: it never migrates or creates queues (db/migrate.ts does, as
 * the owner). The web process only sends, so it runs no maintenance; the worker supervises.
 */
export function getBoss({ supervise = false }: { supervise?: boolean } = {}): Promise<PgBoss> {
  if (!g.__lagwiseBoss) {
    const boss = new PgBoss({
      connectionString: env.databaseUrl(),
      schema: BOSS_SCHEMA,
      max: 4,
      migrate: false,
      schedule: false,
      supervise,
      maintenanceIntervalSeconds: 5,
    });
    boss.on('error', (e) => {
      console.error('[jobs] queue error:', (e as { code?: string }).code ?? '', (e as Error).message);
    });
    g.__lagwiseBoss = boss.start().then(() => boss);
  }
  return g.__lagwiseBoss;
}

export async function stopBoss() {
  const b = g.__lagwiseBoss;
  g.__lagwiseBoss = undefined;
  if (b) await (await b).stop({ graceful: true, wait: true, timeout: 5_000 });
}
