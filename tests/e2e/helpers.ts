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
  await expect(page.getByRole('heading', { level: 1, name: 'Brack Point steam network upgrade' })).toBeVisible();
  return page.url().split('/projects/')[1];
}

import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { TEMPLATE_HEADERS, lineListWorkbook } from '../../seed/line-list';

export const lineRow = (tag: string, nps: string, temp: number, purpose: string, extra: Record<string, string | number> = {}): (string | number | null)[] =>
  TEMPLATE_HEADERS.map((h) => ({ 'Line tag': tag, Service: 'E2E service', Area: 'E2E', Geometry: 'Horizontal pipe', NPS: nps, 'Length (m)': 40, 'Normal temp (°C)': temp, 'Max temp (°C)': temp + 10, Purpose: purpose, Location: 'Outdoor', Accessible: 'yes', ...extra } as Record<string, string | number>)[h] ?? null);

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

/** The href of a link in the newest development-mailbox message to `to` (mail is sent in the background, so this waits for it). */
export async function mailboxLink(page: Page, to: string, linkName: string): Promise<string> {
  for (let i = 0; i < 40; i++) {
    await page.goto('/dev/mailbox');
    const link = page.locator('li', { hasText: `to ${to}` }).getByRole('link', { name: linkName }).first();
    if (await link.count()) return (await link.getAttribute('href'))!;
    await page.waitForTimeout(250);
  }
  throw new Error(`no "${linkName}" message to ${to} in the mailbox`);
}
