import { expect, test } from './fixtures';
import { createProjectWithLines, demo, signIn } from './helpers';
import { TEMPLATE_EXAMPLE_ROWS } from '../../lib/lines/template';

test('engineer: a vessel picked part by part — the bottom head thicker than the shell — and the bill lists each part', async ({
  page,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  // The demo plant's devolatiliser (56 m², 8 m shell, 245/260 °C, personnel protection).
  const v3020 = TEMPLATE_EXAMPLE_ROWS.find((r) => r[0] === 'V-3020')!;
  const id = await createProjectWithLines(page, 'Vessel parts check', [v3020]);
  await page.goto(`/projects/${id}/lines`);
  await page.getByRole('link', { name: 'V-3020', exact: true }).click();

  // Each part's own thickness, as the engine decided it.
  const parts = page.getByRole('table', { name: 'Vessel parts' });
  const mmOf = async (part: string) =>
    Number.parseFloat(await parts.locator(`tr[data-part="${part}"] td`).nth(1).innerText());
  const shell = await mmOf('shell'),
    top = await mmOf('top'),
    bottom = await mmOf('bottom');
  expect(bottom).toBeGreaterThan(shell);

  const form = page.getByRole('form', { name: 'Choose per part' });
  await form.getByLabel('Shell thickness').selectOption(String(shell));
  await form.getByLabel('Top head thickness').selectOption(String(top));
  // A bottom head left at the shell's thickness without a reason is refused, naming the part.
  await form.getByLabel('Bottom head thickness').selectOption(String(shell));
  await form.getByRole('button', { name: 'Save parts' }).click();
  await expect(form.getByRole('alert')).toContainText(
    'The bottom head is below what personnel requires; give a reason to keep it.',
  );
  await form.getByLabel('Bottom head thickness').selectOption(String(bottom));
  await form.getByRole('button', { name: 'Save parts' }).click();
  const words = `shell ${shell} mm${top !== shell ? ` · top head ${top} mm` : ''} · bottom head ${bottom} mm`;
  await expect(form.getByRole('status')).toHaveText(`Saved: ${words}.`);
  await expect(page.getByTestId('chosen-design')).toContainText(
    `shell ${shell} mm · top head ${top} mm · bottom head ${bottom} mm`,
  );
  await expect(page.getByTestId('chosen-design')).toContainText('recommendation accepted');
  await expect(parts.locator('tr[data-part="bottom"]')).toContainText(`${bottom} mm`);

  // The line table says it in words.
  await page.goto(`/projects/${id}/lines`);
  await expect(page.getByTestId('chosen-parts')).toContainText(words);

  // The bill: the vessel's shell and heads at their own thicknesses.
  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Bill of quantities' })
    .click();
  const row = page.getByRole('table', { name: 'Vessels in the next issue' }).locator('tr[data-tag="V-3020"]');
  await expect(row).toContainText(`shell ${shell} mm:`);
  await expect(row).toContainText(`top head ${top} mm:`);
  await expect(row).toContainText(`bottom head ${bottom} mm:`);
  await expect(row).toContainText('counted');
});
