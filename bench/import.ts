/**
 * npm run bench:import [N] [--job-only] — a generated N-row line list (.xlsx, default 10,000) read, validated,
 * imported in one transaction, solved and stored, step by step in this process; then the product
 * path: the same file uploaded again into a new project and imported + solved as a background job
 * by a worker process: the upload kept and read, the mapping checked, then import + solve, each a job
 * (enqueue → worker → results), as the pages run them. Then the line-table query, a page of 100 rows
 * with a sort and a filter, as the route handler runs it (query + JSON), and its payload.
 * The last two lines are the job's figures: `end-to-end seconds: <n>` (upload read to results
 * stored) and `peak RSS MB: <n>` (the larger of this process and the worker).
 */
import { execFileSync, spawn } from 'node:child_process';
import { readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { jobs } from '../db/schema';
import { enqueueJob, type JobView } from '../lib/jobs/store';
import { stopBoss } from '../lib/jobs/boss';
import { randomUUID } from 'node:crypto';
import { db, getPool } from '../db/client';
import { projects } from '../db/schema';
import * as auth from '../lib/auth/service';
import {
  commitDraft,
  createDraft,
  type DraftSummary,
  previewDraft,
  storeUpload,
} from '../lib/lines/import-store';
import { listAreas, solveProject } from '../lib/lines/results-store';
import { getPickerOptions, lineTablePage } from '../lib/lines/picker';
import ExcelJS from 'exceljs';
import { demoLineRows, lineListWorkbook } from '../seed/line-list';
import { parseUpload, viewSheet } from '../lib/lines/parse';
import { suggestMapping } from '../lib/lines/mapping';
import { validateSheet } from '../lib/lines/validate';

/** A client-style workbook: merged title and revision rows above the header, US units, the client's own location words. */
async function clientWorkbook(n: number): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Line designation');
  ws.getCell('A1').value = 'UNIT 40 — LINE DESIGNATION TABLE';
  ws.mergeCells('A1:I1');
  ws.getRow(2).values = ['Rev. C', 'Issued for design', null, 'Notes: see PDS-40-001'];
  ws.getRow(4).values = [
    'Line No.',
    'Service',
    'Size (in)',
    'Length (ft)',
    'Oper. Temp (°F)',
    'Design Temp (°F)',
    'Insul. Purpose',
    'Location',
    'Remarks',
  ];
  const sizes = ['3/4', '1', '1-1/2', '2', '3"', '4', '6', '8'];
  const where = ['Pipe rack', 'Platform', 'Indoor', 'Outdoor'];
  for (let i = 0; i < n; i++)
    ws.getRow(5 + i).values = [
      `40-ST-${10000 + i}`,
      'LP steam',
      sizes[i % sizes.length],
      20 + (i % 300),
      250 + (i % 150),
      420,
      i % 3 ? 'Heat conservation' : 'H+P',
      where[i % where.length],
      i % 7 ? null : 'check',
    ];
  return Buffer.from(await wb.xlsx.writeBuffer());
}

const N = Number(process.argv.find((a) => /^\d+$/.test(a)) ?? 10000);
/** `--job-only`: only the product path (the job), for quicker repeated runs. */
const JOB_ONLY = process.argv.includes('--job-only');
let peak = 0;
const sample = setInterval(() => {
  peak = Math.max(peak, process.memoryUsage().rss);
}, 20);
const mb = (b: number) => (b / 1048576).toFixed(0);
const lap = (() => {
  let t = performance.now();
  return () => {
    const n = performance.now();
    const d = n - t;
    t = n;
    return d;
  };
})();

async function main() {
  const owner = await auth.signUp({
    name: 'Bench',
    email: `bench.${randomUUID().slice(0, 8)}@example.com`,
    password: 'granite-manifold-9',
    organizationName: 'Bench Org',
  });
  const [p] = await db
    .insert(projects)
    .values({ organizationId: owner.organizationId, code: `B-${Date.now()}`, name: 'Bench' })
    .returning();
  const bytes = await lineListWorkbook(demoLineRows(N, 99));
  console.log(`generated workbook: ${N} rows, ${(bytes.length / 1048576).toFixed(1)} MB`);
  lap();
  const draft = await createDraft({
    projectId: p.id,
    userId: owner.userId,
    fileName: 'bench.xlsx',
    bytes,
  });
  const tParse = lap();
  const sheet = draft.sheets.find((s) => s.name === draft.defaultSheet)!;
  const preview = await previewDraft({
    projectId: p.id,
    draftId: draft.draftId,
    sheetName: sheet.name,
    mapping: sheet.suggested,
  });
  const tValidate = lap();
  const c = await commitDraft({
    projectId: p.id,
    draftId: draft.draftId,
    sheetName: sheet.name,
    mapping: sheet.suggested,
    userId: owner.userId,
  });
  const tImport = lap();
  const s = await solveProject({ projectId: p.id });
  const tSolve = lap();
  const total = tParse + tValidate + tImport + tSolve;
  console.log(`read + parse:          ${(tParse / 1000).toFixed(2)} s`);
  console.log(
    `validate + diff:       ${(tValidate / 1000).toFixed(2)} s (${preview.errorCount} errors, ${preview.warningCount} warnings)`,
  );
  console.log(`import (1 transaction): ${(tImport / 1000).toFixed(2)} s (${c.lineCount} lines)`);
  console.log(
    `solve + store:         ${(tSolve / 1000).toFixed(2)} s (${s.solved} lines; solving and shaping the result rows in memory ${(s.solveMs / 1000).toFixed(2)} s, the rest is reading and writing PostgreSQL)`,
  );
  console.log(`end to end:            ${(total / 1000).toFixed(2)} s (goal ≤ 15 s)`);
  console.log(
    `peak RSS:              ${mb(Math.max(peak, process.resourceUsage().maxRSS * 1024))} MB (goal ≤ 600 MB)`,
  );

  // Line table: pages of 100 with a sort and a filter, as GET /api/v1/projects/:id/lines serves them.
  const areas = await listAreas({ projectId: p.id });
  const sorts = ['heatFlowPerUnit', 'tag', 'normalTempC', 'surfaceTempC', 'recommendedMm'] as const;
  const times: number[] = [];
  for (let i = 0; i < 60; i++) {
    const t0 = performance.now();
    const r = await lineTablePage({
      projectId: p.id,
      page: i % 10,
      size: 100,
      sort: sorts[i % sorts.length],
      dir: i % 2 ? 'asc' : 'desc',
      area: areas[i % areas.length],
      q: i % 3 === 0 ? 'S' : undefined,
    });
    JSON.stringify(r);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const pct = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))].toFixed(1);
  console.log(
    `line table, 60 pages of 100 (sort + filter): p50 ${pct(0.5)} ms, p95 ${pct(0.95)} ms, max ${times[times.length - 1].toFixed(1)} ms (goal p95 ≤ 150 ms)`,
  );
  const first = await lineTablePage({ projectId: p.id, page: 0, size: 100, sort: 'tag', dir: 'asc' });
  const picker = (await getPickerOptions({ projectId: p.id, lineId: first.rows[0].id })).candidates;
  const kb = (v: unknown) => (Buffer.byteLength(JSON.stringify(v)) / 1024).toFixed(1);
  console.log(
    `line table payload: ${kb(first)} KB per 100 rows (goal ≤ 60 KB); one picker's options ${kb({ candidates: picker })} KB, read when it opens`,
  );
}

/** Reading a client-style workbook as the mapping step does: parse, find the header, suggest, validate with the value answers. */
async function clientStyle() {
  const bytes = await clientWorkbook(N);
  lap();
  const f = await parseUpload('client.xlsx', bytes);
  const tRead = lap();
  const sheet = viewSheet(f.sheets[0]);
  const mapping = {
    ...suggestMapping(sheet.headers),
    values: { location: { 'pipe rack': 'outdoor', platform: 'outdoor' } },
  };
  const v = validateSheet(sheet, mapping);
  const tCheck = lap();
  console.log(
    `client-style workbook (${N} rows, title rows above the header on row ${sheet.headerRow}, °F/ft/in, own location words): read ${(tRead / 1000).toFixed(2)} s, header + mapping + check ${(tCheck / 1000).toFixed(2)} s (${v.lines.length} lines, ${v.errorCount} errors)`,
  );
}

/** The product path: upload read into a draft, then import + solve as a job in a worker process. */
async function productPath() {
  const owner = await auth.signUp({
    name: 'Bench',
    email: `bench.${randomUUID().slice(0, 8)}@example.com`,
    password: 'granite-manifold-9',
    organizationName: 'Bench Org',
  });
  const [p] = await db
    .insert(projects)
    .values({ organizationId: owner.organizationId, code: `BJ-${Date.now()}`, name: 'Bench job' })
    .returning();
  // Built by a child process: this process plays the web server, whose peak is what counts here.
  const file = join(tmpdir(), `lagwise-bench-${process.pid}.xlsx`);
  execFileSync(process.execPath, ['--import', 'tsx', 'bench/make-line-list.ts', String(N), '99', file]);
  const bytes = readFileSync(file);
  rmSync(file);
  // The worker as npm run worker starts it (scripts/worker.sh; WORKER_NODE_FLAGS to compare V8 settings).
  const worker = spawn('bash', ['scripts/worker.sh'], {
    env: process.env,
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  let ready = '';
  await new Promise<void>((resolve, reject) => {
    worker.stderr!.on('data', (d) => {
      ready += String(d);
      if (ready.includes('[worker] working')) resolve();
    });
    worker.once('exit', () => reject(new Error(`the worker stopped: ${ready}`)));
  });
  peak = process.memoryUsage().rss; // this process from here on (VmHWM would include the workbook built in main())
  // What the pages do: keep the upload and enqueue its reading, check the mapping, then import + solve;
  // each step is a job the worker runs, followed here as the page follows it (polling the job row).
  const follow = async (job: JobView) => {
    let row = job as { state: string; error: string | null; result: Record<string, unknown> | null };
    while (row.state === 'queued' || row.state === 'running') {
      // Polled often, so the figure is the job's time and not the poller's.
      await new Promise((r) => setTimeout(r, 25));
      [row] = await db.select().from(jobs).where(eq(jobs.id, job.id));
    }
    if (row.state !== 'done') throw new Error(`the ${job.kind} job ended ${row.state}: ${row.error}`);
    return row.result!;
  };
  const t0 = performance.now();
  const upload = await storeUpload({ projectId: p.id, fileName: 'bench.xlsx', bytes });
  const read = (await follow(
    await enqueueJob({ projectId: p.id, userId: owner.userId, kind: 'read-upload', input: { ...upload } }),
  )) as unknown as DraftSummary;
  const tRead = performance.now();
  const sheet = read.sheets.find((s) => s.name === read.defaultSheet)!;
  const choice = { draftId: read.draftId, sheetName: sheet.name, mapping: sheet.suggested };
  await follow(
    await enqueueJob({ projectId: p.id, userId: owner.userId, kind: 'check-import', input: choice }),
  );
  const tCheck = performance.now();
  const row = {
    result: await follow(
      await enqueueJob({ projectId: p.id, userId: owner.userId, kind: 'import-solve', input: choice }),
    ),
  };
  const tDone = performance.now();
  console.log(
    `job steps: read upload ${((tRead - t0) / 1000).toFixed(2)} s, check mapping ${((tCheck - tRead) / 1000).toFixed(2)} s, import + solve ${((tDone - tCheck) / 1000).toFixed(2)} s`,
  );
  const seconds = (performance.now() - t0) / 1000;
  const workerPeak =
    Number(/VmHWM:\s+(\d+) kB/.exec(readFileSync(`/proc/${worker.pid}/status`, 'utf8'))?.[1] ?? 0) * 1024;
  worker.kill('SIGTERM');
  await stopBoss();
  const own = peak;
  console.log(
    `job: ${String(row.result?.solved)} lines solved by the worker; worker peak ${mb(workerPeak)} MB, this process ${mb(own)} MB`,
  );
  console.log(`end-to-end seconds: ${seconds.toFixed(2)}`);
  console.log(`peak RSS MB: ${mb(Math.max(workerPeak, own))}`);
}

(JOB_ONLY ? Promise.resolve() : main().then(clientStyle))
  .then(productPath)
  .then(() => {
    clearInterval(sample);
    return getPool().end();
  })
  .catch((e) => {
    console.error(e);
    process.exit(1);
  });
