import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { db, getPool } from '@/db/client';
import { lines, memberships, projects, reviewItems } from '@/db/schema';
import * as auth from '@/lib/auth/service';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { solveProject } from '@/lib/lines/results-store';
import * as review from '@/lib/review/store';
import { dispositionsFor } from '@/lib/review/dispositions';
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
  reviewerEmail = '';
const uniq = () => randomUUID().slice(0, 8);

beforeAll(async () => {
  const eng = await auth.signUp({
    name: 'Cara Engineer',
    email: `eng.${uniq()}@example.com`,
    password: 'flanged-spool-piece',
    organizationName: 'Carry Org',
  });
  engineerId = eng.userId;
  reviewerEmail = `rev.${uniq()}@example.com`;
  const rev = await auth.signUp({
    name: 'Rune Reviewer',
    email: reviewerEmail,
    password: 'flanged-spool-piece',
    organizationName: 'Rune own org',
  });
  reviewerId = rev.userId;
  await db
    .insert(memberships)
    .values({ organizationId: eng.organizationId, userId: reviewerId, role: 'reviewer' });
  const [p] = await db
    .insert(projects)
    .values({ organizationId: eng.organizationId, code: 'CO-1', name: 'Carry-over test' })
    .returning();
  projectId = p.id;
  const draft = await createDraft({
    projectId,
    userId: engineerId,
    fileName: 'c.xlsx',
    bytes: await lineListWorkbook([
      row('H-1'),
      row('H-2'),
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

describe('dispositions per flag type', () => {
  it('offers the burn list for a hot surface and the sweat list for a sweating one', () => {
    expect(dispositionsFor(['hot-surface'])).toEqual([
      'insulate',
      'guard',
      'warning-sign',
      'not-accessible',
      'returned',
    ]);
    expect(dispositionsFor(['sweating'])).toEqual([
      'insulate',
      'vapour-retarder-repair',
      'drip-protection',
      'returned',
    ]);
    expect(dispositionsFor(['hot-surface', 'interface-limit'])).toContain('guard');
    expect(dispositionsFor(['hot-surface', 'sweating'])).toEqual(['insulate', 'returned']);
    expect(dispositionsFor(['blocked'])).toHaveLength(7); // no hazard named: the reviewer's choice
  });
});

describe('review rounds carry over unchanged decisions', () => {
  let round1 = '';
  it('refuses a burn disposition on a sweating line (and the reverse) with a sentence naming the field and the line', async () => {
    const r = await review.requestReview({ projectId, userId: engineerId });
    round1 = r.round.id;
    expect(r.lines).toBe(3);
    expect(r.carried).toBe(0);
    const { items } = await review.getRound({ projectId, roundId: round1 });
    const c1 = items.find((i) => i.tag === 'C-1')!,
      h1 = items.find((i) => i.tag === 'H-1')!,
      h2 = items.find((i) => i.tag === 'H-2')!;
    expect(c1.flags.map((f) => f.type)).toContain('sweating');
    expect(c1.allowed).toEqual(['insulate', 'vapour-retarder-repair', 'drip-protection', 'returned']);
    await expectAppError(
      review.dispose({
        projectId,
        roundId: round1,
        itemIds: [c1.id],
        disposition: 'warning-sign',
        comment: 'sign it',
        userId: reviewerId,
      }),
      'invalid',
      /^Disposition: "Warning sign and restricted access" does not fit the flags of line C-1/,
    );
    await expectAppError(
      review.dispose({
        projectId,
        roundId: round1,
        itemIds: [h1.id],
        disposition: 'drip-protection',
        comment: 'tray',
        userId: reviewerId,
      }),
      'invalid',
      /does not fit the flags of line H-1/,
    );
    await review.dispose({
      projectId,
      roundId: round1,
      itemIds: [c1.id],
      disposition: 'drip-protection',
      comment: 'Drip tray under the pump skid',
      userId: reviewerId,
    });
    await review.dispose({
      projectId,
      roundId: round1,
      itemIds: [h1.id],
      disposition: 'guard',
      comment: 'Mesh guard at the walkway',
      userId: reviewerId,
    });
    await review.dispose({
      projectId,
      roundId: round1,
      itemIds: [h2.id],
      disposition: 'not-accessible',
      comment: 'Pipe rack at 6 m',
      userId: reviewerId,
    });
    await review.signOff({ projectId, roundId: round1, userId: reviewerId });
  });

  it('a new round copies the decisions of unchanged lines into new rows, re-opens the changed line, says so, and mails the round link', async () => {
    // H-2's inputs change (a new input version), so its decision does not carry over.
    await db
      .update(lines)
      .set({ inputVersion: sql`${lines.inputVersion} + 1` })
      .where(and(eq(lines.projectId, projectId), eq(lines.tag, 'H-2')));
    await solveProject({ projectId });
    const before = await db.select().from(reviewItems).where(eq(reviewItems.roundId, round1));
    const asked = new Date(Date.now() - 1000);
    const r = await review.requestReview({ projectId, userId: engineerId });
    expect(r.lines).toBe(3);
    expect(r.carried).toBe(2);
    const { items } = await review.getRound({ projectId, roundId: r.round.id });
    const by = Object.fromEntries(items.map((i) => [i.tag, i]));
    expect(by['C-1']).toMatchObject({
      disposition: 'drip-protection',
      comment: 'Drip tray under the pump skid',
      carriedFromRound: 1,
      status: 'decided',
      deciderName: 'Rune Reviewer',
    });
    expect(by['H-1']).toMatchObject({
      disposition: 'guard',
      comment: 'Mesh guard at the walkway',
      carriedFromRound: 1,
      status: 'decided',
    });
    expect(by['H-2']).toMatchObject({ disposition: null, carriedFromRound: null, status: 'open' });
    // New rows in the new round; the signed-off round's rows are exactly as they were.
    expect(items.every((i) => i.roundId === r.round.id)).toBe(true);
    const after = await db.select().from(reviewItems).where(eq(reviewItems.roundId, round1));
    expect(after).toEqual(before);
    const mail = await waitForMail(reviewerEmail, {
      subject: /Safety review requested: CO-1 round 2 \(3 lines\)/,
      after: asked,
    });
    expect(mail.text).toContain(
      '2 decisions carried over from earlier signed-off rounds (line, design and flags unchanged); 1 to decide.',
    );
    expect(mail.text).toContain(`/projects/${projectId}/review/${r.round.id}`);
    // Deciding a carried item again makes it this round's own decision.
    await review.dispose({
      projectId,
      roundId: r.round.id,
      itemIds: [by['H-1'].id],
      disposition: 'warning-sign',
      comment: 'Sign instead',
      userId: reviewerId,
    });
    const again = await review.getRound({ projectId, roundId: r.round.id });
    expect(again.items.find((i) => i.tag === 'H-1')).toMatchObject({
      disposition: 'warning-sign',
      carriedFromRound: null,
    });
  });
});
