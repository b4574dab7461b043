import { expect, test, type Page } from './fixtures';
import { demo, openDemoProject, signIn } from './helpers';

/**
 * Reflow (WCAG 2.1 SC 1.4.10): at 320 CSS px wide no main page scrolls sideways — a data table wider than
 * the screen scrolls inside its own box, which the success criterion allows for two-dimensional content.
 * At 768 px (a tablet held upright) the same holds. Measured on the document: its scroll width must not
 * exceed its client width.
 */
async function sideways(page: Page) {
  return page.evaluate(() => {
    const de = document.documentElement;
    // Name the widest element that sticks out, so a failure says where to look.
    let culprit = '';
    if (de.scrollWidth > de.clientWidth)
      for (const el of document.querySelectorAll<HTMLElement>('main *')) {
        const r = el.getBoundingClientRect();
        if (r.right > de.clientWidth + 1 && r.width > 0) {
          culprit = `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''} "${(el.textContent ?? '').trim().slice(0, 40)}" right edge ${Math.round(r.right)} px`;
          break;
        }
      }
    return { scrollWidth: de.scrollWidth, clientWidth: de.clientWidth, culprit };
  });
}

for (const width of [320, 768]) {
  test(`at ${width} px no main page scrolls sideways (overview, lines, a line, design basis, review queue and round, budget, bill, design report, tokens)`, async ({
    page,
  }) => {
    test.setTimeout(300_000); // eleven pages on a loaded 2-core machine
    const u = demo('engineer');
    await signIn(page, u.email, u.password);
    const id = await openDemoProject(page);
    const base = `/projects/${id}`;
    await page.setViewportSize({ width, height: width === 320 ? 640 : 1024 });

    // Pages reached through the list: the first line, the open review round.
    await page.goto(`${base}/lines`);
    const firstLine = page.locator('tr[data-tag] td[data-col="tag"] a').first();
    await expect(firstLine).toBeVisible();
    const linePath = (await firstLine.getAttribute('href'))!;
    await page.goto(`${base}/review`);
    const roundLink = page.locator('main a[href*="/review/"]').first();
    await expect(roundLink).toBeVisible();
    const roundPath = (await roundLink.getAttribute('href'))!;

    const pages: [string, string][] = [
      ['overview', base],
      ['line list', `${base}/lines`],
      ['line page', linePath],
      ['design basis', `${base}/design-basis`],
      ['review queue', `${base}/review`],
      ['review round', roundPath],
      ['budget', `${base}/budget`],
      ['bill of quantities', `${base}/boq`],
      ['design report', `${base}/report`],
      ['API tokens', '/account/tokens'],
      ['projects', '/projects'],
    ];
    const failures: string[] = [];
    for (const [name, path] of pages) {
      await page.goto(path);
      await expect(page.locator('h1').first()).toBeVisible();
      if (name === 'line list') await expect(page.locator('tr[data-tag]').first()).toBeVisible();
      const s = await sideways(page);
      expect(s.clientWidth, `${name}: the viewport is ${width} px`).toBe(width);
      if (s.scrollWidth > s.clientWidth)
        failures.push(`${name}: ${s.scrollWidth} px wide in ${s.clientWidth} (${s.culprit})`);
    }
    expect(failures, failures.join('\n')).toEqual([]);
  });
}
