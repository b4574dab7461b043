/**
 * node --import tsx bench/demo-budget.ts — the seeded demo project's heat-loss budget: the change the
 * fittings and supports make (straight runs only against straight runs + fittings, in kW and %),
 * and the heat-tracing duty of its traced lines. Reads the database in DATABASE_URL (seeded).
 */
import { eq } from 'drizzle-orm';
import { db, getPool } from '../db/client';
import { projects } from '../db/schema';
import { dashboard } from '../lib/budget/store';
import { DEMO_PROJECT } from '../seed/demo-data';

async function main() {
  const [p] = await db.select().from(projects).where(eq(projects.code, DEMO_PROJECT.code));
  if (!p) throw new Error(`no project ${DEMO_PROJECT.code}: seed the database first`);
  for (const policy of ['chosen', 'recommended'] as const) {
    const d = await dashboard({ projectId: p.id, whatIf: { policy } });
    const pct = (100 * d.fittingsKW) / d.straightKW;
    console.log(
      `${policy}: ${d.lineCount} lines; straight runs ${d.straightKW.toFixed(1)} kW, fittings and supports ` +
        `${d.fittingsKW.toFixed(1)} kW, designed ${d.designed.kW.toFixed(1)} kW (+${pct.toFixed(1)} % over straight runs); ` +
        `bare ${d.bare.kW.toFixed(1)} kW of which bare fittings ${d.bareFittingsKW.toFixed(1)} kW; ` +
        `heat tracing ${d.tracing.lines} lines, ${d.tracing.kW.toFixed(2)} kW electrical, ${d.tracing.tracerM.toFixed(0)} m of tracer`,
    );
  }
}

main()
  .then(() => getPool().end())
  .catch(async (e) => {
    console.error(e);
    await getPool().end();
    process.exit(1);
  });
