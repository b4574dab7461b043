/**
 * Line table, measured in Chromium as the demo engineer (run by bench/table-visible.config.ts):
 * - warm time to a visible table: navigation start → the first frame in which the first row is laid out
 *   (a requestAnimationFrame probe installed before the page's own scripts), median of 5 loads after one
 *   warm-up, with the machine's load average;
 * - rows wholly visible at 1440×900 in compact density (below the sticky header, inside the table's box);
 * - Tab presses from the search field to "Next";
 * - bytes per 100 rows: the JSON the table fetches when it pages, and the line-list HTML document that
 *   carries the first 100 rows (rendered rows plus their data for hydration), raw and gzipped.
 * Prints one JSON object. Figures, not assertions: the spec suite holds the limits.
 */
import { gzipSync } from 'node:zlib';
import { loadavg } from 'node:os';
import { test } from '@playwright/test';
import { DEMO_USERS } from '../seed/demo-data';

const engineer = DEMO_USERS.find((u) => u.key === 'engineer')!;
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const kb = (n: number) => Math.round(n / 102.4) / 10;

test('line table figures', async ({ page }) => {
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.goto('/sign-in');
  await page.locator('html[data-hydrated]').waitFor({ state: 'attached' });
  await page.getByLabel('E-mail', { exact: true }).fill(engineer.email);
  await page.getByLabel('Password', { exact: true }).fill(engineer.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/projects$/);
  const project = (await page
    .getByRole('link', { name: 'Brack Point steam network upgrade' })
    .getAttribute('href'))!;
  const lines = `${project}/lines`;

  // The first frame with the first row laid out, in ms since navigation start (performance.now()).
  await page.addInitScript(() => {
    const w = window as unknown as { __firstRowMs?: number };
    const probe = () => {
      const r = document.querySelector('tr[data-tag]');
      if (r && r.getBoundingClientRect().height > 0) w.__firstRowMs = performance.now();
      else requestAnimationFrame(probe);
    };
    requestAnimationFrame(probe);
  });
  const load = async () => {
    await page.goto(lines);
    await page.locator('tr[data-tag]').first().waitFor();
    await page.waitForFunction(() => (window as unknown as { __firstRowMs?: number }).__firstRowMs);
    return page.evaluate(() => ({
      firstRowMs: Math.round((window as unknown as { __firstRowMs: number }).__firstRowMs),
      fcpMs: Math.round(performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? -1),
      responseEndMs: Math.round(
        (performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming).responseEnd,
      ),
    }));
  };
  await load(); // warm-up: server caches and the browser's cache of the scripts
  const runs = [];
  const loadBefore = loadavg();
  for (let i = 0; i < 5; i++) runs.push(await load());
  const loadAfter = loadavg();

  // Rows wholly visible (compact is the default view).
  await page.locator('html[data-hydrated]').waitFor({ state: 'attached' });
  await page.waitForTimeout(300); // fonts and layout settle; a measurement, not a test
  const density = await page.getByLabel('Row density').inputValue();
  const rowsVisible = await page.evaluate(() => {
    const head = document.querySelector('table[aria-label="Line table"] thead');
    const headBottom = head ? head.getBoundingClientRect().bottom : 0;
    let n = 0;
    for (const r of document.querySelectorAll('tr[data-tag]')) {
      const b = r.getBoundingClientRect();
      if (b.top < Math.max(0, headBottom) - 0.5 || b.bottom > innerHeight + 0.5) continue;
      let inside = true;
      for (let p = r.parentElement; p && p !== document.body; p = p.parentElement) {
        if (/(auto|scroll|hidden)/.test(getComputedStyle(p).overflowY)) {
          const pb = p.getBoundingClientRect();
          if (b.top < pb.top - 0.5 || b.bottom > pb.bottom + 0.5) inside = false;
        }
      }
      if (inside) n++;
    }
    return n;
  });

  // Tab presses from the search field to "Next".
  await page.getByLabel('Search tag or service').focus();
  const next = page.getByRole('button', { name: 'Next' });
  let tabs = 0;
  while (tabs < 300 && !(await next.evaluate((b) => b === document.activeElement))) {
    await page.keyboard.press('Tab');
    tabs++;
  }

  // Bytes per 100 rows.
  const id = project.split('/projects/')[1];
  const json = await (
    await page.request.get(`/api/v1/projects/${id}/lines?page=1&size=100&sort=tag&dir=asc`)
  ).body();
  const html = await (await page.request.get(lines)).body();

  console.log(
    JSON.stringify(
      {
        warmTimeToVisibleTableMs: {
          median: median(runs.map((r) => r.firstRowMs)),
          runs: runs.map((r) => r.firstRowMs),
          firstContentfulPaintMedian: median(runs.map((r) => r.fcpMs)),
          responseEndMedian: median(runs.map((r) => r.responseEndMs)),
        },
        loadAverage: {
          before: loadBefore.map((x) => x.toFixed(2)),
          after: loadAfter.map((x) => x.toFixed(2)),
        },
        rowsVisible1440x900: { rows: rowsVisible, density },
        tabPressesSearchToNext: tabs,
        bytesPer100Rows: {
          jsonKB: kb(json.length),
          jsonGzipKB: kb(gzipSync(json).length),
          lineListHtmlKB: kb(html.length),
          lineListHtmlGzipKB: kb(gzipSync(html).length),
        },
      },
      null,
      1,
    ),
  );
});
