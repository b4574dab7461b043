import { expect, test, type Request } from './fixtures';
import { demo, openDemoProject, signIn } from './helpers';

/**
 * Comments on a line: an engineer comments, the reviewer replies in the thread, each with author and
 * time; a contractor sees neither the comments nor a form, and the engineer's captured request
 * replayed with the contractor's session is refused on the server and stores nothing.
 */
test('an engineer comments on a line, the reviewer replies; a contractor cannot post', async ({
  page,
  browser,
  baseURL,
}) => {
  const stamp = Date.now().toString(36);
  const question = `Is the retarder lap at the shoe enough? <b>${stamp}</b>`;
  const reply = `Yes: 50 mm lap, sealed with mastic (${stamp}).`;

  const e = demo('engineer');
  await signIn(page, e.email, e.password);
  await openDemoProject(page);
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  const first = page.getByRole('table').locator('tbody a.font-mono').first();
  const tag = (await first.innerText()).trim();
  await first.click();
  await expect(page.getByRole('heading', { level: 1, name: tag })).toBeVisible();
  const lineUrl = page.url();

  // A request the engineer's browser sends, kept (not let through) to replay as the contractor later.
  let captured: Request | null = null;
  await page.route(lineUrl, async (route) => {
    const r = route.request();
    if (r.method() === 'POST' && r.headers()['next-action'] && !captured) {
      captured = r;
      await route.abort();
    } else await route.continue();
  });
  const form = page.getByRole('region', { name: 'Comments' });
  await form.getByLabel('New comment').fill(`Replayed ${stamp}`);
  await form.getByRole('button', { name: 'Post comment' }).click();
  await expect.poll(() => captured !== null).toBe(true);
  await page.unroute(lineUrl);
  await page.reload();

  // Too long: a sentence, nothing posted.
  const comments = page.getByRole('region', { name: 'Comments' });
  await comments.getByLabel('New comment').fill('x'.repeat(2001));
  await comments.getByRole('button', { name: 'Post comment' }).click();
  await expect(comments.getByRole('alert')).toHaveText(
    'A comment can be at most 2,000 characters; this one has 2,001. Shorten it or split it into two.',
  );
  await comments.getByLabel('New comment').fill(question);
  await comments.getByRole('button', { name: 'Post comment' }).click();
  const mine = comments.getByRole('article', { name: `Comment by ${e.name}` }).filter({ hasText: stamp });
  // Markup is shown as the characters typed.
  await expect(mine).toContainText(question);
  await expect(mine.locator('b')).toHaveCount(0);
  await expect(mine.locator('time')).toHaveText(/^\d{4}-\d\d-\d\d \d\d:\d\d UTC$/);

  const r = demo('reviewer');
  const rctx = await browser.newContext({ baseURL });
  const rp = await rctx.newPage();
  await signIn(rp, r.email, r.password);
  await rp.goto(lineUrl);
  const thread = rp
    .getByRole('region', { name: 'Comments' })
    .getByRole('listitem')
    .filter({ has: rp.getByRole('article', { name: `Comment by ${e.name}` }).filter({ hasText: stamp }) })
    .first();
  await thread.getByRole('button', { name: `Reply to ${e.name}` }).click();
  await thread.getByLabel(`Reply to ${e.name}`).fill(reply);
  await thread.getByRole('button', { name: 'Post reply' }).click();
  await expect(
    thread
      .getByRole('list', { name: `Replies to ${e.name}` })
      .getByRole('article', { name: `Comment by ${r.name}` }),
  ).toContainText(reply);
  await rctx.close();

  // The engineer sees the reply in the thread after a reload.
  await page.reload();
  await expect(
    page
      .getByRole('region', { name: 'Comments' })
      .getByRole('list', { name: `Replies to ${e.name}` })
      .getByRole('article', { name: `Comment by ${r.name}` })
      .filter({ hasText: reply }),
  ).toBeVisible();

  // The contractor: no comments, no form; the replayed request is refused and stores nothing.
  const c = demo('contractor');
  const cctx = await browser.newContext({ baseURL });
  const cp = await cctx.newPage();
  await signIn(cp, c.email, c.password);
  await cp.goto(lineUrl);
  await expect(cp.getByRole('region', { name: 'Comments' })).toHaveCount(0);
  await expect(cp.getByLabel('New comment')).toHaveCount(0);
  const req = captured as unknown as Request;
  const h = req.headers();
  const res = await cp.request.post(req.url(), {
    headers: {
      'content-type': h['content-type'],
      'next-action': h['next-action'],
      'next-router-state-tree': h['next-router-state-tree'] ?? '',
      accept: 'text/x-component',
      origin: new URL(req.url()).origin,
    },
    data: req.postDataBuffer()!,
  });
  expect(await res.text()).toContain('Your role in this organization does not allow that.');
  await cctx.close();
  await page.reload();
  await expect(page.getByRole('region', { name: 'Comments' })).not.toContainText(`Replayed ${stamp}`);
});
