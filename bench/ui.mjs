// UI measurements for the line table and the shell, in Debian's Chromium against a running server:
//   BASE=http://127.0.0.1:3000 node bench/ui.mjs [screenshot-dir]
// Prints one JSON object: rows fully visible at 1440×900 and 1280×800 (below the sticky header, inside
// the table's own box), Tab presses from the top of the line list to "Next page", the layout at 768 and
// 320 px, the line page's sideways scroll at 1280, and axe-core (WCAG 2.1 A/AA) counts per page and role.
import { chromium } from '@playwright/test';
import { AxeBuilder } from '@axe-core/playwright';
import { mkdirSync } from 'node:fs';

const BASE = process.env.BASE ?? 'http://127.0.0.1:3000';
const shots = process.argv[2];
if (shots) mkdirSync(shots, { recursive: true });
const USERS = {
  owner: ['owner@korvane.example', 'kiln-owner-4471'],
  engineer: ['engineer@korvane.example', 'kiln-engineer-4471'],
  reviewer: ['reviewer@korvane.example', 'kiln-reviewer-4471'],
  contractor: ['contractor@hollis-thermal.example', 'kiln-contractor-4471'],
};

const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox'] });
const out = {};

async function signedIn(role, viewport = { width: 1440, height: 900 }) {
  const ctx = await browser.newContext({ viewport });
  const page = await ctx.newPage();
  page.setDefaultTimeout(180_000);
  await page.goto(`${BASE}/sign-in`);
  await page.getByLabel('E-mail', { exact: true }).fill(USERS[role][0]);
  await page.getByLabel('Password', { exact: true }).fill(USERS[role][1]);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/projects$/);
  const href = await page
    .getByRole('link', { name: 'Brack Point steam network upgrade' })
    .getAttribute('href');
  return { ctx, page, project: href };
}

/** Rows whose box lies wholly inside the viewport, inside every scrolling ancestor and below the header. */
async function visibleRows(page) {
  return page.evaluate(() => {
    const rows = [...document.querySelectorAll('tr[data-tag]')];
    const head = document.querySelector('table[aria-label="Line table"] thead');
    const headBottom = head ? head.getBoundingClientRect().bottom : 0;
    let n = 0;
    for (const r of rows) {
      const b = r.getBoundingClientRect();
      if (b.top < Math.max(0, headBottom) - 0.5 || b.bottom > innerHeight + 0.5) continue;
      let ok = true;
      for (let p = r.parentElement; p && p !== document.body; p = p.parentElement) {
        const s = getComputedStyle(p);
        if (/(auto|scroll|hidden)/.test(s.overflowY)) {
          const pb = p.getBoundingClientRect();
          if (b.top < pb.top - 0.5 || b.bottom > pb.bottom + 0.5) ok = false;
        }
      }
      if (ok) n++;
    }
    return { rows: n, firstRowTop: rows[0] ? Math.round(rows[0].getBoundingClientRect().top) : null };
  });
}

// Density and keyboard, as the engineer.
{
  const { ctx, page, project } = await signedIn('engineer');
  const lines = `${BASE}${project}/lines`;
  for (const [w, h] of [
    [1440, 900],
    [1280, 800],
  ]) {
    await page.setViewportSize({ width: w, height: h });
    await page.goto(lines);
    await page.locator('tr[data-tag]').first().waitFor();
    await page.waitForTimeout(300); // layout settles (fonts); a measurement, not a test
    out[`rowsVisible${w}x${h}`] = await visibleRows(page);
    if (shots) await page.screenshot({ path: `${shots}/lines-${w}x${h}.png` });
  }
  await page.setViewportSize({ width: 1440, height: 900 });
  await page.goto(lines);
  await page.locator('tr[data-tag]').first().waitFor();
  let tabs = 0;
  const next = page.getByRole('button', { name: /^Next/ });
  while (tabs < 600) {
    await page.keyboard.press('Tab');
    tabs++;
    if (await next.evaluate((el) => el === document.activeElement)) break;
  }
  out.tabsToNext = tabs;
  const firstTitle = await page.title();
  // Tablet and phone widths.
  for (const [w, h] of [
    [768, 1024],
    [320, 640],
  ]) {
    await page.setViewportSize({ width: w, height: h });
    await page.goto(lines);
    await page.locator('tr[data-tag]').first().waitFor();
    await page.waitForTimeout(300);
    out[`layout${w}`] = await page.evaluate(() => {
      const main = document.querySelector('main');
      const t = document.querySelector('table[aria-label="Line table"]');
      const vis = (sel) => {
        const el = document.querySelector(sel);
        if (!el) return null;
        const b = el.getBoundingClientRect();
        return b.left >= 0 && b.right <= innerWidth && b.width > 0;
      };
      return {
        pageScrollsSideways: document.documentElement.scrollWidth > innerWidth,
        mainWidth: main ? Math.round(main.getBoundingClientRect().width) : null,
        tableWidth: t ? Math.round(t.getBoundingClientRect().width) : null,
        firstTagVisible: vis('tr[data-tag] td:first-child'),
        statusVisible: vis('tr[data-tag] td[data-col="status"]'),
        pickerVisible: vis('tr[data-tag] select'),
      };
    });
    if (shots) await page.screenshot({ path: `${shots}/lines-${w}.png` });
  }
  // The line page at 1280: sideways scroll, title.
  await page.setViewportSize({ width: 1280, height: 800 });
  await page.goto(lines);
  const link = page.locator('tr[data-tag] a').first();
  await link.waitFor();
  const href = await link.getAttribute('href');
  await page.goto(`${BASE}${href}`);
  await page.locator('h1').waitFor();
  out.linePage1280 = await page.evaluate(() => ({
    pageScrollsSideways: document.documentElement.scrollWidth > innerWidth,
    scrollWidth: document.documentElement.scrollWidth,
    title: document.title,
  }));
  out.lineListTitle = firstTitle;
  if (shots) await page.screenshot({ path: `${shots}/line-page-1280.png`, fullPage: true });
  await ctx.close();
}

console.error(JSON.stringify(out));
// axe-core over the main pages, as each role (AXE=0 leaves it out).
const PAGES = ['', '/lines', '/design-basis', '/review', '/budget', '/boq'];
out.axe = {};
{
  const ctx = await browser.newContext({ viewport: { width: 1280, height: 800 } });
  const page = await ctx.newPage();
  page.setDefaultTimeout(180_000);
  await page.goto(`${BASE}/sign-in`);
  const r = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
  out.axe['sign-in'] = summarise(r);
  console.error('sign-in', JSON.stringify(out.axe['sign-in']));
  await ctx.close();
}
for (const role of process.env.AXE === '0' ? [] : Object.keys(USERS)) {
  const { ctx, page, project } = await signedIn(role, { width: 1280, height: 800 });
  const targets = [`${BASE}/projects`, ...PAGES.map((p) => `${BASE}${project}${p}`)];
  // the first line's own page
  await page.goto(`${BASE}${project}/lines`);
  const a = page.locator('tr[data-tag] a').first();
  if (await a.isVisible({ timeout: 8000 }).catch(() => false))
    targets.push(`${BASE}${await a.getAttribute('href')}`);
  for (const t of targets) {
    await page.goto(t);
    await page.locator('h1').first().waitFor();
    if (t.endsWith('/lines')) await page.locator('tr[data-tag]').first().waitFor();
    const r = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
    out.axe[`${role} ${t.replace(BASE, '').replace(project, '/p')}`] = summarise(r);
    console.error(role, t, JSON.stringify(summarise(r)));
  }
  await ctx.close();
}
function summarise(r) {
  const s = { critical: 0, serious: 0, moderate: 0, minor: 0, rules: {} };
  for (const v of r.violations) {
    s[v.impact] += v.nodes.length;
    s.rules[v.id] = v.nodes.length;
  }
  return s;
}
const total = { critical: 0, serious: 0 };
for (const s of Object.values(out.axe)) {
  total.critical += s.critical;
  total.serious += s.serious;
}
out.axeTotal = total;
console.log(JSON.stringify(out, null, 1));
await browser.close();
