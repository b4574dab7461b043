/**
 * Comments on a line through the server action and its wrapper (session and role checked on the
 * server): who may read and post (owner, engineer, reviewer; not a contractor), another
 * organization's project is not found, threading one level deep, plain text kept as typed, the
 * length limit as a sentence, and the audit trail.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { db, getPool } from '@/db/client';
import { auditLog, lineComments, lines, memberships, projects, users, type Role } from '@/db/schema';
import { lucia } from '@/lib/auth/lucia';
import { can } from '@/lib/auth/permissions';
import * as auth from '@/lib/auth/service';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { COMMENT_MAX, listComments } from '@/lib/comments';
import { lineListWorkbook, TEMPLATE_HEADERS } from '../../seed/line-list';

const jar = new Map<string, string>();
vi.mock('next/headers', () => ({
  cookies: async () => ({
    get: (name: string) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined),
    set: (name: string, value: string) => {
      jar.set(name, value);
    },
    delete: (name: string) => {
      jar.delete(name);
    },
  }),
  headers: async () => new Headers(),
}));

const { addLineCommentAction } = await import(
  '../../app/(app)/projects/[projectId]/lines/[lineId]/comment-actions'
);

const run = randomUUID().slice(0, 8);
const people: Record<Role | 'stranger', string> = {
  owner: '',
  engineer: '',
  reviewer: '',
  contractor: '',
  stranger: '',
};
let projectId = '';
let lineId = '';
let otherLineId = '';

async function as(who: keyof typeof people) {
  const s = await lucia.createSession(people[who], {});
  jar.set(lucia.sessionCookieName, s.id);
}

const row = (tag: string) =>
  TEMPLATE_HEADERS.map(
    (h) =>
      (
        ({
          'Line tag': tag,
          Service: 'Chilled water',
          Area: 'North',
          Geometry: 'Horizontal pipe',
          NPS: '4',
          'Length (m)': 30,
          'Normal temp (°C)': 6,
          'Max temp (°C)': 8,
          Purpose: 'C',
          Location: 'Indoor',
        }) as Record<string, string | number>
      )[h] ?? null,
  );

beforeAll(async () => {
  const o = await auth.signUp({
    name: 'Comment Owner',
    email: `c-owner.${run}@example.com`,
    password: 'insulated-elbow-remark-3',
    organizationName: 'Comments Org',
  });
  people.owner = o.userId;
  for (const role of ['engineer', 'reviewer', 'contractor'] as const) {
    const id = `cmt-${role}-${run}`;
    await db.insert(users).values({ id, email: `${id}@example.com`, name: `Ana ${role}` });
    await db.insert(memberships).values({ organizationId: o.organizationId, userId: id, role });
    people[role] = id;
  }
  const other = await auth.signUp({
    name: 'Other Engineer',
    email: `c-other.${run}@example.com`,
    password: 'insulated-elbow-remark-4',
    organizationName: 'Other Org',
  });
  people.stranger = other.userId;
  const [p] = await db
    .insert(projects)
    .values({ organizationId: o.organizationId, code: 'CMT-1', name: 'Comments test' })
    .returning();
  projectId = p.id;
  const d = await createDraft({
    projectId,
    userId: people.owner,
    fileName: 'c.xlsx',
    bytes: await lineListWorkbook([row('CW-1'), row('CW-2')]),
  });
  const s = d.sheets[0];
  await commitDraft({
    projectId,
    draftId: d.draftId,
    sheetName: s.name,
    mapping: s.suggested,
    userId: people.owner,
  });
  const ls = await db
    .select({ id: lines.id, tag: lines.tag })
    .from(lines)
    .where(eq(lines.projectId, projectId));
  lineId = ls.find((l) => l.tag === 'CW-1')!.id;
  otherLineId = ls.find((l) => l.tag === 'CW-2')!.id;
});
afterAll(async () => {
  await getPool().end();
});

describe('line comments', () => {
  it('gives the rights the permission table states: owner, engineer and reviewer read and post; a contractor neither', () => {
    const rights = (['owner', 'engineer', 'reviewer', 'contractor'] as const).map((r) => [
      r,
      can(r, 'comments.read'),
      can(r, 'comments.write'),
    ]);
    expect(rights).toEqual([
      ['owner', true, true],
      ['engineer', true, true],
      ['reviewer', true, true],
      ['contractor', false, false],
    ]);
  });

  it('threads an engineer comment and a reviewer reply, with authors, times and an audit entry each', async () => {
    await as('engineer');
    const a = await addLineCommentAction(projectId, {
      lineId,
      body: 'Vapour retarder lap at the support: 50 mm?\r\nPlease confirm.',
    });
    expect(a.ok).toBe(true);
    if (!a.ok) return;
    expect(a.data).toHaveLength(1);
    expect(a.data[0]).toMatchObject({
      authorName: 'Ana engineer',
      body: 'Vapour retarder lap at the support: 50 mm?\nPlease confirm.',
      replies: [],
    });
    expect(Date.now() - Date.parse(a.data[0].createdAt)).toBeLessThan(60_000);
    const rootId = a.data[0].id;

    await as('reviewer');
    const b = await addLineCommentAction(projectId, {
      lineId,
      parentId: rootId,
      body: 'Confirmed, 50 mm minimum.',
    });
    expect(b.ok && b.data[0].replies.map((r) => [r.authorName, r.body])).toEqual([
      ['Ana reviewer', 'Confirmed, 50 mm minimum.'],
    ]);
    // A reply to a reply joins the same thread (one level deep).
    const replyId = b.ok ? b.data[0].replies[0].id : '';
    await as('owner');
    const c = await addLineCommentAction(projectId, { lineId, parentId: replyId, body: 'Noted.' });
    expect(c.ok && c.data.map((t) => [t.body.slice(0, 14), t.replies.map((r) => r.authorName)])).toEqual([
      ['Vapour retarde', ['Ana reviewer', 'Comment Owner']],
    ]);
    const audit = await db
      .select({
        action: auditLog.action,
        actorName: auditLog.actorName,
        tag: auditLog.tag,
        after: auditLog.after,
      })
      .from(auditLog)
      .where(and(eq(auditLog.projectId, projectId), eq(auditLog.lineId, lineId)))
      .orderBy(auditLog.at);
    expect(audit.filter((x) => x.action.startsWith('comment'))).toEqual([
      {
        action: 'comment added',
        actorName: 'Ana engineer',
        tag: 'CW-1',
        after: { comment: 'Vapour retarder lap at the support: 50 mm?\nPlease confirm.' },
      },
      {
        action: 'comment replied',
        actorName: 'Ana reviewer',
        tag: 'CW-1',
        after: { comment: 'Confirmed, 50 mm minimum.' },
      },
      { action: 'comment replied', actorName: 'Comment Owner', tag: 'CW-1', after: { comment: 'Noted.' } },
    ]);
  });

  it('refuses a contractor, another organization and a reply across lines; nothing is stored', async () => {
    const before = (await db.select().from(lineComments).where(eq(lineComments.projectId, projectId))).length;
    await as('contractor');
    expect(await addLineCommentAction(projectId, { lineId, body: 'Price includes mastic.' })).toEqual({
      ok: false,
      error: 'Your role in this organization does not allow that.',
      fields: undefined,
    });
    await as('stranger');
    const r = await addLineCommentAction(projectId, { lineId, body: 'Hello from elsewhere.' });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.error).toBe('Not found.');
    jar.clear();
    expect(await addLineCommentAction(projectId, { lineId, body: 'Anonymous.' })).toMatchObject({
      ok: false,
      error: 'Your session has ended. Sign in again.',
    });
    await as('engineer');
    const [root] = await listComments({ projectId, lineId });
    expect(
      await addLineCommentAction(projectId, { lineId: otherLineId, parentId: root.id, body: 'Wrong line.' }),
    ).toMatchObject({
      ok: false,
      error: 'The comment you replied to is no longer on this line; reload the page.',
    });
    expect((await db.select().from(lineComments).where(eq(lineComments.projectId, projectId))).length).toBe(
      before,
    );
  });

  it('keeps markup as typed text, and refuses an empty or too long comment with a sentence', async () => {
    await as('engineer');
    const html = '<img src=x onerror="alert(1)"> <b>bold</b> & =SUM(A1)';
    const r = await addLineCommentAction(projectId, { lineId: otherLineId, body: html });
    expect(r.ok && r.data[0].body).toBe(html);
    expect(await addLineCommentAction(projectId, { lineId: otherLineId, body: ' \n\t ' })).toMatchObject({
      ok: false,
      error: 'Write the comment before posting it.',
    });
    expect(
      await addLineCommentAction(projectId, { lineId: otherLineId, body: 'x'.repeat(COMMENT_MAX + 1) }),
    ).toMatchObject({
      ok: false,
      error:
        'A comment can be at most 2,000 characters; this one has 2,001. Shorten it or split it into two.',
      fields: {
        body: [
          'A comment can be at most 2,000 characters; this one has 2,001. Shorten it or split it into two.',
        ],
      },
    });
    const ok = await addLineCommentAction(projectId, { lineId: otherLineId, body: 'é'.repeat(COMMENT_MAX) });
    expect(ok.ok).toBe(true);
    expect(await listComments({ projectId, lineId: otherLineId })).toHaveLength(2);
  });
});
