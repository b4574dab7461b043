import { expect, test } from '@playwright/test';
import { demo, openDemoProject } from './helpers';

async function companySignIn(page: import('@playwright/test').Page, email: string, password: string) {
  await page.goto('/sign-in');
  await page.getByLabel('Work e-mail').fill(email);
  await page.getByRole('button', { name: 'Continue with company sign-in' }).click();
  // The local identity provider's own page (a different origin).
  const idpLogin = page.getByLabel('Company password');
  await idpLogin.waitFor({ timeout: 4_000 }).catch(() => undefined);
  if (await idpLogin.isVisible()) {
    await page.getByLabel('Company e-mail').fill(email);
    await idpLogin.fill(password);
    await page.getByRole('button', { name: 'Sign in to Korvane' }).click();
  }
}

test('the demo engineer signs in with the company account (linked once by password) and lands in the project', async ({ page }) => {
  const eng = demo('engineer');
  await companySignIn(page, eng.email, 'korvane-sso-engineer');
  // First time: the existing password account must confirm the link.
  await expect(page.getByTestId('company-message')).toContainText('already has a Lagwise password. Sign in with it once to link');
  await page.getByLabel('E-mail', { exact: true }).fill(eng.email);
  await page.getByLabel('Password', { exact: true }).fill(eng.password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await expect(page).toHaveURL(/\/projects$/);
  await page.getByRole('button', { name: 'Sign out' }).click();

  // From now on the company account alone is enough.
  await companySignIn(page, eng.email, 'korvane-sso-engineer');
  await expect(page).toHaveURL(/\/projects$/);
  await expect(page.getByTestId('user-email')).toHaveText(eng.email);
  await openDemoProject(page);
  await expect(page.getByTestId('role')).toHaveText('Engineer');
});

test('a newcomer arrives waiting for an owner, and an unknown domain is told to use a password', async ({ page }) => {
  await companySignIn(page, 'newcomer@korvane.example', 'korvane-sso-newcomer');
  await expect(page.getByTestId('company-message')).toContainText('An owner of Korvane Polymers still has to give you a role');
  await page.goto('/sign-in');
  await page.getByLabel('Work e-mail').fill('someone@unknown.example');
  await page.getByRole('button', { name: 'Continue with company sign-in' }).click();
  await expect(page.getByRole('alert').filter({ hasText: 'No company sign-in is set up for unknown.example' })).toBeVisible();
});
