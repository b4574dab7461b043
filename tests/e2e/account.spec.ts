import { expect, test } from '@playwright/test';
import { mailLink } from './helpers';

test('sign up creates an organization; a password reset link arrives in the mailbox and works', async ({ page }) => {
  const email = `e2e.${Date.now()}@example.com`;
  await page.goto('/sign-up');
  await page.getByLabel('Your name').fill('Piet Tester');
  await page.getByLabel('Work e-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill('short');
  await page.getByLabel('Organization').fill('Tester Chemicals');
  await page.getByRole('button', { name: 'Create account' }).click();
  await expect(page.getByText('Use at least 12 characters.')).toBeVisible();
  await page.getByLabel('Password', { exact: true }).fill('granite-elbow-jacket');
  await page.getByRole('button', { name: 'Create account' }).click();
  await expect(page).toHaveURL(/\/projects$/);
  await expect(page.getByText('Tester Chemicals · Owner')).toBeVisible();
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page).toHaveURL(/\/sign-in$/);

  await page.goto('/forgot-password');
  await page.getByLabel('E-mail', { exact: true }).fill(email);
  await page.getByRole('button', { name: 'Send reset link' }).click();
  await expect(page.getByRole('status')).toContainText('reset link is on its way');

  const { url: resetUrl } = await mailLink(email, /Reset your Lagwise password/, 'Choose a new password');
  await page.goto(resetUrl);
  await page.getByLabel('New password').fill('marble-flange-lagging');
  await page.getByRole('button', { name: 'Save password' }).click();
  await expect(page).toHaveURL(/\/sign-in\?reset=1$/);
  await page.getByLabel('E-mail', { exact: true }).fill(email);
  await page.getByLabel('Password', { exact: true }).fill('marble-flange-lagging');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).toHaveURL(/\/projects$/);
});

test('the owner invites an engineer who joins through the e-mailed link', async ({ page, browser }) => {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail', { exact: true }).fill('owner@korvane.example');
  await page.getByLabel('Password', { exact: true }).fill('kiln-owner-4471');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('link', { name: 'Members' }).first().click();
  const invitee = `new.engineer.${Date.now()}@example.com`;
  await page.getByLabel('E-mail', { exact: true }).fill(invitee);
  await page.getByLabel('Role', { exact: true }).selectOption('engineer');
  await page.getByRole('button', { name: 'Send invitation' }).click();
  await expect(page.getByRole('status')).toHaveText('Invitation sent.');
  await expect(page.getByText(`${invitee} · Engineer`)).toBeVisible();

  const ctx = await browser.newContext();
  const p = await ctx.newPage();
  const { url: href } = await mailLink(invitee, /invited you/, 'Accept the invitation');
  await p.goto(href);
  await expect(p.getByText(`Invitation for ${invitee} as Engineer.`)).toBeVisible();
  await p.getByLabel('Your name').fill('Nia Newcomer');
  await p.getByLabel('Password', { exact: true }).fill('cobalt-riser-clamp');
  await p.getByRole('button', { name: 'Create account and join' }).click();
  await expect(p).toHaveURL(/\/projects$/);
  await expect(p.getByText('Korvane Polymers · Engineer')).toBeVisible();
  await p.goto(href);
  await expect(p.getByRole('alert').filter({ hasText: 'already been used' })).toBeVisible();
  await ctx.close();
});
