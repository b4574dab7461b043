import { expect, test } from './fixtures';
import { demo, openDemoProject, other, signIn } from './helpers';

const ALL = [
  'Overview',
  'Line list',
  'Design basis',
  'Safety review',
  'Heat-loss budget',
  'Bill of quantities',
  'Design report',
  'Members',
];
const NAV: Record<string, string[]> = {
  owner: ALL,
  engineer: ALL,
  reviewer: ALL,
  contractor: ['Overview', 'Bill of quantities', 'Design report'],
};
const ROLE_LABEL: Record<string, string> = {
  owner: 'Owner',
  engineer: 'Engineer',
  reviewer: 'Safety reviewer',
  contractor: 'Contractor',
};

for (const key of ['owner', 'engineer', 'reviewer', 'contractor'] as const) {
  test(`${key} signs in and sees the navigation of the role`, async ({ page }) => {
    const u = demo(key);
    await signIn(page, u.email, u.password);
    await openDemoProject(page);
    await expect(page.getByTestId('role').filter({ visible: true })).toHaveText(ROLE_LABEL[key]);
    const links = page.getByRole('navigation', { name: 'Project' }).getByRole('link');
    await expect(links).toHaveText(NAV[key]);
  });
}

test('contractor opening the line list directly is refused', async ({ page }) => {
  const u = demo('contractor');
  await signIn(page, u.email, u.password);
  const id = await openDemoProject(page);
  await page.goto(`/projects/${id}/lines`);
  await expect(page.getByRole('alert').filter({ hasText: 'Not available for your role' })).toBeVisible();
  await expect(page.getByRole('button', { name: /upload/i })).toHaveCount(0);
});

test('only the owner sees member management', async ({ page }) => {
  const eng = demo('engineer');
  await signIn(page, eng.email, eng.password);
  await openDemoProject(page);
  await page.getByRole('link', { name: 'Members' }).click();
  await expect(page.getByRole('cell', { name: 'Mira Castell' })).toBeVisible();
  await expect(page.getByRole('button', { name: 'Send invitation' })).toHaveCount(0);
});

test('a user of another organization gets 404 for the page and the API route', async ({ page, browser }) => {
  const owner = demo('owner');
  await signIn(page, owner.email, owner.password);
  const id = await openDemoProject(page);
  const api = await page.request.get(`/api/v1/projects/${id}`);
  expect(api.status()).toBe(200);
  expect((await api.json()).code).toBe('BP-STM-24');

  const ctx = await browser.newContext();
  const p2 = await ctx.newPage();
  await signIn(p2, other.email, other.password);
  const resp = await p2.goto(`/projects/${id}`);
  expect(resp?.status()).toBe(404);
  await expect(p2.getByRole('heading', { name: 'Not found' })).toBeVisible();
  const api2 = await p2.request.get(`/api/v1/projects/${id}`);
  expect(api2.status()).toBe(404);
  await ctx.close();
});

test('a tampered session cookie is treated as signed out', async ({ page, context }) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const cookies = await context.cookies();
  const s = cookies.find((c) => c.name === 'lagwise_session')!;
  expect(s.httpOnly).toBe(true);
  expect(s.sameSite).toBe('Lax');
  await context.addCookies([{ ...s, value: `${s.value.slice(0, -3)}xyz` }]);
  await page.goto('/projects');
  await expect(page).toHaveURL(/\/sign-in$/);
  const api = await page.request.get('/api/v1/projects/00000000-0000-0000-0000-000000000000');
  expect(api.status()).toBe(401);
});

test('wrong password shows the generic message and keeps the e-mail typed', async ({ page }) => {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail', { exact: true }).fill('engineer@korvane.example');
  await page.getByLabel('Password', { exact: true }).fill('definitely-wrong-1');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('alert').filter({ hasText: /./ })).toHaveText(
    'E-mail or password is not right.',
  );
  await expect(page.getByLabel('E-mail', { exact: true })).toHaveValue('engineer@korvane.example');
});
