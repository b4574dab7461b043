import { expect, test } from '@playwright/test';
import ExcelJS from 'exceljs';
import { readFileSync } from 'node:fs';
import { createProjectWithLines, demo, lineRow, signIn } from './helpers';

test('engineer: the revision history offers the original upload; the bill counts accessories with sourced factors, and an identical revision needs a second confirmation', async ({
  page,
}) => {
  test.slow(); // a project, an import, an accept, two issues
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const id = await createProjectWithLines(page, 'E2E bill kept', [
    lineRow('K-1', '4', 180, 'H', { Area: 'North', 'Length (m)': 60, Accessible: 'no' }),
    lineRow('K-2', '2', 150, 'H', { Area: 'North', 'Length (m)': 30, Accessible: 'no' }),
  ]);
  await page.reload();
  // The original file of revision 1, byte for byte (an .xlsx is a zip: "PK").
  const dl = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Download the original file of revision 1' }).click();
  const original = readFileSync(await (await dl).path());
  expect(original.subarray(0, 2).toString('latin1')).toBe('PK');

  await page.getByRole('button', { name: 'Accept recommendation for the filtered lines' }).click();
  const dialog = page.getByRole('dialog', { name: 'Accept the recommendation for the filtered lines?' });
  await dialog.getByRole('button', { name: 'Accept for 2 lines' }).click();
  await expect(dialog).toBeHidden();

  await page.goto(`/projects/${id}/boq`);
  await page.getByText('Bill factors and their sources').click();
  const factors = page.getByRole('form', { name: 'Bill factors' });
  await factors.getByLabel('Band spacing (m)').fill('0.45');
  await factors.getByLabel('Source of band spacing').fill('');
  await factors.getByRole('button', { name: 'Save factors' }).click();
  await expect(factors.getByRole('alert')).toHaveText('Band spacing: say where the value comes from');
  await factors.getByLabel('Source of band spacing').fill('Client insulation specification, clause 4.2');
  await factors.getByRole('button', { name: 'Save factors' }).click();
  await expect(factors.getByRole('status')).toHaveText('Factors saved; the next issue uses them.');

  await page.getByRole('button', { name: 'Issue revision 1' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Issue 1 issued' })).toBeVisible();
  const file = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Download issue 1 (.xlsx)' }).click();
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(await (await file).path());
  const acc = wb.getWorksheet('Accessories')!;
  const rows = (acc.getSheetValues().slice(2).filter(Boolean) as unknown[][]).map((r) => r.slice(1));
  // Bands at 450 mm: K-1 60 m → ⌈60 / 0.45⌉ = 134; K-2 30 m → ⌈30 / 0.45⌉ = 67 (no fittings in these rows).
  const bandCounts = rows.filter((r) => r[0] === 'Jacket bands' && r[2] === 'count').map((r) => r[3]);
  expect(bandCounts.reduce((a, b) => (a as number) + (b as number), 0)).toBe(134 + 67);
  const notes = wb.getWorksheet('Notes')!.getSheetValues() as unknown[][];
  expect(
    notes.some(
      (r) =>
        r?.[1] === 'bandSpacingM' && r[2] === 0.45 && r[3] === 'Client insulation specification, clause 4.2',
    ),
  ).toBe(true);

  // Nothing changed since: the page says so and asks twice.
  await page.reload();
  await expect(page.getByRole('note').filter({ hasText: 'Nothing changed since issue 1' })).toBeVisible();
  await page.getByRole('button', { name: 'Issue revision 2' }).click();
  await page.getByRole('button', { name: 'Cancel' }).click();
  await expect(page.getByRole('link', { name: 'Download issue 2 (.xlsx)' })).toHaveCount(0);
  await page.getByRole('button', { name: 'Issue revision 2' }).click();
  await page.getByRole('button', { name: 'Issue identical revision 2' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Issue 2 issued' })).toBeVisible();
});
