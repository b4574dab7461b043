import { expect, test } from './fixtures';
import { demo, mailboxLink, openDemoProject, signIn } from './helpers';

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

test('the demo engineer signs in with the company account (linked once by password) and lands in the project', async ({
  page,
}) => {
  const eng = demo('engineer');
  await companySignIn(page, eng.email, 'korvane-sso-engineer');
  // First time: the existing password account must confirm the link.
  await expect(page.getByTestId('company-message')).toContainText(
    'already has a Lagwise account. To link your company account, sign in with its password once',
  );
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
  await expect(page.getByTestId('role').filter({ visible: true })).toHaveText('Engineer');
});

test('a newcomer arrives waiting for an owner, and an unknown domain is told to use a password', async ({
  page,
}) => {
  await companySignIn(page, 'newcomer@korvane.example', 'korvane-sso-newcomer');
  await expect(page.getByTestId('company-message')).toContainText(
    'An owner of Korvane Polymers still has to give you a role',
  );
  await page.goto('/sign-in');
  await page.getByLabel('Work e-mail').fill('someone@unknown.example');
  await page.getByRole('button', { name: 'Continue with company sign-in' }).click();
  await expect(
    page.getByRole('alert').filter({ hasText: 'No company sign-in is set up for unknown.example' }),
  ).toBeVisible();
});

test('linking by a mailed link works only in the browser that came back from the provider', async ({
  page,
  browser,
}) => {
  const rev = demo('reviewer');
  await companySignIn(page, rev.email, 'korvane-sso-reviewer');
  await expect(page.getByTestId('company-message')).toContainText(
    `${rev.email} already has a Lagwise account`,
  );
  await page.getByRole('button', { name: 'E-mail me a one-time link' }).click();
  await expect(
    page.getByRole('status').filter({ hasText: 'Sent to the address of your Lagwise account' }),
  ).toBeVisible();
  const href = await mailboxLink(page, rev.email, 'Link my company account');

  // Another browser (say, the mailbox's reader being someone else) cannot use it.
  const other = await browser.newContext();
  const p2 = await other.newPage();
  await p2.goto(href);
  await p2.getByRole('button', { name: 'Link my company account' }).click();
  await expect(p2.getByRole('alert').filter({ hasText: 'Open this link' })).toHaveText(
    'Open this link in the browser where you started the company sign-in.',
  );
  await other.close();

  await page.goto(href);
  await page.getByRole('button', { name: 'Link my company account' }).click();
  await expect(page.getByTestId('company-message')).toHaveText(
    'Your company account is linked. Sign in with it now.',
  );
  await companySignIn(page, rev.email, 'korvane-sso-reviewer');
  await expect(page).toHaveURL(/\/projects$/);
  await expect(page.getByTestId('user-email')).toHaveText(rev.email);
});

test('company sign-in settings: a public domain is refused by field, the role switches back to "None until an owner approves", domains show their proof', async ({
  page,
}) => {
  const owner = demo('owner');
  await signIn(page, owner.email, owner.password);
  await page.getByRole('link', { name: 'Members' }).first().click();
  await page.getByRole('link', { name: 'Company sign-in settings' }).click();
  await expect(page.getByTestId('domain-korvane.example')).toContainText('korvane.example · proven');
  const domains = page.getByLabel('Allowed e-mail domains');
  await domains.fill('korvane.example, gmail.com');
  await page.getByRole('button', { name: 'Save company sign-in' }).click();
  await expect(
    page.getByText(
      "Allowed e-mail domains: public mail providers (like gmail.com or outlook.com) cannot be claimed; use your organization's own domain.",
    ),
  ).toBeVisible();
  await domains.fill('korvane.example');
  await page.getByLabel('Role for people who arrive this way').selectOption('engineer');
  await page.getByRole('button', { name: 'Save company sign-in' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Company sign-in saved.' })).toBeVisible();
  await page.reload();
  await expect(page.getByLabel('Role for people who arrive this way')).toHaveValue('engineer');
  await page.getByLabel('Role for people who arrive this way').selectOption('');
  await page.getByRole('button', { name: 'Save company sign-in' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Company sign-in saved.' })).toBeVisible();
  await page.reload();
  await expect(page.getByLabel('Role for people who arrive this way')).toHaveValue('');
  await expect(page.getByTestId('domain-korvane.example')).toContainText('korvane.example · proven');
});
