import { expect, test } from '@playwright/test';
import ExcelJS from 'exceljs';
import { readFileSync } from 'node:fs';
import { demo, openDemoProject, signIn } from './helpers';
import { pdfText } from '../support/pdf';

test('an engineer downloads a calculation sheet and the design report; the files say what the pages say', async ({
  page,
}) => {
  const e = demo('engineer');
  await signIn(page, e.email, e.password);
  await openDemoProject(page);
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  const first = page.getByRole('table').locator('tbody a.font-mono').first();
  await expect(first).toBeVisible();
  const tag = (await first.innerText()).trim();
  await first.click();
  await expect(page.getByRole('heading', { level: 1, name: tag })).toBeVisible();
  const recommended = (await page.getByTestId('recommended').innerText()).trim();

  const dl = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Download calculation sheet (PDF)' }).click();
  const sheet = await dl;
  expect(sheet.suggestedFilename()).toMatch(/^BP-STM-24-calculation-sheet-.+\.pdf$/);
  const text = await pdfText(readFileSync(await sheet.path()));
  expect(text).toContain(`Line ${tag}`);
  expect(text).toContain(`Recommended ${recommended}`);
  expect(text).toContain('Cautions');

  // The report: a draft, then an issued revision that downloads as issued.
  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Design report' })
    .click();
  await expect(page.getByRole('heading', { level: 1, name: 'Design report' })).toBeVisible();
  const next = Number(
    (await page.getByRole('button', { name: /^Issue revision \d+$/ }).innerText()).match(/\d+/)![0],
  );
  await page.getByLabel('Revision note (optional)').fill('Issued for client review');
  await page.getByRole('button', { name: `Issue revision ${next}` }).click();
  await expect(page.getByRole('status')).toHaveText(`Revision ${next} issued.`);
  const dl2 = page.waitForEvent('download');
  await page.getByRole('link', { name: `Download revision ${next} (PDF)` }).click();
  const report = await dl2;
  expect(report.suggestedFilename()).toBe(`BP-STM-24-design-report-rev-${next}.pdf`);
  const rtext = await pdfText(readFileSync(await report.path()));
  expect(rtext).toContain(`Revision ${next}`);
  expect(rtext).toContain('Issued for client review');
  expect(rtext).toContain('Heat-loss budget');
  // The report's designed total is the budget page's.
  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Heat-loss budget' })
    .click();
  await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
  const m = /Designed heat loss ([\d,.]+ kW)/.exec(rtext);
  expect(m).not.toBeNull();
  await expect(
    page
      .getByRole('row')
      .filter({ hasText: /^Designed/ })
      .first(),
  ).toContainText(m![1]);
});

test('the results export holds exactly the lines the filter shows', async ({ page }) => {
  const e = demo('engineer');
  await signIn(page, e.email, e.password);
  await openDemoProject(page);
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  const filtered = page.waitForResponse(
    (r) => r.url().includes('/lines?') && r.url().includes('q=HW') && r.ok(),
  );
  await page.getByLabel('Search tag or service').fill('HW');
  await filtered;
  await expect(page.getByText(/^\d+ lines$/)).toBeVisible();
  const total = Number((await page.getByText(/^\d+ lines/).innerText()).match(/^\d+/)![0]);
  const dl = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Results of the filtered lines (.xlsx)' }).click();
  const file = await dl;
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(await file.path());
  const ws = wb.getWorksheet('Results')!;
  expect(ws.rowCount - 1).toBe(total);
  for (let r = 2; r <= ws.rowCount; r++) expect(String(ws.getRow(r).getCell(1).value)).toMatch(/HW/);
});

test('a contractor sees issued report revisions but no draft and cannot issue', async ({ page }) => {
  const c = demo('contractor');
  await signIn(page, c.email, c.password);
  const id = await openDemoProject(page);
  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Design report' })
    .click();
  await expect(page.getByRole('heading', { level: 1, name: 'Design report' })).toBeVisible();
  await expect(page.getByRole('button', { name: /Issue revision/ })).toHaveCount(0);
  await expect(page.getByRole('link', { name: /draft/i })).toHaveCount(0);
  const draft = await page.request.get(`/api/v1/projects/${id}/reports/draft`);
  expect(draft.status()).toBe(403);
  const sheets = await page.request.get(`/api/v1/projects/${id}/export?format=csv`);
  expect(sheets.status()).toBe(403);
  const bad = await page.request.get(`/api/v1/projects/${id}/reports/0x1`);
  expect(bad.status()).toBe(404);
});
