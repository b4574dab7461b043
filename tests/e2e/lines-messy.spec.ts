import { expect, test, type Page } from './fixtures';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { demo, signIn } from './helpers';
import { semicolon1252Csv, titleRowsWorkbook } from '../fixtures/messy-lines';

const FILE_LABEL = 'Line-list file (.xlsx or .csv, up to 20 MB)';

async function newProject(page: Page, name: string) {
  await page.getByLabel('Code').fill(`MX-${Date.now().toString().slice(-7)}`);
  await page.getByLabel('Name').fill(name);
  await page.getByRole('button', { name: 'Create project' }).click();
  await expect(page.getByRole('heading', { level: 1, name })).toBeVisible();
  const id = page.url().split('/projects/')[1];
  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  return id;
}

const lineCount = async (page: Page, id: string) =>
  ((await (await page.request.get(`/api/v1/projects/${id}/lines?size=10`)).json()) as { total: number })
    .total;

test('a client workbook with title rows: header row, mapping, value questions, check, import — and nothing imports when stopped halfway', async ({
  page,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const id = await newProject(page, 'Client workbook');
  const dir = mkdtempSync(join(tmpdir(), 'lagwise-e2e-'));
  const file = join(dir, 'unit40-line-designation.xlsx');
  writeFileSync(file, await titleRowsWorkbook());

  // Reading: the header is found on row 4 under the title, revision and blank rows.
  await page.getByLabel(FILE_LABEL).setInputFiles(file);
  await page.getByRole('button', { name: 'Read file' }).click();
  const headerRow = page.getByLabel('Header row (the column names)');
  await expect(headerRow).toHaveValue('4');
  await expect(page.getByLabel('Rows to read')).toHaveText(
    '4 rows below the header; rows above row 4 are not read.',
  );
  await expect(page.getByLabel('Column for Line / equipment tag')).toHaveValue('0');
  await expect(page.getByLabel('Unit for Normal operating temperature')).toHaveValue('°F');
  await expect(page.getByLabel('Unit for Length')).toHaveValue('ft');
  // An optional field the file does not have stays unmapped, and that is fine.
  await expect(page.getByLabel('Column for Jacket override')).toHaveValue('');

  // Choosing the revision row as header maps no required field; choosing row 4 again brings the mapping back.
  await headerRow.selectOption('2');
  await expect(page.getByLabel('Column for Line / equipment tag')).toHaveValue('');
  await page.getByRole('button', { name: 'Check the rows' }).click();
  await expect(page.getByRole('table', { name: 'Problems found' })).toContainText(
    'No column is mapped to "Line / equipment tag", "Normal operating temperature" and a size',
  );
  await headerRow.selectOption('4');
  await expect(page.getByLabel('Column for Line / equipment tag')).toHaveValue('0');

  // Checking asks about the two location words once each, instead of an error per row.
  await page.getByRole('button', { name: 'Check the rows' }).click();
  await expect(page.getByRole('status', { name: 'Check result' })).toContainText('1 lines ready · 2 errors');
  const questions = page.getByRole('table', { name: 'Values to answer' });
  await expect(questions).toContainText('Pipe rack');
  await expect(questions).toContainText('column H, 2 rows');
  await expect(questions).toContainText('Platform');
  await expect(page.getByRole('button', { name: 'Fix the errors to import' })).toBeDisabled();

  // The user stops halfway: nothing was imported.
  await page.reload();
  expect(await lineCount(page, id)).toBe(0);

  // Again, to the end.
  await page.getByLabel(FILE_LABEL).setInputFiles(file);
  await page.getByRole('button', { name: 'Read file' }).click();
  await expect(headerRow).toHaveValue('4');
  await page.getByRole('button', { name: 'Check the rows' }).click();
  await page.getByLabel('Meaning of Pipe rack (Indoor / outdoor)').selectOption('outdoor');
  await page.getByLabel('Meaning of Platform (Indoor / outdoor)').selectOption('outdoor');
  await expect(page.getByText('All answered — check the rows again.')).toBeVisible();
  await page.getByRole('button', { name: 'Check the rows again' }).click();
  await expect(page.getByRole('status', { name: 'Check result' })).toContainText(
    '4 lines ready · 0 errors · 1 warnings',
  );
  await expect(page.getByRole('table', { name: 'Problems found' })).toContainText(
    'Cell D6 holds a formula; its last calculated value was used.',
  );
  await page.getByRole('button', { name: 'Import 4 lines' }).click();
  await expect(
    page.getByText(/Revision 1 imported: 4 lines \(4 added, 0 changed, 0 removed\); 4 solved\./),
  ).toBeVisible();
  await expect(page.locator('tr[data-tag="40-ST-102"]')).toBeVisible();
  expect(await lineCount(page, id)).toBe(4);

  // The next revision asks nothing: the answers were kept with the project's mapping.
  await page.getByLabel(FILE_LABEL).setInputFiles(file);
  await page.getByRole('button', { name: 'Read file' }).click();
  await page.getByRole('button', { name: 'Check the rows' }).click();
  await expect(page.getByRole('status', { name: 'Check result' })).toContainText('4 lines ready · 0 errors');
  await expect(page.getByRole('table', { name: 'Values to answer' })).toHaveCount(0);
});

test('a Windows-1252 semicolon CSV says how it was read and imports with decimal commas', async ({
  page,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const id = await newProject(page, 'European CSV');
  const file = join(mkdtempSync(join(tmpdir(), 'lagwise-e2e-')), 'isolierliste.csv');
  writeFileSync(file, semicolon1252Csv());
  await page.getByLabel(FILE_LABEL).setInputFiles(file);
  await page.getByRole('button', { name: 'Read file' }).click();
  await expect(page.getByLabel('How the file was read')).toHaveText(
    'Read as Windows-1252, semicolon-separated.',
  );
  await expect(page.getByLabel('Unit for Nominal size (NPS or DN)')).toHaveValue('DN');
  await page.getByRole('button', { name: 'Check the rows' }).click();
  await page.getByLabel('Meaning of Rohrbrücke (Indoor / outdoor)').selectOption('outdoor');
  await page.getByRole('button', { name: 'Check the rows again' }).click();
  await page.getByRole('button', { name: 'Import 4 lines' }).click();
  await expect(page.getByText(/Revision 1 imported: 4 lines/)).toBeVisible();
  const lines = (await (
    await page.request.get(`/api/v1/projects/${id}/lines?size=10&sort=tag&dir=asc`)
  ).json()) as { rows: { tag: string; nps: string | null }[] };
  expect(lines.rows.map((r) => r.tag)).toEqual(['F-3001', 'K-2001', 'S-1001', 'S-1002']);
});
