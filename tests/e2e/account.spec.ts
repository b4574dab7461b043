import { expect, test } from './fixtures';
import { mailboxLink, signIn, signUpConfirmed } from './helpers';

test('sign up (confirmed from the mailed link) creates an organization; a password reset link arrives in the mailbox and works', async ({
  page,
}) => {
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
  await expect(page.getByRole('status')).toHaveText(
    'Check your e-mail: we sent a message to that address to finish creating your account. The link works once and expires in 24 hours.',
  );
  await page.goto(await mailboxLink(page, email, 'Create my account'));
  await expect(page.getByText(`Account ${email} with the organization Tester Chemicals.`)).toBeVisible();
  await page.getByRole('button', { name: 'Create my account' }).click();
  await expect(page).toHaveURL(/\/projects$/);
  await expect(page.getByText('Tester Chemicals · Owner')).toBeVisible();
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page).toHaveURL(/\/sign-in$/);

  await page.goto('/forgot-password');
  await page.getByLabel('E-mail', { exact: true }).fill(email);
  await page.getByRole('button', { name: 'Send reset link' }).click();
  await expect(page.getByRole('status')).toContainText('reset link is on its way');

  await page.goto(await mailboxLink(page, email, 'Choose a new password'));
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
  const href = await mailboxLink(p, invitee, 'Accept the invitation');
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

test('sign-up with an address that has an account answers exactly as for a new one', async ({ page }) => {
  await page.goto('/sign-up');
  await page.getByLabel('Your name').fill('Someone Else');
  await page.getByLabel('Work e-mail').fill('owner@korvane.example');
  await page.getByLabel('Password', { exact: true }).fill('granite-elbow-jacket');
  await page.getByLabel('Organization').fill('Copycat Ltd');
  await page.getByRole('button', { name: 'Create account' }).click();
  await expect(page.getByRole('status')).toHaveText(
    'Check your e-mail: we sent a message to that address to finish creating your account. The link works once and expires in 24 hours.',
  );
  await expect(page.getByText(/already exists|already has an account/)).toHaveCount(0);
});

test('a signed-in user changes the password: the current one is required, the other browser is signed out, a notice is mailed', async ({
  page,
  browser,
}) => {
  const email = `pwchange.${Date.now()}@example.com`;
  await signUpConfirmed(page, {
    name: 'Pia Change',
    email,
    password: 'granite-elbow-jacket',
    organization: 'Change Chemicals',
  });

  const other = await browser.newContext();
  const p2 = await other.newPage();
  await signIn(p2, email, 'granite-elbow-jacket');

  await page.getByRole('link', { name: 'Account', exact: true }).click();
  await page.getByLabel('Current password').fill('not-my-password');
  await page.getByLabel('New password').fill('copper-saddle-weld');
  await page.getByRole('button', { name: 'Change password' }).click();
  await expect(page.getByText('This is not your current password.')).toBeVisible();
  await page.getByLabel('Current password').fill('granite-elbow-jacket');
  await page.getByLabel('New password').fill('copper-saddle-weld');
  await page.getByRole('button', { name: 'Change password' }).click();
  await expect(page.getByRole('status')).toHaveText(
    'Password changed. Every other session was signed out, and a notice went to your address.',
  );
  // This browser stays signed in; the other one is out.
  await page.goto('/projects');
  await expect(page.getByTestId('user-email')).toHaveText(email);
  await p2.goto('/projects');
  await expect(p2).toHaveURL(/\/sign-in$/);
  expect(await mailboxLink(page, email, 'Reset the password')).toContain('/forgot-password');

  // "Sign out other sessions" ends a fresh second session and keeps this one.
  await signIn(p2, email, 'copper-saddle-weld');
  await page.goto('/account');
  await page.getByRole('button', { name: 'Sign out other sessions' }).click();
  await expect(page.getByRole('status')).toHaveText('Every other session was signed out.');
  await p2.goto('/projects');
  await expect(p2).toHaveURL(/\/sign-in$/);
  await page.goto('/projects');
  await expect(page.getByTestId('user-email')).toHaveText(email);
  await other.close();
});
