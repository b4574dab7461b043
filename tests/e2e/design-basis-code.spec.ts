import { expect, test } from './fixtures';
import { createProjectWithLines, demo, lineRow, signIn, solveStaleLines } from './helpers';

test('an engineer turns on the energy code and leaves valves bare: the line page shows the code minimum and the fittings in the heat loss', async ({
  page,
}) => {
  test.slow(); // a project with an import, a basis save and a solve
  await signIn(page, demo('engineer').email, demo('engineer').password);
  const id = await createProjectWithLines(page, 'E2E energy code', [
    lineRow('EC-1', '2', 120, 'H', { Valves: 2, Flanges: 3, Elbows: 4 }),
  ]);
  await page.goto(`/projects/${id}/design-basis`);
  await page.getByLabel('Energy code').selectOption('ashrae-90.1');
  await page.getByLabel('Valves and flanges are left bare').check();
  await page.getByRole('button', { name: 'Save design basis' }).click();
  await expect(page.getByRole('status')).toContainText('Saved as design-basis revision 2');
  await page.goto(`/projects/${id}/lines`);
  await solveStaleLines(page, 1);
  await page.locator('table a[href*="/lines/"]', { hasText: 'EC-1' }).click();
  // 120 °C is 248 °F: ASHRAE 90.1 Table 6.8.3-1 asks 2.5 in (63.5 mm) on NPS 2.
  await expect(
    page.locator('li', { hasText: /ASHRAE 90\.1 Table 6\.8\.3-1: 2\.5 in \(63\.5 mm\)/ }),
  ).toBeVisible();
  await expect(page.getByTestId('fittings-heat')).toContainText('4 elbows, 0 tees, 2 valves, 3 flanges');
  await expect(page.getByTestId('fittings-heat')).toContainText('valves and flanges bare');
});
