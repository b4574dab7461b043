import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import ExcelJS from 'exceljs';
import { GetObjectCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { db, getPool } from '@/db/client';
import { boqIssues, lineListRevisions, memberships, organizations, projects, users } from '@/db/schema';
import { getDesignBasis, saveDesignBasis } from '@/lib/lines/basis-store';
import { acceptRecommendations } from '@/lib/lines/bulk-accept';
import { commitDraft, createDraft, revisionOriginal } from '@/lib/lines/import-store';
import { solveProject } from '@/lib/lines/results-store';
import * as boq from '@/lib/boq/store';
import { createApiToken } from '@/lib/auth/api-tokens';
import { GET as originalGet } from '@/app/api/v1/projects/[projectId]/lines/revisions/[number]/original/route';
import { NextRequest } from 'next/server';
import { expectAppError } from '../support/errors';
import { lineListWorkbook, TEMPLATE_HEADERS } from '../../seed/line-list';

// Needs the object store the scripts start (scripts/test.sh: the local fake on TEST_S3_FAKE_PORT).
const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');
const row = (tag: string, o: Record<string, string | number> = {}) =>
  TEMPLATE_HEADERS.map(
    (h) =>
      (h in o
        ? o[h]
        : (
            {
              'Line tag': tag,
              Area: 'North',
              Geometry: 'Horizontal pipe',
              NPS: '4',
              'Length (m)': 100,
              'Normal temp (°C)': 150,
              'Max temp (°C)': 160,
              Purpose: 'H',
              Location: 'Outdoor',
              Accessible: 'no',
            } as Record<string, string | number>
          )[h]) ?? null,
  );

let projectId = '';
let organizationId = '';
const userId = `doc-${randomUUID().slice(0, 8)}`;

async function importFile(fileName: string, bytes: Buffer) {
  const d = await createDraft({ projectId, userId, fileName, bytes });
  const s = d.sheets[0];
  await commitDraft({
    projectId,
    draftId: d.draftId,
    sheetName: s.name,
    mapping: s.suggested,
    userId,
  });
  await solveProject({ projectId });
}

beforeAll(async () => {
  await db.insert(users).values({ id: userId, email: `${userId}@example.com`, name: 'Document Keeper' });
  [{ id: organizationId }] = await db
    .insert(organizations)
    .values({ name: 'Kept Documents Org' })
    .returning();
  await db.insert(memberships).values({ organizationId, userId, role: 'engineer' });
  const [p] = await db
    .insert(projects)
    .values({ organizationId, code: 'KD-1', name: 'Kept documents' })
    .returning();
  projectId = p.id;
});
afterAll(async () => {
  await getPool().end();
});

describe('documents kept as issued in the object store', () => {
  it('keeps an issued bill byte for byte after the project changed, and each line-list original', async () => {
    const first = await lineListWorkbook([row('K-1'), row('K-2', { NPS: '2', 'Length (m)': 40 })]);
    await importFile('Client line list rev A.xlsx', first);
    await acceptRecommendations({ projectId, userId, area: 'North' });
    const issue = await boq.issueBill({ projectId, userId });
    const [stored] = await db.select().from(boqIssues).where(eq(boqIssues.id, issue.id));
    expect(stored.documentKey).toBe(
      `projects/${projectId}/bills/${issue.id}/KD-1-bill-of-quantities-issue-1.xlsx`,
    );
    const atIssue = await boq.issueWorkbook({ projectId, number: 1 });
    expect(atIssue.kept).toBe(true);
    expect(sha(atIssue.buf)).toBe(stored.documentSha256);
    expect(atIssue.buf.byteLength).toBe(stored.documentBytes);

    // The project changes after the issue: a new revision (one more line, a longer run), other
    // display units and currency. A workbook made now would differ; the issued one does not.
    const second = Buffer.from(
      'Line tag,Area,Geometry,NPS,Length (m),Normal temp (°C),Max temp (°C),Purpose,Location,Accessible\r\n' +
        'K-1,North,Horizontal pipe,4,250,150,160,H,Outdoor,no\r\nK-2,North,Horizontal pipe,2,40,150,160,H,Outdoor,no\r\n' +
        'K-3,North,Horizontal pipe,6,30,150,160,H,Outdoor,no\r\n',
      'utf8',
    );
    await importFile('rev B;semi.csv', second);
    const { basis } = await getDesignBasis({ projectId });
    await saveDesignBasis({
      projectId,
      userId,
      basis: { ...basis, unitSystem: 'US', currency: 'USD' },
    });
    await acceptRecommendations({ projectId, userId, area: 'North' });
    const later = await boq.issueWorkbook({ projectId, number: 1 });
    expect(Buffer.compare(later.buf, atIssue.buf)).toBe(0);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(later.buf as unknown as ArrayBuffer);
    // The issued workbook still says what was issued: SI units, euros, 2 lines.
    expect(String(wb.getWorksheet('Summary')!.getRow(1).getCell(9).value)).toContain('(EUR)');

    // Each revision's original file, as uploaded; the history names it.
    const revs = await db
      .select()
      .from(lineListRevisions)
      .where(eq(lineListRevisions.projectId, projectId))
      .orderBy(lineListRevisions.number);
    expect(revs.map((r) => [r.number, r.fileName, r.originalBytes])).toEqual([
      [1, 'Client line list rev A.xlsx', first.byteLength],
      [2, 'rev B;semi.csv', second.byteLength],
    ]);
    const o1 = await revisionOriginal({ projectId, number: 1 });
    expect(Buffer.compare(o1.buf, first)).toBe(0);
    expect(o1.contentType).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    const o2 = await revisionOriginal({ projectId, number: 2 });
    expect(Buffer.compare(o2.buf, second)).toBe(0);
    await expectAppError(
      revisionOriginal({ projectId, number: 3 }),
      'not_found',
      'Line-list revision 3 does not exist.',
    );

    // Through the API with a lines:read token: the same bytes, a safe file name.
    const t = await createApiToken({
      userId,
      organizationId,
      name: 'originals',
      scopes: ['lines:read'],
      days: 7,
    });
    const res = await originalGet(
      new NextRequest(`http://127.0.0.1/api/v1/projects/${projectId}/lines/revisions/2/original`, {
        headers: { authorization: `Bearer ${t.token}` },
      }),
      { params: Promise.resolve({ projectId, number: '2' }) },
    );
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/csv');
    expect(res.headers.get('content-disposition')).toBe(
      `attachment; filename="rev_B_semi.csv"; filename*=UTF-8''rev%20B%3Bsemi.csv`,
    );
    expect(Buffer.compare(Buffer.from(await res.arrayBuffer()), second)).toBe(0);
  });

  it('refuses to serve a stored copy that no longer matches its fingerprint', async () => {
    const [stored] = await db.select().from(boqIssues).where(eq(boqIssues.projectId, projectId));
    // Someone with access to the bucket overwrites the object behind the application's back.
    const s3 = new S3Client({
      endpoint: process.env.S3_ENDPOINT,
      region: 'us-east-1',
      forcePathStyle: true,
      credentials: {
        accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER',
        secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER',
      },
    });
    const bucket = process.env.S3_BUCKET || 'lagwise';
    const original = Buffer.from(
      await (
        await s3.send(new GetObjectCommand({ Bucket: bucket, Key: stored.documentKey! }))
      ).Body!.transformToByteArray(),
    );
    const tampered = Buffer.from(original);
    tampered[tampered.length - 1] ^= 0xff;
    await s3.send(new PutObjectCommand({ Bucket: bucket, Key: stored.documentKey!, Body: tampered }));
    await expectAppError(
      boq.issueWorkbook({ projectId, number: stored.number }),
      'conflict',
      /does not match the fingerprint recorded when it was kept/,
    );
    await s3.send(new PutObjectCommand({ Bucket: bucket, Key: stored.documentKey!, Body: original }));
    expect(sha((await boq.issueWorkbook({ projectId, number: stored.number })).buf)).toBe(
      stored.documentSha256,
    );
  });

  it('writes nothing when the object store cannot be reached', async () => {
    const saved = process.env.S3_ENDPOINT;
    process.env.S3_ENDPOINT = 'http://127.0.0.1:9'; // discard port: nothing listens
    try {
      const before = await db.select().from(boqIssues).where(eq(boqIssues.projectId, projectId));
      await expectAppError(
        boq.issueBill({ projectId, userId }),
        'unavailable',
        'The document store is not reachable, so nothing was saved. Try again in a minute.',
      );
      const after = await db.select().from(boqIssues).where(eq(boqIssues.projectId, projectId));
      expect(after.length).toBe(before.length);
      await expectAppError(
        createDraft({
          projectId,
          userId,
          fileName: 'x.xlsx',
          bytes: await lineListWorkbook([row('K-9')]),
        }),
        'unavailable',
      );
    } finally {
      process.env.S3_ENDPOINT = saved;
    }
  });
});
