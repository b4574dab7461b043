import { expect, test } from './fixtures';
import { createProjectWithLines, demo, lineRow, signIn } from './helpers';

test('an engineer adds a project material with its data; a bad table line is named; the specification can then choose it; a reviewer only reads', async ({
  page,
  browser,
}) => {
  await signIn(page, demo('engineer').email, demo('engineer').password);
  const projectId = await createProjectWithLines(page, 'E2E own materials', [lineRow('OM-1', '4', 200, 'H')]);
  await page.goto(`/projects/${projectId}/design-basis`);
  const form = page.getByRole('form', { name: 'Add a project material' });
  await form.getByLabel('Name', { exact: true }).fill('Scenario microporous section');
  await form.getByLabel(/Conductivity: mean °C/).fill('50, 0.021\n150 0,024 x\n300, 0.030');
  await form.getByLabel('Lowest service °C').fill('-50');
  await form.getByLabel('Highest service °C').fill('650');
  await form.getByLabel('Density kg/m³').fill('250');
  await form.getByLabel('Thicknesses sold, mm').fill('20, 30, 40, 50, 60');
  await form.getByLabel('Source of the data').fill('Scenario data sheet rev 1');
  await form.getByRole('button', { name: 'Add material' }).click();
  await expect(form.getByText('Conductivity table, line 2 ("150 0,024 x")')).toBeVisible();
  await expect(form.getByText('Nothing was saved.')).toBeVisible();
  // The typed values are still there; fix the one line.
  await expect(form.getByLabel('Name', { exact: true })).toHaveValue('Scenario microporous section');
  await form.getByLabel(/Conductivity: mean °C/).fill('50, 0.021\n150, 0.024\n300, 0.030');
  await form.getByRole('button', { name: 'Add material' }).click();
  await expect(form.getByRole('status')).toContainText('Material added.');
  const table = page.getByRole('table', { name: 'Project materials' });
  await expect(table.getByRole('row', { name: /Scenario microporous section/ })).toContainText(
    '0.021 at 50 °C … 0.03 at 300 °C (3 points)',
  );
  await expect(table).toContainText('Scenario data sheet rev 1');
  // Change it in place: the form fills with its values and saves under the same id.
  await table.getByRole('button', { name: 'Change Scenario microporous section' }).click();
  const edit = page.getByRole('form', { name: 'Change a project material' });
  await expect(edit.getByLabel(/Conductivity: mean °C/)).toHaveValue('50, 0.021\n150, 0.024\n300, 0.03');
  await edit.getByLabel('Source of the data').fill('Scenario data sheet rev 2');
  await edit.getByRole('button', { name: 'Save changes' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Material changed.' })).toBeVisible();
  await expect(table.getByRole('row', { name: /Scenario microporous section/ })).toContainText(
    'Scenario data sheet rev 2',
  );
  await expect(table.getByRole('row')).toHaveCount(2); // header + the one material
  // The specification bands offer it.
  await page.reload();
  await expect(
    page
      .getByLabel('Band 3 material')
      .locator('option', { hasText: 'Scenario microporous section (project)' }),
  ).toHaveCount(1);
  await page.screenshot({ path: 'test-results/own-materials.png', fullPage: true });

  const ctx = await browser.newContext();
  const reviewer = await ctx.newPage();
  await signIn(reviewer, demo('reviewer').email, demo('reviewer').password);
  await reviewer.goto(`/projects/${projectId}/design-basis`);
  await expect(reviewer.getByRole('table', { name: 'Project materials' })).toContainText(
    'Scenario microporous section',
  );
  await expect(reviewer.getByRole('form', { name: 'Add a project material' })).toHaveCount(0);
  await expect(reviewer.getByRole('button', { name: /Remove/ })).toHaveCount(0);
  await ctx.close();
});
