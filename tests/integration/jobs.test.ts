/**
 * Background jobs on PostgreSQL (pg-boss): two workers share the queue without taking a job twice,
 * and an import + solve survives its worker being killed mid-solve — the previous state stays
 * current, the job is handed out again and finishes, never a half-current revision.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { count, eq } from 'drizzle-orm';
import PgBoss from 'pg-boss';
import { db, getPool } from '@/db/client';
import { boqIssues, importDrafts, jobs, lineListRevisions, lineResults, lines, projects } from '@/db/schema';
import * as auth from '@/lib/auth/service';
import { createDraft, previewDraft, storeUpload } from '@/lib/lines/import-store';
import { dashboard } from '@/lib/budget/store';
import { enqueueJob, listJobs } from '@/lib/jobs/store';
import { runJob } from '@/lib/jobs/run';
import { acceptRecommendations } from '@/lib/lines/bulk-accept';
import { previewBill } from '@/lib/boq/store';
import { stopBoss } from '@/lib/jobs/boss';
import { BOSS_SCHEMA } from '@/lib/jobs/queues';
import { demoLineRows, lineListWorkbook } from '../../seed/line-list';

process.env.JOB_EXPIRE_SECONDS = '20'; // a job whose worker vanished is handed out again after 20 s

let userId = '',
  organizationId = '';
const children: ChildProcess[] = [];

async function newProject(code: string) {
  const [p] = await db.insert(projects).values({ organizationId, code, name: code }).returning();
  return p.id;
}

async function draftOf(projectId: string, n: number) {
  const d = await createDraft({
    projectId,
    userId,
    fileName: 'jobs.xlsx',
    bytes: await lineListWorkbook(demoLineRows(n, 7)),
  });
  const s = d.sheets.find((x) => x.name === d.defaultSheet)!;
  return { draftId: d.draftId, sheetName: s.name, mapping: s.suggested };
}

const jobRow = async (id: string) => (await db.select().from(jobs).where(eq(jobs.id, id)))[0];
async function until<T>(what: () => Promise<T>, ok: (v: T) => boolean, ms: number): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await what();
    if (ok(v) || Date.now() > end) return v;
    await new Promise((r) => setTimeout(r, 200));
  }
}

function startWorker(): ChildProcess {
  const c = spawn(process.execPath, ['--import', 'tsx', 'lib/jobs/worker.ts'], {
    env: { ...process.env },
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  c.stderr!.on('data', () => undefined);
  children.push(c);
  return c;
}

beforeAll(async () => {
  const owner = await auth.signUp({
    name: 'Job Tester',
    email: `jobs.${randomUUID().slice(0, 8)}@example.com`,
    password: 'copper-riser-gasket',
    organizationName: 'Job Test Org',
  });
  userId = owner.userId;
  organizationId = owner.organizationId;
});
afterAll(async () => {
  for (const c of children) if (c.exitCode === null) c.kill('SIGKILL');
  await stopBoss();
  await getPool().end();
});

describe('jobs on PostgreSQL', () => {
  it('two workers share the queue: every job is taken by exactly one of them, once', {
    timeout: 120_000,
  }, async () => {
    const ids: string[] = [];
    for (let i = 0; i < 6; i++) {
      const projectId = await newProject(`J2-${i}`);
      ids.push(
        (await enqueueJob({ projectId, userId, kind: 'import-solve', input: await draftOf(projectId, 12) }))
          .id,
      );
    }
    const taken: { worker: string; jobId: string }[] = [];
    const bosses = ['A', 'B'].map((name) => ({
      name,
      boss: new PgBoss({
        connectionString: process.env.DATABASE_URL!,
        schema: BOSS_SCHEMA,
        migrate: false,
        supervise: false,
        schedule: false,
      }),
    }));
    for (const { name, boss } of bosses) {
      await boss.start();
      await boss.work<{ jobId: string }>(
        'import-solve',
        { batchSize: 1, pollingIntervalSeconds: 0.5 },
        async ([job]) => {
          taken.push({ worker: name, jobId: job.data.jobId });
          await runJob(job.data.jobId);
        },
      );
    }
    const rows = await until(
      async () => Promise.all(ids.map(jobRow)),
      (rs) => rs.every((r) => r.state === 'done'),
      90_000,
    );
    for (const { boss } of bosses) await boss.stop({ graceful: true, wait: true, timeout: 5_000 });
    expect(rows.map((r) => r.state)).toEqual(ids.map(() => 'done'));
    expect(rows.map((r) => r.attempts)).toEqual(ids.map(() => 1));
    expect(taken.map((t) => t.jobId).sort()).toEqual([...ids].sort());
    for (const r of rows) {
      expect(r.result).toMatchObject({ revision: 1 });
      expect(r.result!.solved).toBe(r.result!.lineCount);
      expect(r.done).toBe(r.result!.lineCount);
    }
  });

  it('an import + solve survives its worker being killed mid-solve: nothing half-current, then it finishes', {
    timeout: 240_000,
  }, async () => {
    const projectId = await newProject('JK-1');
    const n = 1_500;
    const job = await enqueueJob({
      projectId,
      userId,
      kind: 'import-solve',
      input: await draftOf(projectId, n),
    });
    const first = startWorker();
    const mid = await until(
      () => jobRow(job.id),
      (r) => r.state === 'running' && r.done > 0 && r.done < r.total,
      120_000,
    );
    expect(mid.done).toBeGreaterThan(0);
    first.kill('SIGKILL');
    await new Promise((r) => first.once('exit', r));

    // The killed transaction rolled back: no revision, no lines, no results are current.
    const [{ n: lineCount }] = await db
      .select({ n: count() })
      .from(lines)
      .where(eq(lines.projectId, projectId));
    const [{ n: revCount }] = await db
      .select({ n: count() })
      .from(lineListRevisions)
      .where(eq(lineListRevisions.projectId, projectId));
    expect([lineCount, revCount]).toEqual([0, 0]);

    startWorker();
    const done = await until(
      () => jobRow(job.id),
      (r) => r.state === 'done' || r.state === 'failed',
      200_000,
    );
    expect(done.state).toBe('done');
    expect(done.attempts).toBeGreaterThanOrEqual(2);
    expect(done.result).toMatchObject({ revision: 1, solved: done.result!.lineCount });
    const [{ n: solved }] = await db
      .select({ n: count() })
      .from(lineResults)
      .where(eq(lineResults.projectId, projectId));
    expect(solved).toBe(done.result!.lineCount);
  });

  it('a second import or solve of a project waits its turn with a sentence', async () => {
    const projectId = await newProject('JQ-1');
    await enqueueJob({ projectId, userId, kind: 'solve-all', input: { all: true } });
    await expect(enqueueJob({ projectId, userId, kind: 'solve-all', input: { all: true } })).rejects.toThrow(
      /still running; wait for it to finish/,
    );
    await db.delete(jobs).where(eq(jobs.projectId, projectId));
  });

  it('a bill is issued by a job: the issue and the job commit together, a repeated run issues nothing more, nothing to count fails with a sentence', {
    timeout: 120_000,
  }, async () => {
    const projectId = await newProject('JB-1');
    const imp = await enqueueJob({
      projectId,
      userId,
      kind: 'import-solve',
      input: await draftOf(projectId, 40),
    });
    await runJob(imp.id);
    expect((await jobRow(imp.id)).state).toBe('done');
    await acceptRecommendations({ projectId, userId });
    const expected = await previewBill({ projectId });
    expect(expected.counted).toBeGreaterThan(0);

    const job = await enqueueJob({ projectId, userId, kind: 'issue-bill', input: {} });
    await runJob(job.id);
    const done = await jobRow(job.id);
    expect(done.state).toBe('done');
    expect(done.result).toEqual({ number: 1, counted: expected.counted, pending: expected.pending });
    const issued = await db.select().from(boqIssues).where(eq(boqIssues.projectId, projectId));
    expect(issued.map((i) => [i.number, i.counted, i.pending])).toEqual([
      [1, expected.counted, expected.pending],
    ]);
    // pg-boss may hand a job out again (an expired lease): the second run finds it done.
    await runJob(job.id);
    expect(await db.select({ n: count() }).from(boqIssues).where(eq(boqIssues.projectId, projectId))).toEqual(
      [{ n: 1 }],
    );

    const empty = await newProject('JB-2');
    const none = await enqueueJob({ projectId: empty, userId, kind: 'issue-bill', input: {} });
    await runJob(none.id);
    expect(await jobRow(none.id)).toMatchObject({
      state: 'failed',
      error:
        'No line is decided and cleared yet, so there is nothing to issue. Choose thicknesses (and get flagged lines signed off) first.',
    });
  });
  it('the mapping step and the what-if run in the worker: the upload read, the check and the totals are job results; a hostile file fails with a sentence', {
    timeout: 120_000,
  }, async () => {
    const projectId = await newProject('JM-1');
    // Screen steps wait for no other job of the project and are not listed as its work.
    const busy = await enqueueJob({ projectId, userId, kind: 'solve-all', input: { all: true } });
    const upload = await storeUpload({
      projectId,
      fileName: 'client list.xlsx',
      bytes: await lineListWorkbook(demoLineRows(30, 3)),
    });
    const read = await enqueueJob({ projectId, userId, kind: 'read-upload', input: { ...upload } });
    await runJob(read.id);
    const readRow = await jobRow(read.id);
    expect(readRow.state).toBe('done');
    const summary = readRow.result as {
      draftId: string;
      defaultSheet: string;
      sheets: { name: string; rowCount: number; suggested: unknown }[];
    };
    expect(summary.draftId).toBe(upload.draftId);
    expect(summary.sheets.find((x) => x.name === summary.defaultSheet)!.rowCount).toBe(30);
    expect(
      await db.select({ n: count() }).from(importDrafts).where(eq(importDrafts.id, upload.draftId)),
    ).toEqual([{ n: 1 }]);
    expect((await listJobs({ projectId })).map((j) => j.id)).toEqual([busy.id]);

    const sheet = summary.sheets.find((x) => x.name === summary.defaultSheet)!;
    const choice = { draftId: upload.draftId, sheetName: sheet.name, mapping: sheet.suggested as never };
    const check = await enqueueJob({ projectId, userId, kind: 'check-import', input: choice });
    await runJob(check.id);
    const checked = await jobRow(check.id);
    expect(checked.state).toBe('done');
    const direct = await previewDraft({ projectId, ...choice });
    expect(checked.result).toEqual(JSON.parse(JSON.stringify(direct)));
    expect(direct.lineCount).toBe(30);
    await db.delete(jobs).where(eq(jobs.id, busy.id));

    // A CSV 5,000 columns wide (the issue's hostile file) is refused by the job, with the limit named.
    const wide = await storeUpload({
      projectId,
      fileName: 'wide.csv',
      bytes: Buffer.from(`${Array.from({ length: 5000 }, (_, i) => `c${i}`).join(',')}\n`),
    });
    const bad = await enqueueJob({ projectId, userId, kind: 'read-upload', input: { ...wide } });
    const t0 = Date.now();
    await runJob(bad.id);
    expect(Date.now() - t0).toBeLessThan(5_000);
    const badRow = await jobRow(bad.id);
    expect(badRow.state).toBe('failed');
    expect(badRow.error).toMatch(/256 columns/);
    expect(
      await db.select({ n: count() }).from(importDrafts).where(eq(importDrafts.id, wide.draftId)),
    ).toEqual([{ n: 0 }]);

    // The what-if totals equal the dashboard's for the same inputs.
    const imp = await enqueueJob({ projectId, userId, kind: 'import-solve', input: choice });
    await runJob(imp.id);
    expect((await jobRow(imp.id)).state).toBe('done');
    const whatIf = { energyPricePerKWh: 0.11, hoursPerYear: 6000, policy: 'recommended' as const };
    const wi = await enqueueJob({ projectId, userId, kind: 'what-if', input: whatIf });
    await runJob(wi.id);
    const d = await dashboard({ projectId, whatIf });
    expect(d.designed.kW).toBeGreaterThan(0);
    expect((await jobRow(wi.id)).result).toEqual(
      JSON.parse(
        JSON.stringify({ bare: d.bare, designed: d.designed, savings: d.savings, warnings: d.warnings }),
      ),
    );
  });
});
