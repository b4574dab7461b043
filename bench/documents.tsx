/**
 * npm run bench:documents — calculation sheets for 1,000 lines (one PDF, the worker's batch path)
 * and the design report for a 10,000-line project (data, render, and issuing a stored revision).
 * The project is set up first (generated line list imported, solved, recommendations accepted) and
 * not timed. Prints seconds, pages, megabytes and the peak RSS of the process.
 */
import { randomUUID } from 'node:crypto';
import { asc, eq } from 'drizzle-orm';
import { db, getPool } from '../db/client';
import { lines, projects } from '../db/schema';
import * as auth from '../lib/auth/service';
import { acceptRecommendations } from '../lib/lines/bulk-accept';
import { commitDraft, createDraft } from '../lib/lines/import-store';
import { solveProject } from '../lib/lines/results-store';
import { sheetModels } from '../lib/documents/sheets';
import { renderPdf } from '../lib/documents/pdf-kit';
import { SheetsDocument } from '../lib/documents/sheet-pdf';
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
      .orderBy(asc(lines.tag))
      .limit(SHEETS)
  ).map((r) => r.id);
  t = performance.now();
  const models = await sheetModels({ projectId: p.id, lineIds: ids });
  const tModels = s(t);
  const t2 = performance.now();
  const buf = await renderPdf(() => <SheetsDocument models={models} title="bench" />);
  console.log(
    `calculation sheets for ${models.length} lines: ${s(t)} s (data ${tModels} s, PDF ${s(t2)} s), ${pages(buf)} pages, ${mb(buf.length)} MB — ${((performance.now() - t) / models.length).toFixed(0)} ms per line`,
  );

  t = performance.now();
  const d = await draftReport({ projectId: p.id, userId: owner.userId });
  console.log(
    `design report for ${N} lines (draft): ${s(t)} s, ${pages(d.buf)} pages, ${mb(d.buf.length)} MB`,
  );
  t = performance.now();
  const r = await issueReport({ projectId: p.id, userId: owner.userId, note: 'bench' });
  console.log(`design report issued as revision ${r.number} (rendered and stored): ${s(t)} s`);
  console.log(`peak RSS: ${mb(peak)} MB`);
}

main()
  .then(() => getPool().end())
  .then(() => clearInterval(sampler))
  .catch((e) => {
    console.error(e);
    process.exit(1);
  });
