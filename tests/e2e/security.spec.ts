import { readFileSync, existsSync } from 'node:fs';
import { expect, test, type APIResponse } from './fixtures';
import { demo, openDemoProject, signIn, signUpConfirmed } from './helpers';
import { SERVER_LOG } from '../../playwright.config';

/** Runs against the production build (`next start`), as every end-to-end test does. */

function expectSecurityHeaders(r: APIResponse, kind: 'page' | 'api') {
  const h = r.headers();
  expect(h['x-content-type-options']).toBe('nosniff');
  expect(h['x-frame-options']).toBe('DENY');
  expect(h['referrer-policy']).toBe('strict-origin-when-cross-origin');
  expect(h['permissions-policy']).toContain('camera=()');
  const csp = h['content-security-policy'];
  expect(csp).toContain("frame-ancestors 'none'");
  if (kind === 'page') {
    expect(csp).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]{16,}' 'strict-dynamic'/);
    expect(csp).not.toContain('unsafe-eval');
  } else {
    expect(csp).toContain("default-src 'none'");
  }
  // Served over plain HTTP on loopback here: no HSTS (it is sent when LAGWISE_SECURE_COOKIES=1 or over HTTPS).
  expect(h['strict-transport-security']).toBeUndefined();
}

test('the development mailbox does not exist in a production build, signed in or not', async ({ page }) => {
  expect((await page.request.get('/dev/mailbox')).status()).toBe(404);
  const u = demo('owner');
  await signIn(page, u.email, u.password);
  const r = await page.request.get('/dev/mailbox');
  expect(r.status()).toBe(404);
  expect(await r.text()).not.toContain('reset-password');
});

test('pages and API routes carry the security headers; each page gets its own nonce and runs under it', async ({
  page,
}) => {
  const violations: string[] = [];
  page.on('console', (m) => {
    if (/Content Security Policy/i.test(m.text())) violations.push(m.text());
  });
  const a = await page.request.get('/sign-in');
  const b = await page.request.get('/sign-in');
  expectSecurityHeaders(a, 'page');
  const nonceOf = (r: APIResponse) => r.headers()['content-security-policy'].match(/'nonce-([^']+)'/)![1];
  expect(nonceOf(a)).not.toBe(nonceOf(b));
  // Next.js put this response's nonce on its own scripts.
  const html = await a.text();
  const scriptNonces = [...html.matchAll(/<script[^>]*nonce="([^"]+)"/g)].map((m) => m[1]);
  expect(scriptNonces.length).toBeGreaterThan(0);
  expect(new Set(scriptNonces)).toEqual(new Set([nonceOf(a)]));

  expectSecurityHeaders(await page.request.get('/api/health'), 'api');
  expectSecurityHeaders(await page.request.post('/api/v1/calc', { data: [] }), 'api');

  // The app works under the policy: sign in, open the project, a line page with its chart.
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const id = await openDemoProject(page);
  expectSecurityHeaders(await page.request.get(`/projects/${id}/review`), 'page');
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  await page.locator('table a[href*="/lines/"]').first().click();
  await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
  expect(violations).toEqual([]);
});

test('sign-off and bill pages cannot be framed by another site', async ({ page }) => {
  const u = demo('reviewer');
  await signIn(page, u.email, u.password);
  const id = await openDemoProject(page);
  for (const path of [`/projects/${id}/review`, `/projects/${id}/boq`]) {
    const r = await page.request.get(path);
    expect(r.status()).toBe(200);
    expect(r.headers()['x-frame-options']).toBe('DENY');
    expect(r.headers()['content-security-policy']).toContain("frame-ancestors 'none'");
  }
});

test('one account under attack is throttled whatever X-Forwarded-For says; other accounts still sign in', async ({
  page,
  playwright,
  baseURL,
}) => {
  // A fresh account, so no demo account is locked for the other tests.
  const email = `target.${Date.now()}@example.com`;
  await signUpConfirmed(page, {
    name: 'Tess Target',
    email,
    password: 'granite-elbow-target',
    organization: 'Target Works',
  });
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page).toHaveURL(/\/sign-in$/);

  // Five wrong tries, each claiming another client address: no trusted proxy, so the header is ignored.
  for (let i = 0; i < 5; i++) {
    await page.setExtraHTTPHeaders({ 'x-forwarded-for': `198.51.100.${i + 1}` });
    await page.getByLabel('E-mail', { exact: true }).fill(email);
    await page.getByLabel('Password', { exact: true }).fill(`wrong-password-${i}`);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(
      page.getByRole('alert').filter({ hasText: 'E-mail or password is not right.' }),
    ).toBeVisible();
  }
  await page.setExtraHTTPHeaders({ 'x-forwarded-for': '203.0.113.77' });
  await page.getByLabel('E-mail', { exact: true }).fill(email);
  await page.getByLabel('Password', { exact: true }).fill('granite-elbow-target');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(
    page.getByRole('alert').filter({ hasText: /Too many failed sign-ins\. Wait \d+ seconds/ }),
  ).toBeVisible();

  // Another person signs in at the same moment, from the same (unknown) address.
  const ctx = await playwright.chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--no-sandbox'],
  });
  const other = await ctx.newPage({ baseURL });
  const eng = demo('engineer');
  await signIn(other, eng.email, eng.password);
  await ctx.close();
});

test('refusals answer 413, 403 and 404 rather than 500', async ({ page, baseURL }) => {
  // An oversized sign-in post (a server action) and an oversized line-list upload.
  const big = Buffer.alloc(25 * 1024 * 1024, 0x61);
  const signInPost = await page.request.post('/sign-in', {
    data: big,
    headers: { 'content-type': 'text/plain;charset=UTF-8', 'next-action': 'x' },
  });
  expect(signInPost.status()).toBe(413);
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const id = await openDemoProject(page);
  const upload = await page.request.post(`/projects/${id}/lines`, {
    multipart: {
      file: { name: 'lines.csv', mimeType: 'text/csv', buffer: Buffer.alloc(21 * 1024 * 1024 + 10, 0x61) },
    },
    headers: { 'next-action': 'x' },
  });
  expect(upload.status()).toBe(413);
  expect((await upload.json()).error.message).toMatch(/too large: this page accepts at most 21 MB/);

  const nullOrigin = await page.request.post('/api/v1/calc', { data: [], headers: { origin: 'null' } });
  expect(nullOrigin.status()).toBe(403);
  expect(
    (await page.request.post('/api/v1/calc', { data: [], headers: { origin: 'not a url' } })).status(),
  ).toBe(403);

  expect((await page.request.get(`/api/v1/projects/${id}/boq/1`)).status()).toBe(200);
  for (const n of ['0x1', '1e0', '01', '+1', '1.0']) {
    expect((await page.request.get(`/api/v1/projects/${id}/boq/${encodeURIComponent(n)}`)).status(), n).toBe(
      404,
    );
  }
  expect((await page.request.get('/api/v1/projects/------------------------------------')).status()).toBe(
    404,
  );

  // A conductivity table far beyond any declared curve is refused before any CPU is spent.
  const points = Array.from({ length: 5000 }, (_, i) => [i / 10, 0.04]);
  const heavy = await page.request.post('/api/v1/calc', {
    data: [
      {
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 60.3,
        processTempC: 100,
        ambientTempC: 20,
        surfaceEmittance: 0.9,
        layers: [{ thicknessMm: 25, conductivity: { type: 'table', points } }],
      },
    ],
    headers: { origin: baseURL! },
  });
  expect(heavy.status()).toBe(400);
  expect((await heavy.json()).error.fields['0.layers.0.conductivity.points'][0]).toBe(
    'a conductivity table may have at most 200 points',
  );
});

test('the session cookie lasts as long as the session (30 days), not ~400 days', async ({
  page,
  context,
}) => {
  const u = demo('reviewer');
  await signIn(page, u.email, u.password);
  const cookie = (await context.cookies()).find((c) => c.name === 'lagwise_session')!;
  expect(cookie.httpOnly).toBe(true);
  expect(cookie.sameSite).toBe('Lax');
  const days = (cookie.expires * 1000 - Date.now()) / 86_400_000;
  expect(days).toBeGreaterThan(29);
  expect(days).toBeLessThanOrEqual(30.01);
});

test('a failing write leaves no request data in the server log', async ({ page }) => {
  // playwright.config.ts tees the server's stderr into this file.
  const log = SERVER_LOG;
  expect(existsSync(log)).toBe(true);
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  await openDemoProject(page);
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  // PostgreSQL refuses the NUL character in text; the marker must not reach the log whatever happens.
  const marker = `MARKER-${Date.now()}-CONFIDENTIAL`;
  const csv = `Line tag,Service,NPS\n${marker}\u0000,${marker},4\n`;
  const before = readFileSync(log, 'utf8').length;
  await page
    .getByLabel(/Line-list file/)
    .setInputFiles({ name: 'nul.csv', mimeType: 'text/csv', buffer: Buffer.from(csv, 'utf8') });
  await page.getByRole('button', { name: 'Read file' }).click();
  // Whatever the reader makes of the file, the answer is a sentence and nothing is half-written.
  await expect(
    page
      .locator('p[role="alert"]')
      .or(page.getByRole('button', { name: 'Check the rows' }))
      .first(),
  ).toBeVisible();
  const added = readFileSync(log, 'utf8').slice(before);
  expect(added).not.toContain(marker);
  expect(added).not.toMatch(/params:/);
});
