import { expect, type Page } from '@playwright/test';
import { DEMO_USERS, OTHER_ORG } from '../../seed/demo-data';

export type DemoKey = (typeof DEMO_USERS)[number]['key'];
export const demo = (k: DemoKey) => DEMO_USERS.find((u) => u.key === k)!;
export const other = OTHER_ORG.user;

export async function signIn(page: Page, email: string, password: string) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).toHaveURL(/\/projects$/);
}

export async function openDemoProject(page: Page) {
  await page.getByRole('link', { name: 'Brack Point steam network upgrade' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Brack Point steam network upgrade' })).toBeVisible();
  return page.url().split('/projects/')[1];
}
