import { expect, test } from './fixtures';
import { createProjectWithLines, demo, lineRow, signIn, solveStaleLines } from './helpers';

test('an engineer turns on ASHRAE 90.1 and sees a decided line fail it; the budget splits straight runs and fittings and shows the heat-tracing kW', async ({
  page,
}) => {
  test.slow(); // a project with an import, a bulk accept, a basis save, a solve and four pages
  await signIn(page, demo('engineer').email, demo('engineer').password);
  const id = await createProjectWithLines(page, 'E2E code and tracing', [
    // 180 °C (356 °F) on NPS 4: ASHRAE 90.1 Table 6.8.3-1 asks 5 in (127 mm), more than the economic choice.
    lineRow('CT-1', '4', 180, 'H,P', { 'Length (m)': 60, Elbows: 4, Valves: 2, Flanges: 2 }),
    // A process line marked traced in the line list: held at its 60 °C (140 °F: 1.5 in on NPS 2).
    lineRow('CT-2', '2', 60, 'T,H', { 'Length (m)': 40, Elbows: 2, 'Heat tracing': 'yes' }),
  ]);

  // Decide both lines on the recommendation before any energy code applies.
  await page.getByRole('button', { name: 'Accept recommendation for the filtered lines' }).click();
  const dialog = page.getByRole('dialog', { name: 'Accept the recommendation for the filtered lines?' });
  await dialog.getByRole('button', { name: 'Accept for 2 lines' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Recommendation accepted' })).toContainText(
    'Recommendation accepted for 2 lines',
  );

  await page.goto(`/projects/${id}/design-basis`);
  await page.getByLabel('Energy code').selectOption('ashrae-90.1');
  await page.getByRole('button', { name: 'Save design basis' }).click();
  await expect(page.getByRole('status')).toContainText('Saved as design-basis revision 2');
  await page.goto(`/projects/${id}/lines`);
  await solveStaleLines(page, 2);

  // CT-1's accepted thickness is now below the code minimum; CT-2's is not.
  await page.locator('table a[href*="/lines/"]', { hasText: 'CT-1' }).click();
  await expect(page.getByTestId('energy-code-fail')).toContainText(
    'Fails the energy code: ASHRAE 90.1 Table 6.8.3-1: 5.0 in (127.0 mm).',
  );
  await page.goto(`/projects/${id}/lines`);
  await page.locator('table a[href*="/lines/"]', { hasText: 'CT-2' }).click();
  await expect(page.getByRole('heading', { level: 2, name: /Heat tracing/ })).toBeVisible();
  await expect(page.getByTestId('energy-code-fail')).toHaveCount(0);
  const tracing = page.getByTestId('tracing');
  await expect(tracing).toContainText('IEEE 515 / IEC/IEEE 60079-30-2 sizing basis');
  await expect(tracing).toContainText('marked traced in the line list');
  await expect(tracing).toContainText('60.0 °C in'); // a process line holds its normal temperature
  const required = (await page.getByTestId('tracing-required').innerText()).trim();
  expect(required).toMatch(
    /^[\d.]+ W\/m \(safety factor 1\.2, fittings spread over the run\) · [\d.]+ kW for the line$/,
  );
  const lineKW = required.match(/· ([\d.]+ kW) for the line/)![1];

  await page.goto(`/projects/${id}/budget`);
  // Straight runs + fittings and supports = the designed total.
  const split = (await page.getByTestId('fittings-split').innerText()).trim();
  const m = split.match(
    /^Designed: ([\d.]+) kW straight runs \+ ([\d.]+) kW fittings and supports = ([\d.]+) kW/,
  );
  expect(m, split).not.toBeNull();
  const [straight, fittings, total] = m!.slice(1).map(Number);
  expect(fittings).toBeGreaterThan(0);
  expect(Math.abs(straight + fittings - total)).toBeLessThanOrEqual(0.011 * Math.max(1, total)); // 3 significant figures each
  // Heat tracing: the one traced line's duty, by area.
  await expect(page.getByTestId('tracing-total')).toContainText(`1 traced line: ${lineKW} electrical`);
  await expect(
    page.getByRole('table', { name: 'Heat tracing by area' }).locator('tr[data-tracing-area="E2E"]'),
  ).toContainText(lineKW);
});
