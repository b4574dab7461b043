import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { db, getPool } from '@/db/client';
import { auditLog, memberships, projects, reviewRounds } from '@/db/schema';
import * as auth from '@/lib/auth/service';
import { getDesignBasis, saveDesignBasis } from '@/lib/lines/basis-store';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { pickDesign } from '@/lib/lines/picks-store';
import { listLines, solveProject } from '@/lib/lines/results-store';
import * as review from '@/lib/review/store';
import { expectAppError } from '../support/errors';
import { lineListWorkbook, TEMPLATE_HEADERS } from '../../seed/line-list';
import { waitForMail } from '../support/mail';

const row = (tag: string, o: Record<string, string | number | null> = {}) =>
  TEMPLATE_HEADERS.map((h) =>
    h in o
      ? o[h]
      : ((
          {
            'Line tag': tag,
            Area: 'R1',
            Geometry: 'Horizontal pipe',
            NPS: '4',
            'Length (m)': 30,
            'Normal temp (°C)': 200,
            'Max temp (°C)': 210,
            Purpose: 'H,P',
            Location: 'Outdoor',
            Accessible: 'yes',
          } as Record<string, string | number>
        )[h] ?? null),
  );

let projectId = '',
  engineerId = '',
  reviewerId = '',
  reviewerEmail = '',
  engineerEmail = '';
const uniq = () => randomUUID().slice(0, 8);

beforeAll(async () => {
  engineerEmail = `eng.${uniq()}@example.com`;
  const eng = await auth.signUp({
    name: 'Ena Engineer',
    email: engineerEmail,
    password: 'flanged-spool-piece',
    organizationName: 'Review Org',
  });
  engineerId = eng.userId;
  reviewerEmail = `rev.${uniq()}@example.com`;
  const rev = await auth.signUp({
    name: 'Rolf Reviewer',
    email: reviewerEmail,
    password: 'flanged-spool-piece',
    organizationName: 'Rolf own org',
  });
  reviewerId = rev.userId;
  await db
    .insert(memberships)
    .values({ organizationId: eng.organizationId, userId: reviewerId, role: 'reviewer' });
  const [p] = await db
    .insert(projects)
    .values({ organizationId: eng.organizationId, code: 'RV-1', name: 'Review test' })
    .returning();
  projectId = p.id;
  const draft = await createDraft({
    projectId,
    userId: engineerId,
    fileName: 'r.xlsx',
    bytes: await lineListWorkbook([
      row('H-1'),
      row('H-2'),
      row('H-3', { Accessible: 'no' }),
      row('C-1', { NPS: '2', 'Normal temp (°C)': 5, 'Max temp (°C)': 8, Purpose: 'C' }),
    ]),
  });
  const s = draft.sheets[0];
  await commitDraft({
    projectId,
    draftId: draft.draftId,
    sheetName: s.name,
    mapping: s.suggested,
    userId: engineerId,
  });
  await solveProject({ projectId });
});
afterAll(async () => {
  await getPool().end();
});

describe('review round on PostgreSQL', () => {
  let roundId = '';
  it('an engineer requests a review of the flagged lines; each reviewer gets an e-mail with counts', async () => {
    // Nothing decided: the hot accessible lines and the bare chilled line are flagged, the inaccessible one is not.
    const asked = new Date(Date.now() - 1000);
    const r = await review.requestReview({ projectId, userId: engineerId, note: 'first pass' });
    roundId = r.round.id;
    expect(r.lines).toBe(3);
    expect(r.counts).toMatchObject({ 'hot-surface': 2, sweating: 1 });
    const mail = await waitForMail(reviewerEmail, {
      subject: /Safety review requested: RV-1 round 1 \(3 lines\)/,
      after: asked,
    });
    expect(mail.text).toContain('Surface over the touch limit: 2');
    expect(mail.text).toContain('Surface under the dew point + margin: 1');
    expect(mail.text).toContain(`/projects/${projectId}/review`);
    await expectAppError(review.requestReview({ projectId, userId: engineerId }), 'conflict', /still open/);
  });

  it('refuses a disposition without a required comment and a sign-off with undecided lines, changing nothing', async () => {
    const { items } = await review.getRound({ projectId, roundId });
    await expectAppError(
      review.dispose({
        projectId,
        roundId,
        itemIds: [items[0].id],
        disposition: 'guard',
        userId: reviewerId,
      }),
      'invalid',
      /comment is required/,
    );
    await expectAppError(
      review.signOff({ projectId, roundId, userId: reviewerId }),
      'invalid',
      /3 lines are not decided yet/,
    );
    const again = await review.getRound({ projectId, roundId });
    expect(again.items.every((i) => i.disposition === null)).toBe(true);
  });

  it('dispositions (bulk with one comment), a return that e-mails the engineer, then sign-off with a snapshot', async () => {
    const { items } = await review.getRound({ projectId, roundId });
    const hot = items.filter((i) => i.flags.some((f) => f.type === 'hot-surface'));
    const cold = items.find((i) => i.tag === 'C-1')!;
    await review.dispose({
      projectId,
      roundId,
      itemIds: hot.map((i) => i.id),
      disposition: 'guard',
      comment: 'Cage at the pump skid',
      userId: reviewerId,
    });
    const asked = new Date(Date.now() - 1000);
    await review.dispose({
      projectId,
      roundId,
      itemIds: [cold.id],
      disposition: 'returned',
      comment: 'Insulate: vapour barrier needed',
      userId: reviewerId,
    });
    const mail = await waitForMail(engineerEmail, {
      subject: /RV-1 review round 1: 1 line returned to you/,
      after: asked,
    });
    expect(mail.text).toContain('Insulate: vapour barrier needed');
    await review.signOff({ projectId, roundId, userId: reviewerId });
    const [r] = await db.select().from(reviewRounds).where(eq(reviewRounds.id, roundId));
    expect(r.status).toBe('signed-off');
    const snap = r.snapshot as { signedBy: string; items: { tag: string; disposition: string }[] };
    expect(snap.signedBy).toBe('Rolf Reviewer');
    expect(snap.items.map((i) => [i.tag, i.disposition]).sort()).toEqual([
      ['C-1', 'returned'],
      ['H-1', 'guard'],
      ['H-2', 'guard'],
    ]);
    await expectAppError(
      review.dispose({
        projectId,
        roundId,
        itemIds: [cold.id],
        disposition: 'guard',
        comment: 'x',
        userId: reviewerId,
      }),
      'conflict',
      /signed off/,
    );
    await waitForMail(engineerEmail, { subject: /RV-1 review round 1 signed off/, after: asked });
  });

  it('a later design change re-opens the decision and says why; the signed snapshot stays as signed', async () => {
    const { rows } = await listLines({ projectId, page: 0, size: 10, sort: 'tag', dir: 'asc' });
    const h1 = rows.find((r) => r.tag === 'H-1')!;
    await pickDesign({
      projectId,
      lineId: h1.id,
      userId: engineerId,
      thicknessMm: h1.recommendedMm!,
      expectedVersion: h1.designVersion ?? 0,
    });
    const { items, round } = await review.getRound({ projectId, roundId });
    const it1 = items.find((i) => i.tag === 'H-1')!;
    expect(it1.status).toBe('reopened');
    expect(it1.reopenReason).toBe("The line's chosen design changed after the decision.");
    expect(items.find((i) => i.tag === 'H-2')!.status).toBe('decided');
    expect((round.snapshot as { items: unknown[] }).items).toHaveLength(3);
  });

  it('the audit trail records decisions and the database refuses to change or delete it', async () => {
    const rows = await db.select().from(auditLog).where(eq(auditLog.projectId, projectId));
    expect(rows.map((r) => r.action)).toEqual(
      expect.arrayContaining([
        'review round 1 requested',
        'disposition (round 1)',
        'review round 1 signed off',
        'design pick',
      ]),
    );
    const pick = rows.find((r) => r.action === 'design pick')!;
    expect(pick.after).toMatchObject({ source: 'recommended' });
    const refused = async (q: ReturnType<typeof sql>) => {
      try {
        await db.execute(q);
      } catch (e) {
        return String((e as { cause?: Error }).cause?.message ?? (e as Error).message);
      }
      return 'allowed';
    };
    expect(
      await refused(sql`update audit_log set action = 'tampered' where project_id = ${projectId}`),
    ).toMatch(/permission denied for table audit_log/);
    expect(await refused(sql`delete from audit_log where project_id = ${projectId}`)).toMatch(
      /permission denied for table audit_log/,
    );
    const after = await db.select().from(auditLog).where(eq(auditLog.projectId, projectId));
    expect(after).toHaveLength(rows.length);
  });

  it('a stale round cannot be signed off', async () => {
    await solveProject({ projectId });
    const r = await review.requestReview({ projectId, userId: engineerId });
    const current = (await getDesignBasis({ projectId })).basis;
    await saveDesignBasis({
      projectId,
      userId: engineerId,
      basis: { ...current, dewPointMarginK: current.dewPointMarginK + 1 },
    });
    const { items } = await review.getRound({ projectId, roundId: r.round.id });
    await review.dispose({
      projectId,
      roundId: r.round.id,
      itemIds: items.map((i) => i.id),
      disposition: 'insulate',
      comment: 'Insulate all' /* fits burn and sweat flags alike */,
      userId: reviewerId,
    });
    await expectAppError(
      review.signOff({ projectId, roundId: r.round.id, userId: reviewerId }),
      'conflict',
      /design basis changed/,
    );
  });
});
