import { expect, type Page } from '@playwright/test';
import { DEMO_USERS, OTHER_ORG } from '../../seed/demo-data';

export type DemoKey = (typeof DEMO_USERS)[number]['key'];
export const demo = (k: DemoKey) => DEMO_USERS.find((u) => u.key === k)!;
export const other = OTHER_ORG.user;

export async function signIn(page: Page, email: string, password: string) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail', { exact: true }).fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).toHaveURL(/\/projects$/);
}

export async function openDemoProject(page: Page) {
  await page.getByRole('link', { name: 'Brack Point steam network upgrade' }).click();
  await expect(
    page.getByRole('heading', { level: 1, name: 'Brack Point steam network upgrade' }),
  ).toBeVisible();
  return page.url().split('/projects/')[1];
}

import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { TEMPLATE_HEADERS, lineListWorkbook } from '../../seed/line-list';

export const lineRow = (
  tag: string,
  nps: string,
  temp: number,
  purpose: string,
  extra: Record<string, string | number> = {},
): (string | number | null)[] =>
  TEMPLATE_HEADERS.map(
    (h) =>
      (
        ({
          'Line tag': tag,
          Service: 'E2E service',
          Area: 'E2E',
          Geometry: 'Horizontal pipe',
          NPS: nps,
          'Length (m)': 40,
          'Normal temp (°C)': temp,
          'Max temp (°C)': temp + 10,
          Purpose: purpose,
          Location: 'Outdoor',
          Accessible: 'yes',
          ...extra,
        }) as Record<string, string | number>
      )[h] ?? null,
  );

/** As a signed-in engineer on /projects: a new project with the given lines imported and solved. Returns its id. */
export async function createProjectWithLines(page: Page, name: string, rows: (string | number | null)[][]) {
  await page.getByLabel('Code').fill(`E2E-${Date.now().toString().slice(-7)}`);
  await page.getByLabel('Name').fill(name);
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByRole('heading', { level: 1, name })).toBeVisible();
  const id = page.url().split('/projects/')[1];
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  const file = join(mkdtempSync(join(tmpdir(), 'lagwise-e2e-')), 'lines.xlsx');
  writeFileSync(file, await lineListWorkbook(rows));
  await page.getByLabel('Line-list file (.xlsx or .csv, up to 20 MB)').setInputFiles(file);
  await page.getByRole('button', { name: 'Read file' }).click();
  await page.getByRole('button', { name: 'Check the rows' }).click();
  await page.getByRole('button', { name: `Import ${rows.length} lines` }).click();
  await expect(page.getByText(new RegExp(`imported: ${rows.length} lines`))).toBeVisible();
  return id;
}

/**
 * The newest message to an address in the local SMTP sink, and the URL behind one of its links
 * (the text part ends each link as "Label: URL"). The app itself never shows other people's mail.
 */
export async function mailLink(
  to: string,
  subject: RegExp,
  label: string,
  opts: { text?: RegExp; after?: Date } = {},
): Promise<{ url: string; text: string }> {
  const sink = `http://127.0.0.1:${process.env.MAIL_SINK_HTTP_PORT ?? 2536}`;
  const deadline = Date.now() + 15_000;
  const escaped = label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  for (;;) {
    const list: { subject: string; text: string; receivedAt: string }[] = await (
      await fetch(`${sink}/messages?to=${encodeURIComponent(to.toLowerCase())}`)
    ).json();
    const m = list.find(
      (x) =>
        subject.test(x.subject) &&
        (!opts.after || new Date(x.receivedAt) >= opts.after) &&
        (!opts.text || opts.text.test(x.text)),
    );
    if (m) {
      const hit = m.text.match(new RegExp(`${escaped}: (\\S+)`));
      if (!hit) throw new Error(`no "${label}" link in "${m.subject}"`);
      return { url: hit[1], text: m.text };
    }
    if (Date.now() > deadline) throw new Error(`no matching mail to ${to}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/**
 * The URL of a link in the newest message to `to` in the local SMTP sink (mail is sent in the
 * background, so this waits for it). The app never shows mail in a production build.
 */
export async function mailboxLink(_page: Page, to: string, linkName: string): Promise<string> {
  const sink = `http://127.0.0.1:${process.env.MAIL_SINK_HTTP_PORT ?? 2536}`;
  const escaped = linkName.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  const deadline = Date.now() + 15_000;
  for (;;) {
    const list: { text: string }[] = await (
      await fetch(`${sink}/messages?to=${encodeURIComponent(to.toLowerCase())}`)
    ).json();
    for (const m of list) {
      const hit = m.text.match(new RegExp(`${escaped}: (\\S+)`));
      if (hit) return hit[1];
    }
    if (Date.now() > deadline) throw new Error(`no "${linkName}" message to ${to} in the mail sink`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** Signs up a new account through the mailed confirmation link and lands signed in on /projects. */
export async function signUpConfirmed(
  page: Page,
  o: { name: string; email: string; password: string; organization: string },
) {
  await page.goto('/sign-up');
  await page.getByLabel('Your name').fill(o.name);
  await page.getByLabel('Work e-mail').fill(o.email);
  await page.getByLabel('Password', { exact: true }).fill(o.password);
  await page.getByLabel('Organization').fill(o.organization);
  await page.getByRole('button', { name: 'Create account' }).click();
  await expect(page.getByRole('status')).toContainText('Check your e-mail');
  await page.goto(await mailboxLink(page, o.email, 'Create my account'));
  await page.getByRole('button', { name: 'Create my account' }).click();
  await expect(page).toHaveURL(/\/projects$/);
}

/**
 * Presses "Solve stale lines" and waits until the background job is listed as done with `n`
 * lines solved (the table refreshes itself when the job ends).
 */
export async function solveStaleLines(page: Page, n: number) {
  const done = page
    .getByRole('list', { name: 'Recent jobs', includeHidden: true })
    .locator('li', { hasText: new RegExp(`· Solve · done · ${n} lines? solved`) });
  const before = await done.count();
  await page.getByRole('button', { name: 'Solve stale lines' }).click();
  await expect(page.getByRole('status')).toContainText('Solving the stale lines in the background');
  await expect(done).toHaveCount(before + 1, { timeout: 60_000 });
}
