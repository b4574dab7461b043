/**
 * The end-to-end `test`: every page's `goto` and `reload` also wait until React has hydrated an
 * HTML page (`html[data-hydrated]`, set by components/hydration-mark.tsx), so a loaded machine never
 * has a test type into a form whose handlers are not attached yet.
 */
import { test as base, type Page, type Response } from '@playwright/test';

export * from '@playwright/test';

async function hydrated(page: Page, r: Response | null) {
  const html = (r?.headers()['content-type'] ?? '').includes('text/html');
  if (html) await page.locator('html[data-hydrated]').waitFor({ state: 'attached' });
  return r;
}

export function waitForHydration(page: Page): Page {
  const goto = page.goto.bind(page);
  const reload = page.reload.bind(page);
  page.goto = async (url, o) => hydrated(page, await goto(url, o));
  page.reload = async (o) => hydrated(page, await reload(o));
  return page;
}

export const test = base.extend({
  page: async ({ page }, use) => {
    await use(waitForHydration(page));
  },
});
