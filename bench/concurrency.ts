/**
 * npm run bench:concurrency [N] — imports N lines (default 10,000) into a project, then measures other
 * users' line-table reads (pages of 100 with a sort, as the route handler runs them: query + JSON,
 * 8 at a time against a second project) while idle and while a worker process solves every line of
 * the first project as a background job. Prints `others p95 idle ms: <n>` and
 * `others p95 during solve ms: <n>`.
 */
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { db, getPool } from '../db/client';
import { jobs, memberships, organizations, projects } from '../db/schema';
import * as auth from '../lib/auth/service';
import { commitDraft, createDraft } from '../lib/lines/import-store';
import { solveProject } from '../lib/lines/results-store';
import { lineTablePage } from '../lib/lines/picker';
import { authenticateApiToken, createApiToken, recordTokenUse } from '../lib/auth/api-tokens';
import { enqueueJob } from '../lib/jobs/store';
import { stopBoss } from '../lib/jobs/boss';
import { demoLineRows, lineListWorkbook } from '../seed/line-list';

const N = Number(process.argv[2] ?? 10000);

async function importProject(userId: string, organizationId: string, n: number) {
  const [p] = await db
    .insert(projects)
    .values({ organizationId, code: `BC-${randomUUID().slice(0, 6)}`, name: 'Bench concurrency' })
    .returning();
  const d = await createDraft({
    projectId: p.id,
    userId,
    fileName: 'bench.xlsx',
    bytes: await lineListWorkbook(demoLineRows(n, 5)),
  });
  const s = d.sheets.find((x) => x.name === d.defaultSheet)!;
  await commitDraft({
    projectId: p.id,
    draftId: d.draftId,
    sheetName: s.name,
    mapping: s.suggested,
    userId,
  });
  await solveProject({ projectId: p.id });
  return p.id;
}

/** Other users' table reads for `ms`, `parallel` at a time; returns the p95 in ms. */
async function othersP95(projectId: string, ms: number, parallel = 8): Promise<number> {
  const times: number[] = [];
  const sorts = ['tag', 'heatFlowPerUnit', 'normalTempC', 'surfaceTempC'] as const;
  const end = Date.now() + ms;
  let i = 0;
  await Promise.all(
    Array.from({ length: parallel }, async () => {
      while (Date.now() < end) {
        const k = i++;
        const t0 = performance.now();
        JSON.stringify(
          await lineTablePage({
            projectId,
            page: k % 10,
            size: 100,
            sort: sorts[k % sorts.length],
            dir: k % 2 ? 'asc' : 'desc',
          }),
        );
        times.push(performance.now() - t0);
      }
    }),
  );
  times.sort((a, b) => a - b);
  return times[Math.min(times.length - 1, Math.floor(0.95 * times.length))];
}

/**
 * Throughput of the line-table route's work with `sessions` users at once, each sending its next
 * request when the last one is answered, for `ms`: the bearer token checked, the project access
 * checked, a page of 100 rows read and serialised, the token's use recorded (as
 * GET /api/v1/projects/:id/lines does, without the HTTP server).
 */
async function tableThroughput(projectId: string, token: string, sessions: number, ms: number) {
  const times: number[] = [];
  const sorts = ['tag', 'heatFlowPerUnit', 'normalTempC', 'surfaceTempC'] as const;
  const t0 = performance.now();
  const end = Date.now() + ms;
  let i = 0;
  await Promise.all(
    Array.from({ length: sessions }, async () => {
      while (Date.now() < end) {
        const k = i++;
        const t = performance.now();
        const at = { method: 'GET', path: `/api/v1/projects/${projectId}/lines` };
        const { user, auth } = await authenticateApiToken(token, at);
        // The project access check as db/queries/projects.ts runs it (that module is server-only).
        await db
          .select({ project: projects, role: memberships.role, organizationName: organizations.name })
          .from(projects)
          .innerJoin(
            memberships,
            and(eq(memberships.organizationId, projects.organizationId), eq(memberships.userId, user.id)),
          )
          .innerJoin(organizations, eq(organizations.id, projects.organizationId))
          .where(eq(projects.id, projectId));
        JSON.stringify(
          await lineTablePage({
            projectId,
            page: k % 100,
            size: 100,
            sort: sorts[k % sorts.length],
            dir: k % 2 ? 'asc' : 'desc',
          }),
        );
        await recordTokenUse({
          tokenId: auth.tokenId,
          organizationId: auth.organizationId,
          userId: user.id,
          actorName: user.name,
          action: 'used',
          ...at,
          status: 200,
        });
        times.push(performance.now() - t);
      }
    }),
  );
  const seconds = (performance.now() - t0) / 1000;
  times.sort((a, b) => a - b);
  const pct = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))];
  return { perSecond: times.length / seconds, p50: pct(0.5), p99: pct(0.99) };
}

async function main() {
  const owner = await auth.signUp({
    name: 'Bench',
    email: `bench.${randomUUID().slice(0, 8)}@example.com`,
    password: 'granite-manifold-9',
    organizationName: 'Bench Org',
  });
  const big = await importProject(owner.userId, owner.organizationId, N);
  const other = await importProject(owner.userId, owner.organizationId, 1000);
  console.log(`imported and solved ${N} lines (and 1,000 for the other users)`);
  const worker = spawn('bash', ['scripts/worker.sh'], {
    env: process.env,
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  let out = '';
  await new Promise<void>((resolve, reject) => {
    worker.stderr!.on('data', (d) => {
      out += String(d);
      if (out.includes('[worker] working')) resolve();
    });
    worker.once('exit', () => reject(new Error(`the worker stopped: ${out}`)));
  });
  const { token } = await createApiToken({
    userId: owner.userId,
    organizationId: owner.organizationId,
    name: 'bench',
    scopes: ['lines:read'],
    days: 7,
  });
  const tp = await tableThroughput(big, token, 50, 10_000);
  console.log(
    `line table, 50 sessions at once on the ${N}-line project: ${tp.perSecond.toFixed(1)} requests/s, p50 ${tp.p50.toFixed(0)} ms, p99 ${tp.p99.toFixed(0)} ms (goal ≥ 100 requests/s)`,
  );
  const idle = await othersP95(other, 8_000);
  const job = await enqueueJob({
    projectId: big,
    userId: owner.userId,
    kind: 'solve-all',
    input: { all: true },
  });
  const t0 = Date.now();
  await new Promise((r) => setTimeout(r, 500));
  const during = await othersP95(other, 8_000);
  let state = 'running';
  while (state === 'queued' || state === 'running') {
    await new Promise((r) => setTimeout(r, 200));
    [{ state }] = await db.select({ state: jobs.state }).from(jobs).where(eq(jobs.id, job.id));
  }
  worker.kill('SIGTERM');
  await stopBoss();
  console.log(`solve-all of ${N} lines in the worker: ${((Date.now() - t0) / 1000).toFixed(1)} s (${state})`);
  console.log(`others p95 idle ms: ${idle.toFixed(1)}`);
  console.log(`others p95 during solve ms: ${during.toFixed(1)}`);
}

main()
  .then(() => getPool().end())
  .catch((e) => {
    console.error(e);
    process.exit(1);
  });
