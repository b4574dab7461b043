import { expect, test } from './fixtures';
import { createProjectWithLines, demo, lineRow, signIn } from './helpers';

test('engineer: bulk accept states its counts for the filter shown, leaves a manual pick alone, and is undone', async ({
  page,
}) => {
  test.slow(); // a whole flow: a project, an import, a pick, two previews, an accept, an undo and a reload
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  await createProjectWithLines(page, 'Bulk accept check', [
    lineRow('N-101', '4', 180, 'H,P', { Area: 'North' }),
    lineRow('N-102', '3', 150, 'H,P', { Area: 'North' }),
    lineRow('N-103', '2', 120, 'H,P', { Area: 'North' }),
    lineRow('S-201', '4', 180, 'H,P', { Area: 'South' }),
  ]);
  await page.reload(); // the area filter lists the imported areas
  const row = (tag: string) => page.locator(`tr[data-tag="${tag}"]`);
  // The cell shows the thickness with its unit ("80 mm"); the picker's option values are millimetres.
  const recommended = async (tag: string) =>
    String(parseFloat(await row(tag).locator('td').nth(5).innerText()));

  // A manual pick on N-102: one size up, with its reason.
  const picker = page.getByLabel('Thickness for N-102');
  await picker.focus(); // opening the picker loads its thickness options
  await expect(picker.locator('option[value="0"]')).toBeAttached(); // the candidates have arrived
  const options = await picker
    .locator('option')
    .evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value));
  const manual = options[options.indexOf(await recommended('N-102')) + 1];
  await picker.selectOption(manual);
  await page.getByLabel('Reason for N-102').fill('Matches the adjacent header');
  await page.getByRole('button', { name: 'Save' }).click();
  await expect(row('N-102').getByText('manual')).toBeVisible();

  const button = page.getByRole('button', { name: 'Accept recommendation for the filtered lines' });
  const dialog = page.getByRole('dialog', { name: 'Accept the recommendation for the filtered lines?' });
  const leftAlone = dialog.getByRole('list', { name: 'Lines left alone' });

  // Status "Manual pick" shows N-102 alone: the button would change nothing.
  await page.getByLabel('Status', { exact: true }).selectOption('overridden');
  await expect(page.locator('tr[data-tag]')).toHaveCount(1);
  await button.click();
  await expect(dialog.locator('#bulk-accept-counts')).toHaveText(
    'Nothing would change: the 1 line shown is left alone.',
  );
  await expect(leftAlone).toHaveText('1 manual pick');
  await dialog.getByRole('button', { name: 'Close' }).click();
  await expect(dialog).toBeHidden();

  // Area North, any status: two lines change, the manual pick is left alone.
  await page.getByLabel('Status', { exact: true }).selectOption('');
  await page.getByRole('combobox', { name: 'Area', exact: true }).selectOption('North');
  await expect(page.locator('tr[data-tag]')).toHaveCount(3);
  const rec101 = await recommended('N-101');
  await button.click();
  await expect(dialog).toContainText('Lines shown: area North.');
  await expect(dialog.locator('#bulk-accept-counts')).toHaveText(
    'This changes 2 lines and leaves 1 line alone.',
  );
  await expect(dialog.getByRole('list', { name: 'Lines that change' })).toHaveText(
    '2 lines without a decision get the recommendation',
  );
  await expect(leftAlone).toHaveText('1 manual pick');
  await dialog.getByRole('button', { name: 'Accept for 2 lines' }).click();
  await expect(dialog).toBeHidden();
  await expect(page.getByRole('status').filter({ hasText: 'Recommendation accepted' })).toHaveText(
    'Recommendation accepted for 2 lines; 1 line left alone.',
  );
  await expect(page.getByLabel('Thickness for N-101')).toHaveValue(rec101);
  await expect(page.getByLabel('Thickness for N-103')).not.toHaveValue('');
  await expect(page.getByLabel('Thickness for N-102')).toHaveValue(manual);
  await expect(row('N-102').getByText('manual')).toBeVisible();

  // Undo, offered right after: the two lines are undecided again, the manual pick as it was.
  const undo = page.getByRole('button', { name: 'Undo' });
  await expect(undo).toBeFocused();
  await undo.click();
  await expect(page.getByRole('status').filter({ hasText: 'undone' })).toHaveText(
    'Bulk accept undone: 2 lines have their previous decision back.',
  );
  await expect(undo).toHaveCount(0);
  await expect(page.getByLabel('Thickness for N-101')).toHaveValue('');
  await expect(row('N-101').getByText('undecided')).toBeVisible();
  await expect(page.getByLabel('Thickness for N-102')).toHaveValue(manual);

  // As stored: after a reload, every line but the manual pick is undecided (South was never in the filter).
  await page.reload();
  await page.getByLabel('Status', { exact: true }).selectOption('undecided');
  await expect(page.locator('tr[data-tag]')).toHaveCount(3);
  await expect(page.locator('tr[data-tag]')).toHaveText([/N-101/, /N-103/, /S-201/]);
  await page.getByLabel('Status', { exact: true }).selectOption('overridden');
  await expect(page.locator('tr[data-tag]')).toHaveCount(1);
  await expect(page.getByLabel('Thickness for N-102')).toHaveValue(manual);
});
