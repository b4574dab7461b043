import { expect, test } from './fixtures';
import ExcelJS from 'exceljs';
import { demo, openDemoProject, signIn } from './helpers';

test('the contractor downloads the issued bill and reaches nothing else', async ({ page }) => {
  const c = demo('contractor');
  await signIn(page, c.email, c.password);
  const id = await openDemoProject(page);
  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Bill of quantities' })
    .click();
  await expect(page.getByRole('button', { name: /Issue revision/ })).toHaveCount(0);
  await expect(page.getByRole('table', { name: 'Material summary' })).toContainText(
    'Mineral wool pipe section',
  );
  const dl = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Download issue 1 (.xlsx)' }).click();
  const file = await dl;
  expect(file.suggestedFilename()).toBe('BP-STM-24-bill-of-quantities-issue-1.xlsx');
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(await file.path());
  const summary = wb.getWorksheet('Summary')!;
  expect(summary.getCell('A1').value).toBe('Material');
  expect(typeof summary.getCell('F2').value).toBe('number');
  expect(wb.getWorksheet('Notes')!.getCell('B1').value).toBe('BP-STM-24 — Brack Point steam network upgrade');

  // An unissued revision, the line list, the review and the budget are all closed to the contractor.
  expect((await page.request.get(`/api/v1/projects/${id}/boq/2`)).status()).toBe(404);
  expect((await page.request.get(`/api/v1/projects/${id}/lines`)).status()).toBe(403);
  for (const path of ['lines', 'review', 'budget', 'design-basis']) {
    await page.goto(`/projects/${id}/${path}`);
    await expect(page.getByRole('alert').filter({ hasText: 'Not available for your role' })).toBeVisible();
  }
});

test('the owner sees the area over its allocation flagged and can ask what-if questions', async ({
  page,
}) => {
  const o = demo('owner');
  await signIn(page, o.email, o.password);
  await openDemoProject(page);
  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Heat-loss budget' })
    .click();
  await expect(page.getByRole('alert').filter({ hasText: 'Over budget' })).toContainText(
    /U30 Polymerisation: .* kW designed against .* kW allocated/,
  );
  await expect(page.locator('tr[data-area="U30 Polymerisation"]')).toContainText('over allocation');
  await expect(page.locator('tr[data-area="U20 Boiler house"]')).not.toContainText('over allocation');
  await expect(page.getByRole('img', { name: 'Heat loss per area against allocation' })).toBeVisible();
  await page.getByLabel('Thickness policy').selectOption('economic-plus-one');
  await page.getByRole('button', { name: 'Show totals' }).click();
  await expect(page.getByRole('table', { name: 'What-if totals' })).toContainText('Saved by insulation');
  // A bad budget entry is refused by field.
  await page.getByLabel('Plant budget, kW').fill('lots');
  await page.getByRole('button', { name: 'Save budget' }).click();
  await expect(page.getByText('Total budget must be a number (kW)').first()).toBeVisible();
});
