import { expect, test } from '@playwright/test';
import { demo, signIn } from './helpers';

// Bare 60.3 mm (NPS 2) pipe at 100 °C in 20 °C still air, ε 0.9: about 230 W/m
// (Roymech bare-pipe heat-loss table [recalled]; ours within 5 %, as in calc-api.spec.ts).
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

test('an engineer makes a token that is shown once, a script uses it, and revoking it stops it', async ({
  page,
  playwright,
  baseURL,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  await page.getByRole('link', { name: 'Account' }).click();
  await page.getByRole('link', { name: 'Manage API tokens' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'API tokens' })).toBeVisible();

  const korvane = page.getByRole('region', { name: 'Tokens in Korvane Polymers' });
  const form = korvane.getByRole('form', { name: 'Make an API token' });
  await form.getByRole('button', { name: 'Make token' }).click();
  await expect(korvane.getByRole('alert')).toHaveText('Give the token a name.');

  const name = `e2e script ${Date.now()}`;
  await form.getByLabel('Token name').fill(name);
  await form.getByRole('checkbox', { name: /^recommend/ }).check();
  await form.getByLabel('Expires after').selectOption('30');
  await form.getByRole('button', { name: 'Make token' }).click();
  await expect(korvane.getByRole('status')).toContainText(
    `Token “${name}” made. Copy it now: it is shown only this once.`,
  );
  const token = await page.getByLabel('New API token').inputValue();
  expect(token).toMatch(/^lgw_[A-Za-z0-9_-]{43}$/);
  const row = page.getByTestId('token-row').filter({ hasText: name });
  await expect(row).toContainText('calc, recommend');
  await expect(row).toContainText(token.slice(0, 10));
  await expect(row).toContainText('Active');

  // Shown once: after a reload the page holds the prefix only, never the token.
  await page.reload();
  await expect(page.getByLabel('New API token')).toHaveCount(0);
  expect(await page.content()).not.toContain(token);

  // A script without any browser session.
  const script = await playwright.request.newContext({ baseURL });
  const res = await script.post('/api/v1/calc', {
    data: [good, { id: 'bad', geometry: 'horizontal-pipe' }],
    headers: { authorization: `Bearer ${token}` },
  });
  expect(res.status()).toBe(200);
  const [a, b] = await res.json();
  expect(Math.abs(a.heatLossWPerM - 230) / 230).toBeLessThan(0.05);
  expect(b.id).toBe('bad');
  expect(b.error).toContain('processTempC');
  await page.reload();
  await expect(page.getByTestId('token-row').filter({ hasText: name })).not.toContainText('—');
  await page.getByText('Recent token activity').click();
  await expect(page.getByText(`${name} · used · POST /api/v1/calc → 200`)).toBeVisible();

  await page.getByRole('button', { name: `Revoke ${name}` }).click();
  await expect(page.getByTestId('token-row').filter({ hasText: name })).toContainText('Revoked');
  const after = await script.post('/api/v1/calc', {
    data: [good],
    headers: { authorization: `Bearer ${token}` },
  });
  expect(after.status()).toBe(401);
  expect((await after.json()).error.message).toMatch(
    new RegExp(`^This API token \\("${name}"\\) was revoked on `),
  );
  await script.dispose();
});

test('a contractor cannot make tokens: no form, and a captured "make token" action replayed with the contractor\'s session is refused', async ({
  page,
  browser,
  baseURL,
}) => {
  // The engineer's own browser sends the action; it is captured and not let through.
  const eng = await browser.newContext({ baseURL });
  const ep = await eng.newPage();
  await signIn(ep, demo('engineer').email, demo('engineer').password);
  await ep.goto('/account/tokens');
  const form = ep.getByRole('form', { name: 'Make an API token' });
  await form.getByLabel('Token name').fill('replayed token');
  let captured: { url: string; body: Buffer; headers: Record<string, string> } | null = null;
  await ep.route('**/account/tokens', async (route) => {
    const r = route.request();
    if (r.method() === 'POST' && r.headers()['next-action']) {
      const h = r.headers();
      captured = {
        url: r.url(),
        body: r.postDataBuffer()!,
        headers: {
          'content-type': h['content-type'],
          'next-action': h['next-action'],
          'next-router-state-tree': h['next-router-state-tree'] ?? '',
          accept: 'text/x-component',
          origin: new URL(r.url()).origin,
        },
      };
      await route.abort();
    } else await route.continue();
  });
  await form.getByRole('button', { name: 'Make token' }).click();
  await expect.poll(() => captured !== null).toBe(true);
  await eng.close();

  const u = demo('contractor');
  await signIn(page, u.email, u.password);
  const req = captured as unknown as { url: string; body: Buffer; headers: Record<string, string> };
  const res = await page.request.post(req.url, { headers: req.headers, data: req.body });
  const text = await res.text();
  expect(text).toContain('Your role in this organization does not allow that.');
  expect(text).not.toContain('lgw_');

  await page.goto('/account/tokens');
  await expect(page.getByRole('heading', { level: 1, name: 'API tokens' })).toBeVisible();
  await expect(page.getByRole('note')).toContainText(
    'does not allow making API tokens; owners and engineers can make them.',
  );
  await expect(page.getByRole('form', { name: 'Make an API token' })).toHaveCount(0);
  await expect(page.getByTestId('token-row')).toHaveCount(0);
});
