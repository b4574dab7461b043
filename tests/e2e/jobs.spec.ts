import { expect, test } from './fixtures';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { demo, lineRow, signIn } from './helpers';
import { lineListWorkbook } from '../../seed/line-list';

test('an import runs as a background job: a progress bar with counts, and it finishes after leaving the page and coming back', async ({
  page,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  await page.getByLabel('Code').fill(`E2E-${Date.now().toString().slice(-7)}`);
  await page.getByLabel('Name').fill('Job progress');
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Job progress' })).toBeVisible();
  const id = page.url().split('/projects/')[1];
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();

  const n = 800;
  const sizes = ['1', '2', '3', '4', '6', '8'];
  const rows = Array.from({ length: n }, (_, i) =>
    lineRow(`J-${1000 + i}`, sizes[i % sizes.length], 120 + (i % 200), 'H,P'),
  );
  const file = join(mkdtempSync(join(tmpdir(), 'lagwise-e2e-')), 'lines.xlsx');
  writeFileSync(file, await lineListWorkbook(rows));
  await page.getByLabel('Line-list file (.xlsx or .csv, up to 20 MB)').setInputFiles(file);
  await page.getByRole('button', { name: 'Read file' }).click();
  await page.getByRole('button', { name: 'Check the rows' }).click();
  await page.getByRole('button', { name: `Import ${n} lines` }).click();

  // The request returns at once; the bar follows the worker.
  const bar = page.getByRole('progressbar', { name: 'Import and solve progress' }).first();
  await expect(bar).toBeVisible();

  // Leave the page and come back: the job goes on, and the page picks it up again.
  await page.goto('/projects');
  await page.goto(`/projects/${id}/lines`);
  await expect(page.getByText(`${n} lines`, { exact: true })).toBeVisible({ timeout: 120_000 });
  await page.getByText('Recent jobs', { exact: true }).click();
  await expect(
    page
      .getByRole('list', { name: 'Recent jobs' })
      .getByText(new RegExp(`Import and solve · done · ${n} lines solved`)),
  ).toBeVisible();
  await expect(page.getByRole('progressbar')).toHaveCount(0);
});
