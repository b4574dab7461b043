import { expect, test } from './fixtures';
import ExcelJS from 'exceljs';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { demo, openDemoProject, signIn } from './helpers';
import { TEMPLATE_HEADERS, lineListWorkbook } from '../../seed/line-list';

const row = (tag: string, nps: string, temp: number, purpose: string): (string | number | null)[] =>
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
        }) as Record<string, string | number>
      )[h] ?? null,
  );

test('engineer: template, upload, map, import, results, pick, reload', async ({ page }) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  // A fresh project, so the demo project's line list stays as seeded.
  const code = `E2E-${Date.now().toString().slice(-6)}`;
  await page.getByLabel('Code').fill(code);
  await page.getByLabel('Name').fill('Upload check');
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Upload check' })).toBeVisible();
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();

  const downloadPromise = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Download template' }).click();
  const download = await downloadPromise;
  expect(download.suggestedFilename()).toBe('lagwise-line-list-template.xlsx');
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(await download.path());
  expect(wb.getWorksheet('Line list')!.getRow(1).getCell(1).value).toBe('Line tag');

  const dir = mkdtempSync(join(tmpdir(), 'lagwise-e2e-'));
  const file = join(dir, 'filled.xlsx');
  writeFileSync(
    file,
    await lineListWorkbook([
      row('E-101', '4', 180, 'H,P'),
      row('E-102', '2', 90, 'H,P'),
      row('E-103', '3', 6, 'C'),
    ]),
  );
  await page.getByLabel('Line-list file (.xlsx or .csv, up to 20 MB)').setInputFiles(file);
  await page.getByRole('button', { name: 'Read file' }).click();
  await expect(page.getByLabel('Column for Line / equipment tag')).toHaveValue('0');
  await expect(page.getByLabel('Unit for Normal operating temperature')).toHaveValue('°C');
  await page.getByRole('button', { name: 'Check the rows' }).click();
  await expect(page.getByRole('status', { name: 'Check result' })).toContainText('3 lines ready · 0 errors');
  await page.getByRole('button', { name: 'Import 3 lines' }).click();
  await expect(
    page.getByText(/Revision 1 imported: 3 lines \(3 added, 0 changed, 0 removed\); 3 solved\./),
  ).toBeVisible();

  const r101 = page.locator('tr[data-tag="E-101"]');
  await expect(r101).toBeVisible();
  // The thickness carries its unit (SI project, millimetre series): "50 mm".
  const recText = await r101.locator('td').nth(5).innerText();
  expect(recText).toMatch(/^\d+ mm$/);
  const rec = parseFloat(recText);
  expect(rec).toBeGreaterThanOrEqual(40);
  await expect(page.locator('tr[data-tag="E-103"] td').nth(6)).toHaveText('Condensation');

  // Pick the next thicker candidate than recommended, with a reason.
  const select = page.getByLabel('Thickness for E-101');
  await select.focus(); // opening the picker loads its thickness options
  await expect(select.locator('option[value="0"]')).toBeAttached();
  const options = await select
    .locator('option')
    .evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value));
  const next = options[options.indexOf(String(rec)) + 1];
  await select.selectOption(next);
  await page.getByLabel('Reason for E-101').fill('One size up for the wind at the jetty');
  await page.getByRole('button', { name: 'Save' }).click();
  await expect(r101.getByText('manual')).toBeVisible();
  await page.reload();
  await expect(page.getByLabel('Thickness for E-101')).toHaveValue(next);
  await expect(page.locator('tr[data-tag="E-101"]').getByText('manual')).toBeVisible();

  // The line detail shows the choice and the overall coefficient with its reference areas.
  await page.locator('tr[data-tag="E-101"] a').click();
  await expect(page.getByText('(manual pick)')).toBeVisible();
  await expect(
    page.getByText('Reason: One size up for the wind at the jetty', { exact: true }),
  ).toBeVisible();
  // The record reads as changes, not JSON.
  await expect(page.getByRole('table', { name: 'Audit trail' })).toContainText(
    'reason: One size up for the wind at the jetty',
  );
  await expect(page.getByText('U referred to the outer surface')).toBeVisible();
  await expect(page.getByRole('img', { name: 'Heat loss and annual cost against thickness' })).toBeVisible();
});

test('a file with errors is refused with row and column, and nothing is imported', async ({ page }) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  await openDemoProject(page);
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  // Read the count once the table has loaded ("0 lines · loading…" before).
  await expect(page.getByText(/^\d+ lines$/)).toBeVisible();
  const total = await page.getByText(/^\d+ lines/).innerText();
  const dir = mkdtempSync(join(tmpdir(), 'lagwise-e2e-'));
  const file = join(dir, 'broken.xlsx');
  writeFileSync(file, await lineListWorkbook([row('B-1', '4', 180, 'H'), row('B-1', 'huge', 180, 'H')]));
  await page.getByLabel('Line-list file (.xlsx or .csv, up to 20 MB)').setInputFiles(file);
  await page.getByRole('button', { name: 'Read file' }).click();
  await page.getByRole('button', { name: 'Check the rows' }).click();
  const problems = page.getByRole('table', { name: 'Problems found' });
  await expect(problems).toContainText('Duplicate tag "B-1": also in row 2.');
  await expect(problems).toContainText('"huge" is not a nominal pipe size');
  await expect(page.getByRole('button', { name: 'Fix the errors to import' })).toBeDisabled();
  await page.reload();
  await expect(page.getByText(/^\d+ lines/)).toHaveText(total);

  const txt = join(dir, 'notes.txt');
  writeFileSync(txt, 'hello');
  await page.getByLabel('Line-list file (.xlsx or .csv, up to 20 MB)').setInputFiles(txt);
  await page.getByRole('button', { name: 'Read file' }).click();
  await expect(page.getByRole('alert').filter({ hasText: /xlsx workbook or a \.csv/ })).toBeVisible();
});

test('the safety reviewer reads the line list without edit controls; the contractor cannot open it', async ({
  page,
  browser,
}) => {
  const r = demo('reviewer');
  await signIn(page, r.email, r.password);
  await openDemoProject(page);
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  await expect(page.locator('tr[data-tag]').first()).toBeVisible();
  await expect(page.getByRole('button', { name: 'Read file' })).toHaveCount(0);
  await expect(page.getByRole('button', { name: /Accept recommendation/ })).toHaveCount(0);
  await expect(page.getByRole('combobox', { name: /^Thickness for/ })).toHaveCount(0);

  const ctx = await browser.newContext();
  const p = await ctx.newPage();
  const c = demo('contractor');
  await signIn(p, c.email, c.password);
  const id = await openDemoProject(p);
  const api = await p.request.get(`/api/v1/projects/${id}/lines`);
  expect(api.status()).toBe(403);
  await ctx.close();
});
