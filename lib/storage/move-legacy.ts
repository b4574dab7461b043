/**
 * Moves the bytes of design reports and sheet batches kept in PostgreSQL before documents went to the
 * object store (migration 0021) into the store, each checked against its recorded SHA-256 first,
 * then records the key and clears the column. Needs the owner's connection: the application may not
 * update the append-only `design_reports`. Idempotent; one document in memory at a time. A report
 * whose bytes do not match its fingerprint is left where it is and named in the log (it is refused
 * on download either way).
 */
import type { Pool } from 'pg';
import { putDocument, sha256Hex } from './documents';

export async function moveLegacyDocuments(pool: Pool): Promise<{ moved: number; refused: string[] }> {
  let moved = 0;
  const refused: string[] = [];
  const reports = await pool.query<{ id: string }>(
    'select id from design_reports where document_key is null and pdf is not null order by issued_at',
  );
  for (const { id } of reports.rows) {
    const {
      rows: [r],
    } = await pool.query<{ project_id: string; number: number; sha256: string; pdf: Buffer }>(
      'select project_id, number, sha256, pdf from design_reports where id = $1',
      [id],
    );
    if (sha256Hex(r.pdf) !== r.sha256) {
      refused.push(`design report ${id}`);
      continue;
    }
    const doc = await putDocument(
      `projects/${r.project_id}/reports/${id}/design-report-rev-${r.number}.pdf`,
      r.pdf,
      'application/pdf',
    );
    await pool.query(
      'update design_reports set document_key = $2, document_bytes = $3, pdf = null where id = $1',
      [id, doc.key, doc.bytes],
    );
    moved++;
  }
  const batches = await pool.query<{ job_id: string }>(
    'select job_id from sheet_batches where document_key is null and pdf is not null',
  );
  for (const { job_id } of batches.rows) {
    const {
      rows: [r],
    } = await pool.query<{ project_id: string; file_name: string; pdf: Buffer }>(
      'select project_id, file_name, pdf from sheet_batches where job_id = $1',
      [job_id],
    );
    const doc = await putDocument(
      `projects/${r.project_id}/sheet-batches/${job_id}/${r.file_name}`,
      r.pdf,
      'application/pdf',
    );
    await pool.query(
      `update sheet_batches set document_key = $2, document_sha256 = $3, document_bytes = $4, pdf = null
        where job_id = $1`,
      [job_id, doc.key, doc.sha256, doc.bytes],
    );
    moved++;
  }
  return { moved, refused };
}
