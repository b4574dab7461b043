/**
 * npm run bench:boq — the bill of quantities for a 10,000-line project: lines collected with their
 * review state, quantities computed, the revision issued and its workbook written.
 * Goal: ≤ 5 s and ≤ 500 MB peak. (The project is set up first and not timed.)
 */
import { randomUUID } from 'node:crypto';
import { execFileSync } from 'node:child_process';
import { db, getPool } from '../db/client';
import { projects } from '../db/schema';
import * as auth from '../lib/auth/service';
import { acceptRecommendations } from '../lib/lines/bulk-accept';
import { commitDraft, createDraft } from '../lib/lines/import-store';
import { solveProject } from '../lib/lines/results-store';
import * as boq from '../lib/boq/store';
import { demoLineRows, lineListWorkbook } from '../seed/line-list';

const N = Number(process.argv[2] ?? 10000);
const MEASURE = process.argv[2] === '--measure';

async function main() {
  const owner = await auth.signUp({
    name: 'Bench',
    email: `bench.${randomUUID().slice(0, 8)}@example.com`,
    password: 'granite-manifold-9',
    organizationName: 'Bench Org',
  });
  const [p] = await db
    .insert(projects)
    .values({ organizationId: owner.organizationId, code: `BQ-${Date.now()}`, name: 'Bill bench' })
    .returning();
  const draft = await createDraft({
    projectId: p.id,
    userId: owner.userId,
    fileName: 'bench.xlsx',
    bytes: await lineListWorkbook(demoLineRows(N, 7)),
  });
  const s = draft.sheets[0];
  await commitDraft({
    projectId: p.id,
    draftId: draft.draftId,
    sheetName: s.name,
    mapping: s.suggested,
    userId: owner.userId,
  });
  await solveProject({ projectId: p.id });
  await acceptRecommendations({ projectId: p.id, userId: owner.userId });
  console.log(`project ready: ${N} lines solved and decided`);
  // The bill is measured in a fresh process, so set-up memory does not count against it.
  execFileSync(
    process.execPath,
    ['--import', 'tsx', new URL(import.meta.url).pathname, '--measure', p.id, owner.userId],
    { stdio: 'inherit', env: process.env },
  );
}

async function measure(projectId: string, userId: string) {
  const p = { id: projectId };
  const owner = { userId };
  const rssBefore = process.memoryUsage().rss;
  let peak = rssBefore;
  const sample = setInterval(() => {
    peak = Math.max(peak, process.memoryUsage().rss);
  }, 10);
  const t0 = performance.now();
  const issue = await boq.issueBill({ projectId: p.id, userId: owner.userId });
  const t1 = performance.now();
  const { buf } = await boq.issueWorkbook({ projectId: p.id, number: issue.number });
  const t2 = performance.now();
  clearInterval(sample);
  peak = Math.max(peak, process.memoryUsage().rss);
  console.log(
    `collect + quantities + issue: ${((t1 - t0) / 1000).toFixed(2)} s (${issue.counted} counted, ${issue.pending} pending)`,
  );
  console.log(`workbook: ${((t2 - t1) / 1000).toFixed(2)} s, ${(buf.length / 1048576).toFixed(1)} MB`);
  console.log(
    `bill for ${issue.counted + issue.pending} lines: ${((t2 - t0) / 1000).toFixed(2)} s (goal ≤ 5 s)`,
  );
  console.log(
    `peak RSS of the bill process: ${(peak / 1048576).toFixed(0)} MB (goal ≤ 500 MB; at start ${(rssBefore / 1048576).toFixed(0)} MB)`,
  );
}

(MEASURE ? measure(process.argv[3], process.argv[4]) : main())
  .then(() => getPool().end())
  .catch((e) => {
    console.error(e);
    process.exit(1);
  });
