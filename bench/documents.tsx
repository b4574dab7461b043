/**
 * npm run bench:documents — calculation sheets for 1,000 lines (the worker's batch path: one PDF per
 * line rendered one at a time, streamed into a zip and into the object store) and the design report
 * for a 10,000-line project (draft render, and issuing a stored revision). The project is set up first
 * (generated line list imported, solved, recommendations accepted) and not timed. Prints seconds,
 * megabytes, the peak RSS of each phase and the load average (the machine may be shared).
 * BENCH_LINES (10000) and BENCH_SHEETS (1000) change the sizes.
 */
import { randomUUID } from 'node:crypto';
import { loadavg } from 'node:os';
import { eq, sql } from 'drizzle-orm';
import { db, getPool } from '../db/client';
import { lines, projects } from '../db/schema';
import * as auth from '../lib/auth/service';
import { acceptRecommendations } from '../lib/lines/bulk-accept';
import { commitDraft, createDraft } from '../lib/lines/import-store';
import { solveProject } from '../lib/lines/results-store';
import { sheetsBatchZip } from '../lib/documents/sheets';
import { draftReport, issueReport } from '../lib/documents/report-store';
import { demoLineRows, lineListWorkbook } from '../seed/line-list';

const N = Number(process.env.BENCH_LINES ?? 10000);
const SHEETS = Number(process.env.BENCH_SHEETS ?? 1000);

let peak = 0;
const sampler = setInterval(() => {
  peak = Math.max(peak, process.memoryUsage().rss);
}, 20);
const s = (t0: number) => ((performance.now() - t0) / 1000).toFixed(1);
const mb = (n: number) => (n / 1048576).toFixed(1);
const pages = (buf: Buffer) => (buf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
/** CPU seconds of this process since `from` — what the work costs, whatever else the machine runs. */
const cpu = (from: NodeJS.CpuUsage) => {
  const u = process.cpuUsage(from);
  return ((u.user + u.system) / 1e6).toFixed(1);
};
const load = () =>
  `load average ${loadavg()
    .map((v) => v.toFixed(2))
    .join(' ')}`;
/** Peak RSS since the last call (the sampler keeps the maximum; each phase starts from the current RSS). */
const phasePeak = () => {
  const p = peak;
  peak = process.memoryUsage().rss;
  return `peak RSS ${mb(p)} MB`;
};

async function main() {
  const owner = await auth.signUp({
    name: 'Bench',
    email: `bench.${randomUUID().slice(0, 8)}@example.com`,
    password: 'granite-manifold-9',
    organizationName: 'Bench Org',
  });
  const [p] = await db
    .insert(projects)
    .values({ organizationId: owner.organizationId, code: `DOC-${Date.now()}`, name: 'Documents bench' })
    .returning();
  let t = performance.now();
  const draft = await createDraft({
    projectId: p.id,
    userId: owner.userId,
    fileName: 'bench.xlsx',
    bytes: await lineListWorkbook(demoLineRows(N, 7)),
  });
  const sh = draft.sheets[0];
  await commitDraft({
    projectId: p.id,
    draftId: draft.draftId,
    sheetName: sh.name,
    mapping: sh.suggested,
    userId: owner.userId,
  });
  await solveProject({ projectId: p.id });
  await acceptRecommendations({ projectId: p.id, userId: owner.userId });
  console.log(`project ready: ${N} lines imported, solved and decided (${s(t)} s, not counted)`);

  const ids = (
    await db
      .select({ id: lines.id })
      .from(lines)
      .where(eq(lines.projectId, p.id))
      .orderBy(sql`${lines.tagKey} collate "C"`)
      .limit(SHEETS)
  ).map((r) => r.id);
  phasePeak();
  console.log(`before the sheets: RSS ${mb(process.memoryUsage().rss)} MB, ${load()}`);
  t = performance.now();
  let c0 = process.cpuUsage();
  let reported = 0;
  const batch = await sheetsBatchZip({
    projectId: p.id,
    lineIds: ids,
    key: (fileName) => `projects/${p.id}/sheet-batches/bench-${randomUUID()}/${fileName}`,
    onProgress: (done, total) => {
      if (done - reported >= 250 || done === total) {
        reported = done;
        const rss = mb(process.memoryUsage().rss);
        console.log(`  ${done}/${total} sheets, ${s(t)} s, RSS ${rss} MB, ${load()}`);
      }
    },
  });
  console.log(
    `calculation sheets for ${batch.count} lines: ${s(t)} s (CPU ${cpu(c0)} s), zip ${mb(batch.document.bytes)} MB in the object store, ${((performance.now() - t) / batch.count).toFixed(0)} ms per line, ${phasePeak()}, ${load()}`,
  );

  t = performance.now();
  c0 = process.cpuUsage();
  const d = await draftReport({ projectId: p.id, userId: owner.userId });
  console.log(
    `design report for ${N} lines (draft): ${s(t)} s (CPU ${cpu(c0)} s), ${pages(d.buf)} pages, ${mb(d.buf.length)} MB, ${phasePeak()}, ${load()}`,
  );
  t = performance.now();
  c0 = process.cpuUsage();
  const r = await issueReport({ projectId: p.id, userId: owner.userId, note: 'bench' });
  console.log(
    `design report issued as revision ${r.number} (rendered and stored): ${s(t)} s (CPU ${cpu(c0)} s), ${phasePeak()}, ${load()}`,
  );
}

main()
  .then(() => getPool().end())
  .then(() => clearInterval(sampler))
  .catch((e) => {
    console.error(e);
    process.exit(1);
  });
