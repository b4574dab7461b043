import { expect, test, waitForHydration, type Page } from './fixtures';
import { demo, openDemoProject, signIn } from './helpers';

/** The server action that keeps the view answers a POST to the line list's own URL. */
const viewSaved = (page: Page) =>
  page.waitForResponse((r) => r.request().method() === 'POST' && /\/lines$/.test(new URL(r.url()).pathname));

test('the line table arrives with its first rows in the server-rendered page', async ({ page }) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const id = await openDemoProject(page);
  // The HTML itself, before any script: 100 rows in tag order, the first one's tag in its cell.
  const html = await (await page.request.get(`/projects/${id}/lines`)).text();
  const rows = html.match(/<tr [^>]*data-row-id="/g) ?? [];
  expect(rows.length).toBe(100);
  await page.goto(`/projects/${id}/lines`);
  const firstId = await page.locator('tr[data-tag]').first().getAttribute('data-row-id');
  expect(html.includes(`data-row-id="${firstId}"`), 'the first row of the live table is in the HTML').toBe(
    true,
  );
});

test('hidden columns and density are kept per user on the server: they survive a reload and another browser, and another user still sees the column', async ({
  page,
  browser,
}) => {
  test.setTimeout(300_000); // three sign-ins and five loads of a 100-row page on a loaded 2-core machine
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const id = await openDemoProject(page);
  const lines = `/projects/${id}/lines`;
  await page.goto(lines);
  const serviceHead = page.locator('th[data-col="service"]');
  await expect(serviceHead).toHaveCount(1);

  // Key columns have no switch; the others do.
  await page.getByText('Columns', { exact: true }).click();
  const menu = page.getByRole('group', { name: 'Columns shown in the line table' });
  for (const key of ['Tag', 'Status', 'Chosen thickness'])
    await expect(menu.getByRole('checkbox', { name: key, exact: true })).toHaveCount(0);
  const service = menu.getByRole('checkbox', { name: 'Service', exact: true });
  await expect(service).toBeChecked();

  let saved = viewSaved(page);
  await service.uncheck();
  await saved;
  await expect(serviceHead).toHaveCount(0);
  await expect(page.locator('tr[data-tag] td[data-col="service"]')).toHaveCount(0);
  await expect(page.getByText('Columns (1 hidden)')).toBeVisible();

  saved = viewSaved(page);
  await page.getByLabel('Row density').selectOption('comfortable');
  await saved;
  await expect(page.locator('table[aria-label="Line table"]')).not.toHaveClass(/line-grid-compact/);

  // A reload: still hidden, still comfortable — and already so in the server's HTML (no flash of the column).
  await page.reload();
  await expect(page.locator('tr[data-tag]').first()).toBeVisible();
  await expect(serviceHead).toHaveCount(0);
  await expect(page.locator('th[data-col="area"]')).toHaveCount(1);
  await expect(page.getByLabel('Row density')).toHaveValue('comfortable');
  const html = await (await page.request.get(lines)).text();
  expect(html.includes('data-col="service"'), 'no service column in the HTML').toBe(false);
  expect(html.includes('data-col="area"'), 'the area column in the HTML').toBe(true);

  // The same person in another browser (a fresh context: no cookies, no local storage): the same view.
  const elsewhere = await browser.newContext();
  const p2 = waitForHydration(await elsewhere.newPage());
  await signIn(p2, u.email, u.password);
  await p2.goto(lines);
  await expect(p2.locator('tr[data-tag]').first()).toBeVisible();
  await expect(p2.locator('th[data-col="service"]')).toHaveCount(0);
  await expect(p2.getByLabel('Row density')).toHaveValue('comfortable');
  await elsewhere.close();

  // Another user keeps their own view: the column is there for the owner.
  const owner = demo('owner');
  const other = await browser.newContext();
  const p3 = waitForHydration(await other.newPage());
  await signIn(p3, owner.email, owner.password);
  await p3.goto(lines);
  await expect(p3.locator('tr[data-tag]').first()).toBeVisible();
  await expect(p3.locator('th[data-col="service"]')).toHaveCount(1);
  await expect(p3.locator('tr[data-tag] td[data-col="service"]').first()).toBeVisible();
  await expect(p3.getByLabel('Row density')).toHaveValue('compact');
  await other.close();

  // Back as it was, so the other specs see the default view.
  await page.getByText('Columns (1 hidden)').click();
  saved = viewSaved(page);
  await page
    .getByRole('group', { name: 'Columns shown in the line table' })
    .getByRole('checkbox', { name: 'Service', exact: true })
    .check();
  await saved;
  saved = viewSaved(page);
  await page.getByLabel('Row density').selectOption('compact');
  await saved;
  await expect(serviceHead).toHaveCount(1);
});
