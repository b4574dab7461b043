import { expect, test, type Page, type Request } from './fixtures';
import { createProjectWithLines, demo, lineRow, mailboxLink, signIn } from './helpers';

/**
 * A server action is an endpoint anyone can POST to once they know its id and body. Capture the
 * request the engineer's own browser sends (without letting it through), then replay the very same
 * bytes with other sessions: the server's session and role checks must refuse them, and nothing may
 * change. The engineer's replay is the control that shows the replayed request is a working one.
 */
async function captureAddJacket(page: Page, projectId: string, name: string) {
  await page.goto(`/projects/${projectId}/design-basis`);
  const form = page.getByRole('form', { name: 'Add a project jacket' });
  await form.getByLabel('Name', { exact: true }).fill(name);
  await form.getByLabel('Emittance (0–1)').fill('0.35');
  await form.getByLabel('Source of the emittance').fill('Replay test');
  let captured: Request | null = null;
  await page.route(`**/projects/${projectId}/design-basis`, async (route) => {
    const r = route.request();
    if (r.method() === 'POST' && r.headers()['next-action']) {
      captured = r;
      await route.abort();
    } else await route.continue();
  });
  await form.getByRole('button', { name: 'Add jacket' }).click();
  await expect.poll(() => captured !== null).toBe(true);
  await page.unroute(`**/projects/${projectId}/design-basis`);
  const r = captured as unknown as Request;
  const h = r.headers();
  return {
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
}

async function jacketNames(page: Page, projectId: string) {
  await page.goto(`/projects/${projectId}/design-basis`);
  return page
    .getByRole('table', { name: 'Project jackets' })
    .locator('tbody tr td:first-child')
    .allTextContents();
}

test('a captured "add jacket" action replayed by a contractor, a reviewer and an anonymous caller is refused and changes nothing', async ({
  page,
  browser,
  baseURL,
}) => {
  await signIn(page, demo('engineer').email, demo('engineer').password);
  await page.getByLabel('Code').fill(`E2E-F${Date.now().toString().slice(-6)}`);
  await page.getByLabel('Name').fill('E2E forged actions');
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'E2E forged actions' })).toBeVisible();
  const projectId = page.url().split('/projects/')[1];

  const req = await captureAddJacket(page, projectId, 'Replayed cladding');
  expect(await jacketNames(page, projectId)).not.toContain('Replayed cladding');

  for (const key of ['contractor', 'reviewer'] as const) {
    const ctx = await browser.newContext({ baseURL });
    const p = await ctx.newPage();
    await signIn(p, demo(key).email, demo(key).password);
    const res = await p.request.post(req.url, { headers: req.headers, data: req.body });
    const text = await res.text();
    expect(text).toContain('Your role in this organization does not allow that.');
    expect(text).not.toContain('Jacket added');
    await ctx.close();
  }
  const anon = await browser.newContext({ baseURL });
  const anonRes = await anon.request.post(req.url, { headers: req.headers, data: req.body, maxRedirects: 0 });
  expect(await anonRes.text()).not.toContain('Jacket added');
  await anon.close();
  expect(await jacketNames(page, projectId)).not.toContain('Replayed cladding');

  // Control: the same bytes from the engineer's own session do add the jacket.
  const ok = await page.request.post(req.url, { headers: req.headers, data: req.body });
  expect(ok.status()).toBe(200);
  expect(await jacketNames(page, projectId)).toContain('Replayed cladding');
});

test('a captured "send domain proof" action replayed by an engineer is refused; the owner\'s proof link, confirmed, makes the domain count', async ({
  page,
  browser,
  baseURL,
}) => {
  const domain = `labs-${Date.now().toString().slice(-6)}.korvane.example`;
  await signIn(page, demo('owner').email, demo('owner').password);
  await page.getByRole('link', { name: 'Members' }).first().click();
  await page.getByRole('link', { name: 'Company sign-in settings' }).click();
  await expect(page).toHaveURL(/\/orgs\/[0-9a-f-]+\/company-sign-in$/);
  const settingsUrl = page.url();
  const settingsGlob = '**/orgs/*/company-sign-in';
  await page.getByLabel('Allowed e-mail domains').fill(`korvane.example, ${domain}`);
  await page.getByRole('button', { name: 'Save company sign-in' }).click();
  await expect(page.getByTestId(`domain-${domain}`)).toContainText('not proven yet');

  let captured: Request | null = null;
  await page.route(settingsGlob, async (route) => {
    const r = route.request();
    if (r.method() === 'POST' && r.headers()['next-action']) {
      captured = r;
      await route.abort();
    } else await route.continue();
  });
  await page.getByTestId(`domain-${domain}`).getByLabel(`Mailbox at ${domain}`).selectOption('hostmaster');
  await page.getByRole('button', { name: `Send proof link for ${domain}` }).click();
  await expect.poll(() => captured !== null).toBe(true);
  await page.unroute(settingsGlob);
  const r = captured as unknown as Request;
  const h = r.headers();
  const headers = {
    'content-type': h['content-type'],
    'next-action': h['next-action'],
    'next-router-state-tree': h['next-router-state-tree'] ?? '',
    accept: 'text/x-component',
    origin: new URL(r.url()).origin,
  };

  const ctx = await browser.newContext({ baseURL });
  const p = await ctx.newPage();
  await signIn(p, demo('engineer').email, demo('engineer').password);
  const res = await p.request.post(r.url(), { headers, data: r.postDataBuffer()! });
  expect(await res.text()).toContain('Your role in this organization does not allow that.');
  await ctx.close();
  const mails = await (
    await page.request.get(
      `http://127.0.0.1:${process.env.MAIL_SINK_HTTP_PORT ?? 2536}/messages?to=${encodeURIComponent(`hostmaster@${domain}`)}`,
    )
  ).json();
  expect(mails).toHaveLength(0);

  // Control: the owner's own request sends the link; whoever reads hostmaster@ confirms it.
  const ok = await page.request.post(r.url(), { headers, data: r.postDataBuffer()! });
  expect(ok.status()).toBe(200);
  await page.goto(await mailboxLink(page, `hostmaster@${domain}`, 'Confirm the domain'));
  await page.getByRole('button', { name: `Confirm ${domain} for Korvane Polymers` }).click();
  await expect(page.getByRole('status')).toHaveText(`${domain} is confirmed for Korvane Polymers.`);
  await page.goto(settingsUrl);
  await expect(page.getByTestId(`domain-${domain}`)).toContainText(
    `${domain} · proven (hostmaster@${domain})`,
  );
  await page.getByLabel('Allowed e-mail domains').fill('korvane.example');
  await page.getByRole('button', { name: 'Save company sign-in' }).click();
  await expect(page.getByTestId(`domain-${domain}`)).toHaveCount(0);
});

test('a captured bulk accept replayed by a reviewer and a contractor is refused and changes nothing', async ({
  page,
  browser,
  baseURL,
}) => {
  test.slow(); // a project with an import, then three sessions
  await signIn(page, demo('engineer').email, demo('engineer').password);
  const projectId = await createProjectWithLines(page, 'E2E forged bulk accept', [
    lineRow('F-1', '4', 180, 'H,P'),
    lineRow('F-2', '2', 120, 'H,P'),
  ]);
  const undecided = async () =>
    (await (await page.request.get(`/api/v1/projects/${projectId}/lines?status=undecided`)).json())
      .total as number;
  await expect(page.locator('tr[data-tag="F-2"]')).toBeVisible();
  await page.getByRole('button', { name: 'Accept recommendation for the filtered lines' }).click();
  const dialog = page.getByRole('dialog', { name: 'Accept the recommendation for the filtered lines?' });
  await expect(dialog.locator('#bulk-accept-counts')).toHaveText(
    'This changes 2 lines and leaves 0 lines alone.',
  );
  // Capture the confirmation's request (the preview has been answered already) without letting it through.
  let captured: Request | null = null;
  await page.route(`**/projects/${projectId}/lines`, async (route) => {
    const r = route.request();
    if (r.method() === 'POST' && r.headers()['next-action']) {
      captured = r;
      await route.abort();
    } else await route.continue();
  });
  await dialog.getByRole('button', { name: 'Accept for 2 lines' }).click();
  await expect.poll(() => captured !== null).toBe(true);
  await page.unroute(`**/projects/${projectId}/lines`);
  const r = captured as unknown as Request;
  const h = r.headers();
  const req = {
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
  expect(await undecided()).toBe(2);

  for (const key of ['contractor', 'reviewer'] as const) {
    const ctx = await browser.newContext({ baseURL });
    const p = await ctx.newPage();
    await signIn(p, demo(key).email, demo(key).password);
    const res = await p.request.post(req.url, { headers: req.headers, data: req.body });
    expect(await res.text()).toContain('Your role in this organization does not allow that.');
    await ctx.close();
  }
  expect(await undecided()).toBe(2);

  // Control: the same bytes from the engineer's own session accept both lines.
  const ok = await page.request.post(req.url, { headers: req.headers, data: req.body });
  expect(ok.status()).toBe(200);
  expect(await ok.text()).toContain('"accepted":2');
  expect(await undecided()).toBe(0);
});
