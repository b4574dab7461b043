import { expect, test, type Page } from './fixtures';
import { AxeBuilder } from '@axe-core/playwright';
import { demo, openDemoProject, signIn, type DemoKey } from './helpers';

const WCAG = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

/** axe-core over the page as it stands: no serious or critical violation (each listed with its elements when one is found). */
async function expectNoSeriousViolations(page: Page, what: string) {
  const r = await new AxeBuilder({ page }).withTags(WCAG).analyze();
  const bad = r.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id} (${v.impact}): ${v.nodes.map((n) => n.target.join(' ')).join(' | ')}`);
  expect(bad, `${what}: ${bad.join('\n')}`).toEqual([]);
}

test('sign-in has no serious or critical WCAG 2.1 A/AA violation', async ({ page }) => {
  await page.goto('/sign-in');
  await expect(page.getByRole('button', { name: 'Sign in' })).toBeVisible();
  await expectNoSeriousViolations(page, 'sign-in');
  await expect(page).toHaveTitle('Sign in · Lagwise');
});

const ROLES: DemoKey[] = ['owner', 'engineer', 'reviewer', 'contractor'];
for (const role of ROLES) {
  test(`as the ${role}: projects, line list, a line, design basis, review queue and round, budget, bill and design report pass axe, each with its own title`, async ({
    page,
  }) => {
    test.setTimeout(600_000); // ten pages, each through axe, on a loaded 2-core machine
    const u = demo(role);
    await signIn(page, u.email, u.password);
    await expectNoSeriousViolations(page, `${role} projects`);
    const id = await openDemoProject(page);
    const base = `/projects/${id}`;
    const titles = new Set<string>();
    const visit = async (path: string, name: string) => {
      await page.goto(base + path);
      await expect(page.locator('h1').first()).toBeVisible();
      if (path === '/lines' && role !== 'contractor')
        await expect(page.locator('tr[data-tag]').first()).toBeVisible();
      await expectNoSeriousViolations(page, `${role} ${name}`);
      const t = await page.title();
      expect(titles.has(t), `${name}: title "${t}" used by another page`).toBe(false);
      titles.add(t);
      return t;
    };
    await visit('', 'overview');
    await visit('/lines', 'line list');
    if (role !== 'contractor') {
      // The first line's own page: its tag in the title.
      const first = page.locator('tr[data-tag]').first();
      const tag = (await first.getAttribute('data-tag'))!;
      const href = (await first.locator('a').first().getAttribute('href'))!;
      const t = await visit(href.slice(base.length), 'line page');
      expect(t).toBe(`${tag} · Line · BP-STM-24 · Lagwise`);
    }
    await visit('/design-basis', 'design basis');
    await visit('/review', 'review queue');
    if (role !== 'contractor') {
      // The open round's own page: its number in the title.
      const round = page.locator('main a[href*="/review/"]').first();
      const href = (await round.getAttribute('href'))!;
      const t = await visit(href.slice(base.length), 'review round');
      expect(t).toMatch(/^Round \d+ · Review round · BP-STM-24 · Lagwise$/);
    }
    await visit('/budget', 'budget');
    await visit('/boq', 'bill of quantities');
    await visit('/report', 'design report');
    // The contractor reads the bill only: the other pages answer with their section's name alone.
    expect(titles).toContain(
      role === 'contractor' ? 'Line list · Lagwise' : 'Line list · BP-STM-24 · Lagwise',
    );
    expect(titles).toContain('Bill of quantities · BP-STM-24 · Lagwise');
    expect(titles).toContain('Design report · BP-STM-24 · Lagwise');
  });
}

test('line table: one Tab stop, arrow keys, Enter into the picker, Next page within a few Tab presses, paging announced', async ({
  page,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  await openDemoProject(page);
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  const tags = page.locator('tr[data-tag] td[data-col="tag"] a');
  await expect(tags.nth(1)).toBeVisible();
  // Roving tab stop: once the table is live, exactly one element of the body is in the Tab order.
  await expect(tags.nth(0)).toHaveAttribute('tabindex', '0');
  await expect(tags.nth(1)).toHaveAttribute('tabindex', '-1');
  await expect(page.locator('#line-table tbody [tabindex="0"]')).toHaveCount(1);

  // From the search field to "Next": the filters, the table's actions (solve, accept, export,
  // calculation sheets), the sortable headers, the table as one stop, Next — never one stop per row.
  await page.getByLabel('Search tag or service').focus();
  const next = page.getByRole('button', { name: 'Next' });
  let presses = 0;
  while (presses < 40 && !(await next.evaluate((b) => b === document.activeElement))) {
    await page.keyboard.press('Tab');
    presses++;
  }
  expect(presses).toBeLessThanOrEqual(20);

  // Arrow keys between rows and cells; Enter enters the picker, Escape leaves it.
  await tags.nth(0).focus();
  await page.keyboard.press('ArrowDown');
  await expect(tags.nth(1)).toBeFocused();
  const secondRow = page.locator('tr[data-tag]').nth(1);
  const second = (await secondRow.getAttribute('data-tag'))!;
  await page.keyboard.press('End');
  const pickCell = secondRow.locator('td[data-col="pick"]');
  await expect(pickCell).toBeFocused();
  await page.keyboard.press('Enter');
  await expect(page.getByLabel(`Thickness for ${second}`)).toBeFocused();
  await page.keyboard.press('Escape');
  await expect(pickCell).toBeFocused();
  await page.keyboard.press('Home');
  await expect(tags.nth(1)).toBeFocused();

  // The header stays on top of the table's own scroll box.
  const box = page.locator('#line-table');
  await box.evaluate((b) => {
    b.scrollTop = 400;
  });
  const boxTop = (await box.boundingBox())!.y;
  const headTop = (await page.getByRole('columnheader', { name: /^Tag/ }).boundingBox())!.y;
  expect(Math.abs(headTop - boxTop)).toBeLessThan(2);

  // Paging from the keyboard: announced, the box back at its top, the focus still on the pager.
  const total = Number((await page.getByText(/^\d+ lines$/).innerText()).replace(/\D/g, ''));
  if (total > 100) {
    const firstTag = await tags.nth(0).innerText();
    await next.focus();
    await page.keyboard.press('Enter');
    await expect(page.getByTestId('line-table-announce')).toHaveText(
      `Page 2 of ${Math.ceil(total / 100)}: lines 101 to ${Math.min(200, total)} of ${total}.`,
    );
    await expect(tags.nth(0)).not.toHaveText(firstTag);
    expect(await box.evaluate((b) => b.scrollTop)).toBe(0);
    await expect(
      page.getByRole('button', { name: /^(Next|Previous)$/ }).and(page.locator(':focus')),
    ).toHaveCount(1);
  }
});

test('units as written: headers keep their case, numbers right-aligned under right-aligned headers, one unit per column', async ({
  page,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  await openDemoProject(page);
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  await expect(page.locator('tr[data-tag]').first()).toBeVisible();
  // innerText applies text-transform: "mm" would read "MM" under an uppercase header style.
  await expect(page.locator('th[data-col="heatLossLinear"]')).toHaveText('Heat loss W/m');
  expect(await page.locator('th[data-col="heatLossLinear"]').innerText()).toBe('Heat loss W/m');
  expect(await page.locator('th[data-col="heatLossAreal"]').innerText()).toBe('Heat loss W/m²');
  expect(
    await page
      .getByLabel('Search tag or service')
      .evaluate((i) => (i as HTMLInputElement).labels?.[0]?.innerText),
  ).toBe('Search tag or service');
  for (const col of ['normalTempC', 'recommendedMm', 'surfaceTempC', 'heatLossLinear']) {
    expect(await page.locator(`th[data-col="${col}"]`).evaluate((e) => getComputedStyle(e).textAlign)).toBe(
      'right',
    );
    expect(
      await page
        .locator(`tr[data-tag] td[data-col="${col}"]`)
        .first()
        .evaluate((e) => getComputedStyle(e).textAlign),
    ).toBe('right');
  }
  // A pipe's heat loss is a bare number under its per-length header.
  const pipeLoss = page.locator('tr[data-tag] td[data-col="heatLossLinear"]').first();
  await expect(pipeLoss).toHaveText(/^\d+(\.\d+)?$/);
  // The picker names the recommended option in words and gives heat loss with its unit.
  const row = page.locator('tr[data-tag]').first();
  const tag = (await row.getAttribute('data-tag'))!;
  const select = page.getByLabel(`Thickness for ${tag}`);
  await select.focus();
  await expect(select.locator('option[value="0"]')).toBeAttached();
  const rec = select.locator('option', { hasText: 'recommended' });
  await expect(rec).toHaveCount(1);
  await expect(rec).toHaveText(/ ★ recommended · heat loss [\d.]+ W\/m \(surface -?\d+\.\d °C\)/);
});

test('shell: a menu instead of the sidebar at 768 px with tag, status and picker in view; reflow at 320 px; the line page at 1280', async ({
  page,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const id = await openDemoProject(page);
  const noSideways = () => page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth);

  await page.setViewportSize({ width: 768, height: 1024 });
  await page.goto(`/projects/${id}/lines`);
  const row = page.locator('tr[data-tag]').first();
  await expect(row).toBeVisible();
  await expect(page.getByRole('navigation', { name: 'Project' })).toBeHidden();
  await page.getByText('Menu', { exact: true }).click();
  await expect(
    page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }),
  ).toBeVisible();
  expect(await noSideways()).toBe(true);
  for (const [what, cell] of [
    ['tag', row.locator('td[data-col="tag"]')],
    ['status', row.locator('td[data-col="status"]')],
    ['picker', row.locator('td[data-col="pick"] select')],
  ] as const) {
    const b = (await cell.boundingBox())!;
    expect(b.x + b.width, `${what} within 768 px`).toBeLessThanOrEqual(768);
  }

  await page.setViewportSize({ width: 320, height: 640 });
  await page.reload();
  await expect(page.locator('tr[data-tag]').first()).toBeVisible();
  expect(await noSideways()).toBe(true);
  // Every other main page at 320 and 768 px: tests/e2e/responsive.spec.ts.

  await page.setViewportSize({ width: 1280, height: 800 });
  await page.goto(`/projects/${id}/lines`);
  const href = (await page.locator('tr[data-tag] a').first().getAttribute('href'))!;
  await page.goto(href);
  await expect(page.getByRole('heading', { name: 'Record' })).toBeVisible();
  expect(await noSideways()).toBe(true);
});
