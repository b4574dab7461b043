/**
 * npm run documents:move — moves design reports and sheet batches kept in PostgreSQL before
 * documents went to the object store into it (lib/storage/move-legacy.ts), as the owner. `npm start`
 * and `npm run dev` run it once the object store is up; with nothing left to move it does nothing.
 * A row not yet moved is still served from its column (report-store.ts, the sheet-batch route).
 */
import { Pool } from 'pg';
import { env } from '../lib/env';
import { moveLegacyDocuments } from '../lib/storage/move-legacy';

async function main() {
  const pool = new Pool({ connectionString: env.databaseOwnerUrl(), max: 1 });
  try {
    const { moved, refused } = await moveLegacyDocuments(pool);
    if (moved) console.error(`[db] moved ${moved} stored documents into the object store`);
    for (const r of refused)
      console.error(`[db] not moved: ${r} does not match its recorded SHA-256 (it is refused on download)`);
  } finally {
    await pool.end();
  }
}

main().catch((e) => {
  console.error('[db] moving documents to the object store failed:', e?.message);
  process.exit(1);
});
