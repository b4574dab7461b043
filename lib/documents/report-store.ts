/**
 * Issuing and reading design-report revisions — free of Next.js. An issued PDF is kept as issued in
 * the object store (lib/storage/documents.ts) and never rendered again; its row keeps the key, size,
 * SHA-256 and the figures it states, and every read is checked against the SHA-256.
 */
import { randomUUID } from 'node:crypto';
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { designReports, users } from '@/db/schema';
import { actorName, writeAudit } from '@/lib/audit';
import { AppError } from '@/lib/errors';
import { getDocument, putDocument, sha256Hex } from '@/lib/storage/documents';
import { reportData, reportPdf } from './report';
import { projectHeader, safeFilePart } from './sheets';

const NOTE_MAX = 300;

async function history(projectId: string) {
  return db
    .select({
      number: designReports.number,
      issuedAt: designReports.issuedAt,
      issuedBy: users.name,
      note: designReports.note,
    })
    .from(designReports)
    .innerJoin(users, eq(users.id, designReports.issuedBy))
    .where(eq(designReports.projectId, projectId))
    .orderBy(asc(designReports.number));
}

/** The report as it would be issued now, not stored (a draft print). */
export async function draftReport({ projectId, userId }: { projectId: string; userId: string }) {
  const d = await reportData(projectId);
  const buf = await reportPdf(d, {
    number: null,
    issuedAt: new Date(),
    issuedBy: await actorName(userId),
    note: '',
    history: await history(projectId),
  });
  return { buf, fileName: `${safeFilePart(d.project.code)}-design-report-draft.pdf`, data: d };
}

/**
 * Issues the next numbered revision: renders it, stores the bytes and their SHA-256 with the figures
 * it states, and writes the audit entry — all under the project's report lock, so two issues never
 * take the same number.
 */
export async function issueReport({
  projectId,
  userId,
  note = '',
}: {
  projectId: string;
  userId: string;
  note?: string;
}) {
  const text = note.trim();
  if (text.length > NOTE_MAX)
    throw new AppError('invalid', `The revision note is too long: at most ${NOTE_MAX} characters.`, {
      note: [`At most ${NOTE_MAX} characters.`],
    });
  const d = await reportData(projectId);
  if (d.counts.lines === 0)
    throw new AppError(
      'invalid',
      'The project has no lines yet, so there is no design to report. Import the line list first.',
    );
  const name = await actorName(userId);
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${'report' + projectId}))`);
    const [{ n }] = await tx
      .select({ n: sql<number>`coalesce(max(${designReports.number}), 0)` })
      .from(designReports)
      .where(eq(designReports.projectId, projectId));
    const number = Number(n) + 1;
    const issuedAt = new Date();
    const prior = await history(projectId);
    const pdf = await reportPdf(d, { number, issuedAt, issuedBy: name, note: text, history: prior });
    const sha256 = sha256Hex(pdf);
    // Stored first, recorded second: if the store refuses, the transaction ends with nothing written.
    const id = randomUUID();
    const p = await projectHeader(projectId);
    const doc = await putDocument(
      `projects/${projectId}/reports/${id}/${safeFilePart(p.project.code)}-design-report-rev-${number}.pdf`,
      pdf,
      'application/pdf',
    );
    const summary = {
      lines: d.counts.lines,
      decided: d.counts.decided,
      flagged: d.counts.flagged,
      designedKW: d.dash.designed.kW,
      bareKW: d.dash.bare.kW,
      budgetKW: d.dash.budget?.totalKW ?? null,
      designedMWhPerYear: d.dash.designed.mwhPerYear,
      belowHardCriterion: d.below.length,
    };
    const [row] = await tx
      .insert(designReports)
      .values({
        id,
        projectId,
        number,
        issuedBy: userId,
        issuedAt,
        basisRevision: d.basisRevision,
        lineListRevision: d.lineListRevision,
        calcVersion: d.calcVersion,
        note: text,
        summary,
        sha256,
        documentKey: doc.key,
        documentBytes: doc.bytes,
      })
      .returning({
        id: designReports.id,
        number: designReports.number,
        issuedAt: designReports.issuedAt,
        sha256: designReports.sha256,
      });
    await writeAudit(tx, [
      {
        projectId,
        actorId: userId,
        actorName: name,
        action: `design report revision ${number} issued`,
        after: { ...summary, sha256 },
      },
    ]);
    return { ...row, summary };
  });
}

export async function listReports({ projectId }: { projectId: string }) {
  return db
    .select({
      number: designReports.number,
      issuedAt: designReports.issuedAt,
      issuedBy: users.name,
      note: designReports.note,
      summary: designReports.summary,
      sha256: designReports.sha256,
      basisRevision: designReports.basisRevision,
    })
    .from(designReports)
    .innerJoin(users, eq(users.id, designReports.issuedBy))
    .where(eq(designReports.projectId, projectId))
    .orderBy(desc(designReports.number));
}

export async function getReportPdf({ projectId, number }: { projectId: string; number: number }) {
  const [r] = await db
    .select({
      pdf: designReports.pdf,
      number: designReports.number,
      sha256: designReports.sha256,
      key: designReports.documentKey,
      bytes: designReports.documentBytes,
    })
    .from(designReports)
    .where(and(eq(designReports.projectId, projectId), eq(designReports.number, number)));
  if (!r)
    throw new AppError(
      'not_found',
      `Design report revision ${number} does not exist; only issued revisions can be downloaded.`,
    );
  const p = await projectHeader(projectId);
  let buf: Buffer;
  if (r.key && r.bytes !== null) buf = await getDocument({ key: r.key, sha256: r.sha256, bytes: r.bytes });
  else if (r.pdf && sha256Hex(r.pdf) === r.sha256)
    buf = r.pdf; // issued before the object store; not yet moved
  else
    throw new AppError(
      'conflict',
      'The stored copy of this report does not match the fingerprint recorded when it was issued, so it is not served.',
    );
  return { buf, fileName: `${safeFilePart(p.project.code)}-design-report-rev-${r.number}.pdf` };
}
