import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomUUID } from 'node:crypto';
import { and, desc, eq, sql } from 'drizzle-orm';
import { NextRequest } from 'next/server';
import { db, getPool } from '@/db/client';
import {
  apiTokenEvents,
  apiTokens,
  auditLog,
  lineResults,
  lines,
  memberships,
  organizations,
  projects,
  users,
  type Role,
} from '@/db/schema';
import { createApiToken, listApiTokens, revokeApiToken } from '@/lib/auth/api-tokens';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { solveProject } from '@/lib/lines/results-store';
import { POST as calcPost } from '@/app/api/v1/calc/route';
import { POST as recommendPost } from '@/app/api/v1/recommend/route';
import { GET as linesGet } from '@/app/api/v1/projects/[projectId]/lines/route';
import { POST as designPost } from '@/app/api/v1/projects/[projectId]/lines/[lineId]/design/route';
import { GET as boqGet } from '@/app/api/v1/projects/[projectId]/boq/[number]/route';
import { expectAppError } from '../support/errors';
import { lineListWorkbook, TEMPLATE_HEADERS } from '../../seed/line-list';

afterAll(async () => {
  await getPool().end();
});

const run = randomUUID().slice(0, 8);
let orgA = '',
  orgB = '',
  projectA = '',
  projectB = '',
  lineId = '';
const people: Record<'owner' | 'engineer' | 'reviewer' | 'contractor' | 'dual' | 'ownerB', string> = {
  owner: '',
  engineer: '',
  reviewer: '',
  contractor: '',
  dual: '',
  ownerB: '',
};

async function person(key: keyof typeof people, memberOf: [string, Role][]) {
  const id = `tok-${key}-${run}`;
  await db.insert(users).values({ id, email: `${id}@example.com`, name: `Token ${key}` });
  for (const [organizationId, role] of memberOf)
    await db.insert(memberships).values({ organizationId, userId: id, role });
  people[key] = id;
}

const row = (tag: string) =>
  TEMPLATE_HEADERS.map(
    (h) =>
      (
        ({
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
        }) as Record<string, string | number>
      )[h] ?? null,
  );

beforeAll(async () => {
  [{ id: orgA }] = await db
    .insert(organizations)
    .values({ name: `Token Org A ${run}` })
    .returning();
  [{ id: orgB }] = await db
    .insert(organizations)
    .values({ name: `Token Org B ${run}` })
    .returning();
  await person('owner', [[orgA, 'owner']]);
  await person('engineer', [[orgA, 'engineer']]);
  await person('reviewer', [[orgA, 'reviewer']]);
  await person('contractor', [[orgA, 'contractor']]);
  await person('dual', [
    [orgA, 'engineer'],
    [orgB, 'owner'],
  ]);
  await person('ownerB', [[orgB, 'owner']]);
  [{ id: projectA }] = await db
    .insert(projects)
    .values({ organizationId: orgA, code: `TA-${run}`, name: 'Token project A' })
    .returning();
  [{ id: projectB }] = await db
    .insert(projects)
    .values({ organizationId: orgB, code: `TB-${run}`, name: 'Token project B' })
    .returning();
  const d = await createDraft({
    projectId: projectA,
    userId: people.engineer,
    fileName: 't.xlsx',
    bytes: await lineListWorkbook([row('T-100')]),
  });
  await commitDraft({
    projectId: projectA,
    draftId: d.draftId,
    sheetName: d.sheets[0].name,
    mapping: d.sheets[0].suggested,
    userId: people.engineer,
  });
  await solveProject({ projectId: projectA });
  [{ id: lineId }] = await db.select({ id: lines.id }).from(lines).where(eq(lines.projectId, projectA));
});

function req(
  path: string,
  o: {
    token?: string;
    authorization?: string;
    body?: unknown;
    method?: string;
    contentType?: string;
    origin?: string;
  } = {},
) {
  const headers: Record<string, string> = {};
  if (o.token) headers.authorization = `Bearer ${o.token}`;
  if (o.authorization) headers.authorization = o.authorization;
  if (o.body !== undefined) headers['content-type'] = o.contentType ?? 'application/json';
  if (o.origin) headers.origin = o.origin;
  return new NextRequest(`http://127.0.0.1${path}`, {
    method: o.method ?? (o.body === undefined ? 'GET' : 'POST'),
    headers,
    body: o.body === undefined ? undefined : JSON.stringify(o.body),
  });
}
const none = { params: Promise.resolve({}) };
const at = <P>(p: P) => ({ params: Promise.resolve(p) });

async function eventsOf(tokenId: string) {
  return db
    .select()
    .from(apiTokenEvents)
    .where(eq(apiTokenEvents.tokenId, tokenId))
    .orderBy(desc(apiTokenEvents.id));
}

// Bare 60.3 mm (NPS 2) pipe at 100 °C in 20 °C still air, ε 0.9: about 230 W/m
// (Roymech bare-pipe heat-loss table, [recalled]; the same check as tests/e2e/calc-api.spec.ts, ours within 5 %).
const good = {
  id: 'hw-2in',
  geometry: 'horizontal-pipe',
  pipeOuterDiameterMm: 60.3,
  processTempC: 100,
  ambientTempC: 20,
  windSpeedMs: 0,
  surfaceEmittance: 0.9,
  layers: [],
};

describe('making, listing and revoking API tokens', () => {
  it('gives an engineer a token shown once and keeps only its SHA-256', async () => {
    const t = await createApiToken({
      userId: people.engineer,
      organizationId: orgA,
      name: 'nightly batch',
      scopes: ['recommend', 'calc'],
      days: 30,
    });
    expect(t.token).toMatch(/^lgw_[A-Za-z0-9_-]{43}$/);
    expect(t.scopes).toEqual(['calc', 'recommend']);
    const [stored] = await db.select().from(apiTokens).where(eq(apiTokens.id, t.id));
    expect(stored.tokenHash).toBe(createHash('sha256').update(t.token).digest('hex'));
    expect(JSON.stringify(stored)).not.toContain(t.token.slice(4));
    expect(stored.prefix).toBe(t.token.slice(0, 10));
    expect(Math.round((stored.expiresAt.getTime() - stored.createdAt.getTime()) / 86_400_000)).toBe(30);
    const listed = await listApiTokens({ userId: people.engineer, organizationId: orgA });
    expect(listed.map((x) => x.name)).toContain('nightly batch');
    expect(Object.keys(listed[0])).not.toContain('tokenHash');
    const [made] = await eventsOf(t.id);
    expect(made.action).toBe('created');
    expect(made.detail).toMatchObject({ name: 'nightly batch', scopes: ['calc', 'recommend'] });
  });

  it('refuses a contractor and a reviewer, a stranger, unknown scopes and impossible expiries with a sentence', async () => {
    await expectAppError(
      createApiToken({
        userId: people.contractor,
        organizationId: orgA,
        name: 'x',
        scopes: ['calc'],
        days: 30,
      }),
      'forbidden',
      'Your role in this organization does not allow making API tokens.',
    );
    await expectAppError(
      createApiToken({
        userId: people.reviewer,
        organizationId: orgA,
        name: 'x',
        scopes: ['calc'],
        days: 30,
      }),
      'forbidden',
      'Your role in this organization does not allow making API tokens.',
    );
    await expectAppError(
      createApiToken({ userId: people.ownerB, organizationId: orgA, name: 'x', scopes: ['calc'], days: 30 }),
      'not_found',
    );
    await expectAppError(
      createApiToken({ userId: people.owner, organizationId: orgA, name: 'x', scopes: ['admin'], days: 30 }),
      'invalid',
      'Unknown scope "admin".',
    );
    await expectAppError(
      createApiToken({ userId: people.owner, organizationId: orgA, name: 'x', scopes: [], days: 30 }),
      'invalid',
      'Choose at least one scope.',
    );
    await expectAppError(
      createApiToken({ userId: people.owner, organizationId: orgA, name: 'x', scopes: ['calc'], days: 400 }),
      'invalid',
      'The expiry must be between 1 and 366 days.',
    );
    await expectAppError(
      createApiToken({ userId: people.owner, organizationId: orgA, name: '  ', scopes: ['calc'], days: 30 }),
      'invalid',
      'Give the token a name of 1 to 80 characters.',
    );
    const count = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(apiTokens)
      .where(eq(apiTokens.organizationId, orgA));
    expect(count[0].n).toBe(1); // only the engineer's token of the first test: nothing half-written
  });

  it('revokes only the maker’s own token, once', async () => {
    const t = await createApiToken({
      userId: people.owner,
      organizationId: orgA,
      name: 'to revoke',
      scopes: ['calc'],
      days: 7,
    });
    await expectAppError(revokeApiToken({ userId: people.engineer, tokenId: t.id }), 'not_found');
    const first = await revokeApiToken({ userId: people.owner, tokenId: t.id });
    const again = await revokeApiToken({ userId: people.owner, tokenId: t.id });
    expect(again.revokedAt.getTime()).toBe(first.revokedAt.getTime());
    expect((await eventsOf(t.id)).map((e) => e.action)).toEqual(['revoked', 'created']);
  });
});

describe('the API with Authorization: Bearer', () => {
  it('answers the calculation per case, records the use and the last use', async () => {
    const t = await createApiToken({
      userId: people.engineer,
      organizationId: orgA,
      name: 'calc script',
      scopes: ['calc'],
      days: 30,
    });
    // No Origin header at all and a foreign one both pass: a bearer token is not sent by a browser on its own.
    const res = await calcPost(
      req('/api/v1/calc', {
        token: t.token,
        origin: 'https://elsewhere.example',
        body: [good, { ...good, id: 'bad', surfaceEmittance: 1.4 }, 7],
      }),
      none,
    );
    expect(res.status).toBe(200);
    const [a, b, c] = await res.json();
    expect(a.id).toBe('hw-2in');
    expect(Math.abs(a.heatLossWPerM - 230) / 230).toBeLessThan(0.05);
    expect(b).toEqual({ id: 'bad', error: 'surfaceEmittance: surfaceEmittance must be between 0 and 1' });
    expect(c).toEqual({ error: 'case 3: a case must be a JSON object' });
    const [used] = await eventsOf(t.id);
    expect(used).toMatchObject({
      action: 'used',
      method: 'POST',
      path: '/api/v1/calc',
      status: 200,
      userId: people.engineer,
      actorName: 'Token engineer',
      detail: { cases: 3, errors: 2 },
    });
    const [after] = await db.select().from(apiTokens).where(eq(apiTokens.id, t.id));
    expect(after.lastUsedAt).not.toBeNull();
  });

  it('refuses a token without the scope, and records the refusal', async () => {
    const t = await createApiToken({
      userId: people.engineer,
      organizationId: orgA,
      name: 'calc only',
      scopes: ['calc'],
      days: 30,
    });
    const res = await recommendPost(
      req('/api/v1/recommend', {
        token: t.token,
        body: [
          { id: 'x', geometry: 'horizontal-pipe', nps: '2', normalTempC: 80, purposes: ['heatConservation'] },
        ],
      }),
      none,
    );
    expect(res.status).toBe(403);
    expect((await res.json()).error.message).toBe(
      'This API token ("calc only") does not have the "recommend" scope; make a token with it under Account → API tokens.',
    );
    const [ev] = await eventsOf(t.id);
    expect(ev).toMatchObject({ action: 'refused', status: 403, path: '/api/v1/recommend' });
  });

  it('refuses an expired and a revoked token with the date, and an unknown one without recording anything', async () => {
    const old = await createApiToken({
      userId: people.engineer,
      organizationId: orgA,
      name: 'old',
      scopes: ['calc'],
      days: 1,
      now: new Date(Date.now() - 2 * 86_400_000),
    });
    const r1 = await calcPost(req('/api/v1/calc', { token: old.token, body: [good] }), none);
    expect(r1.status).toBe(401);
    expect((await r1.json()).error.message).toMatch(
      /^This API token \("old"\) expired on \d{4}-\d\d-\d\d \d\d:\d\d UTC\. Make a new one/,
    );
    expect((await eventsOf(old.id))[0]).toMatchObject({
      action: 'refused',
      status: 401,
      detail: { reason: 'expired' },
    });

    const gone = await createApiToken({
      userId: people.engineer,
      organizationId: orgA,
      name: 'gone',
      scopes: ['calc'],
      days: 30,
    });
    expect((await calcPost(req('/api/v1/calc', { token: gone.token, body: [good] }), none)).status).toBe(200);
    await revokeApiToken({ userId: people.engineer, tokenId: gone.id });
    const r2 = await calcPost(req('/api/v1/calc', { token: gone.token, body: [good] }), none);
    expect(r2.status).toBe(401);
    expect((await r2.json()).error.message).toMatch(/^This API token \("gone"\) was revoked on /);
    expect((await eventsOf(gone.id)).map((e) => `${e.action}:${e.status ?? ''}`)).toEqual([
      'refused:401',
      'revoked:',
      'used:200',
      'created:',
    ]);

    const before = await db.select({ n: sql<number>`count(*)::int` }).from(apiTokenEvents);
    const r3 = await calcPost(req('/api/v1/calc', { token: `lgw_${'A'.repeat(43)}`, body: [good] }), none);
    expect(r3.status).toBe(401);
    expect((await r3.json()).error.message).toBe(
      'This API token is not valid. Make a new one under Account → API tokens.',
    );
    const r4 = await calcPost(
      req('/api/v1/calc', { authorization: 'Basic dXNlcjpwYXNz', body: [good] }),
      none,
    );
    expect(r4.status).toBe(401);
    expect((await r4.json()).error.message).toBe('Send the API token as "Authorization: Bearer <token>".');
    const afterCount = await db.select({ n: sql<number>`count(*)::int` }).from(apiTokenEvents);
    expect(afterCount[0].n).toBe(before[0].n);
  });

  it('follows the maker’s current role: a token stops working when its maker becomes a contractor', async () => {
    await person('engineer2' as never, [[orgA, 'engineer']]);
    const who = people['engineer2' as keyof typeof people];
    const t = await createApiToken({
      userId: who,
      organizationId: orgA,
      name: 'demoted',
      scopes: ['calc'],
      days: 30,
    });
    expect((await calcPost(req('/api/v1/calc', { token: t.token, body: [good] }), none)).status).toBe(200);
    await db
      .update(memberships)
      .set({ role: 'contractor' })
      .where(and(eq(memberships.userId, who), eq(memberships.organizationId, orgA)));
    const res = await calcPost(req('/api/v1/calc', { token: t.token, body: [good] }), none);
    expect(res.status).toBe(403);
    expect((await res.json()).error.message).toBe(
      'Your role in this organization no longer allows the "calc" scope.',
    );
    await db
      .delete(memberships)
      .where(and(eq(memberships.userId, who), eq(memberships.organizationId, orgA)));
    const gone = await calcPost(req('/api/v1/calc', { token: t.token, body: [good] }), none);
    expect(gone.status).toBe(401);
    expect((await gone.json()).error.message).toBe(
      `The maker of this API token ("demoted") is no longer a member of Token Org A ${run}.`,
    );
  });

  it('reads the line table of its own organization only, even when its maker belongs to another', async () => {
    const t = await createApiToken({
      userId: people.dual,
      organizationId: orgA,
      name: 'reader',
      scopes: ['lines:read'],
      days: 30,
    });
    const ok = await linesGet(
      req(`/api/v1/projects/${projectA}/lines?size=10`, { token: t.token }),
      at({ projectId: projectA }),
    );
    expect(ok.status).toBe(200);
    const body = await ok.json();
    const [stored] = await db.select().from(lineResults).where(eq(lineResults.lineId, lineId));
    expect(body.rows.map((r: { tag: string }) => r.tag)).toEqual(['T-100']);
    expect(body.rows[0].recommendedMm).toBe(stored.recommendedMm);
    // The maker owns organization B, but this token was made in A: B's project is not found.
    const other = await linesGet(
      req(`/api/v1/projects/${projectB}/lines`, { token: t.token }),
      at({ projectId: projectB }),
    );
    expect(other.status).toBe(404);
    const calc = await calcPost(req('/api/v1/calc', { token: t.token, body: [good] }), none);
    expect(calc.status).toBe(403);
    // A route that serves only the browser refuses tokens outright.
    const boq = await boqGet(
      req(`/api/v1/projects/${projectA}/boq/1`, { token: t.token }),
      at({ projectId: projectA, number: '1' }),
    );
    expect(boq.status).toBe(401);
    expect((await boq.json()).error.message).toBe(
      'This address does not accept API tokens; it serves the signed-in browser.',
    );
    expect((await eventsOf(t.id)).slice(0, 3).map((e) => `${e.action}:${e.status}:${e.path}`)).toEqual([
      `refused:403:/api/v1/calc`,
      `used:404:/api/v1/projects/${projectB}/lines`,
      `used:200:/api/v1/projects/${projectA}/lines`,
    ]);
  });

  it('chooses a thickness with lines:write, audited as made through the token', async () => {
    const t = await createApiToken({
      userId: people.engineer,
      organizationId: orgA,
      name: 'picker',
      scopes: ['lines:write'],
      days: 30,
    });
    const [stored] = await db.select().from(lineResults).where(eq(lineResults.lineId, lineId));
    const bad = await designPost(
      req(`/api/v1/projects/${projectA}/lines/${lineId}/design`, {
        token: t.token,
        body: { thicknessMm: 'thick', expectedVersion: 0 },
      }),
      at({ projectId: projectA, lineId }),
    );
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.message).toBe('thicknessMm: thicknessMm must be a number.');
    // Per part is for vessels; one thickness or parts, not both.
    const both = await designPost(
      req(`/api/v1/projects/${projectA}/lines/${lineId}/design`, {
        token: t.token,
        body: {
          thicknessMm: 50,
          parts: { shell: { thicknessMm: 50 }, top: { thicknessMm: 50 }, bottom: { thicknessMm: 50 } },
          expectedVersion: 0,
        },
      }),
      at({ projectId: projectA, lineId }),
    );
    expect(both.status).toBe(400);
    expect((await both.json()).error.message).toBe(
      'send either thicknessMm or, for a vessel, parts { shell, top, bottom } (one of them).',
    );
    const partsOnPipe = await designPost(
      req(`/api/v1/projects/${projectA}/lines/${lineId}/design`, {
        token: t.token,
        body: {
          parts: {
            shell: { thicknessMm: 50 },
            top: { thicknessMm: 50, guarded: true },
            bottom: { thicknessMm: 50 },
          },
          expectedVersion: 0,
        },
      }),
      at({ projectId: projectA, lineId }),
    );
    expect(partsOnPipe.status).toBe(400);
    expect((await partsOnPipe.json()).error.message).toBe(
      'Only a vessel has a shell and heads to choose apart.',
    );
    const notJson = await designPost(
      req(`/api/v1/projects/${projectA}/lines/${lineId}/design`, {
        token: t.token,
        body: { thicknessMm: stored.recommendedMm, expectedVersion: 0 },
        contentType: 'text/plain',
      }),
      at({ projectId: projectA, lineId }),
    );
    expect(notJson.status).toBe(415);
    const res = await designPost(
      req(`/api/v1/projects/${projectA}/lines/${lineId}/design`, {
        token: t.token,
        body: { thicknessMm: stored.recommendedMm, expectedVersion: 0 },
      }),
      at({ projectId: projectA, lineId }),
    );
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ version: 1, source: 'recommended', belowCriterion: null });
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.lineId, lineId), eq(auditLog.action, 'design pick')))
      .orderBy(desc(auditLog.id));
    expect(audit.actorId).toBe(people.engineer);
    expect(audit.after).toMatchObject({
      thicknessMm: stored.recommendedMm,
      source: 'recommended',
      via: 'API token "picker"',
    });
    const reader = await createApiToken({
      userId: people.engineer,
      organizationId: orgA,
      name: 'reader only',
      scopes: ['lines:read'],
      days: 30,
    });
    const refused = await designPost(
      req(`/api/v1/projects/${projectA}/lines/${lineId}/design`, {
        token: reader.token,
        body: { thicknessMm: stored.recommendedMm, expectedVersion: 1 },
      }),
      at({ projectId: projectA, lineId }),
    );
    expect(refused.status).toBe(403);
  });

  it('keeps the token record append-only for the application role', async () => {
    const codeOf = async (s: ReturnType<typeof sql>) => {
      try {
        await db.execute(s);
        return 'ok';
      } catch (e) {
        const x = e as { code?: string; cause?: { code?: string } };
        return String(x.cause?.code ?? x.code);
      }
    };
    expect(await codeOf(sql`update api_token_events set status = 200`)).toBe('42501');
    expect(await codeOf(sql`delete from api_token_events`)).toBe('42501');
    expect(await codeOf(sql`truncate api_token_events`)).toBe('42501');
  });
});
