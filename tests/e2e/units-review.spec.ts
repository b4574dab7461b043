import { expect, test, type Page } from './fixtures';
import { mkdirSync } from 'node:fs';
import { createProjectWithLines, demo, lineRow, mailLink, signIn, solveStaleLines } from './helpers';

const SHOTS = '.data/reports/screens';
mkdirSync(SHOTS, { recursive: true });

/** The recommended candidate (★) of a line's picker: its value (mm) and its label. */
async function recommendedOption(page: Page, tag: string) {
  const select = page.getByLabel(`Thickness for ${tag}`);
  await select.focus(); // opening the picker loads every thickness option with its deciding numbers
  await expect(select.locator('option[value="0"]')).toBeAttached();
  await expect(select.locator('option', { hasText: '★' })).toHaveCount(1);
  const opt = select.locator('option', { hasText: '★' });
  return { select, value: (await opt.getAttribute('value'))!, label: (await opt.textContent())! };
}

test('a US-units project shows inches, °F, Btu/h·ft and its currency on the line page, picker, budget and bill', async ({
  page,
}) => {
  const eng = demo('engineer');
  await signIn(page, eng.email, eng.password);
  // 220 °C = 428 °F, 40 m = 131 ft (÷ 0.3048), the fixed touch limit 60 °C = 140 °F, the 5 s contact limit on metal 56 °C = 132.8 °F: exact conversions (NIST SP 811).
  const id = await createProjectWithLines(page, 'US units walk', [
    lineRow('US-1', '4', 220, 'H,P'),
    lineRow('US-2', '2', 160, 'H,P'),
  ]);

  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Design basis' }).click();
  const rev0 = Number((await page.getByTestId('basis-revision').innerText()).replace(/\D/g, ''));
  await page.getByLabel('Units for display').selectOption('US');
  await page.getByLabel('Nominal thicknesses').selectOption('inch');
  await page.getByLabel('Currency').selectOption('USD');
  await page.getByRole('button', { name: 'Save design basis' }).click();
  await expect(
    page.getByRole('status').filter({ hasText: `Saved as design-basis revision ${rev0 + 1}.` }),
  ).toBeVisible();
  // The form now speaks the project's units: 60 °C shows as 140 °F, the 2 K dew-point margin as 3.6 °F.
  await page.reload();
  await expect(page.getByLabel('Fixed limit, metal jacket °F')).toHaveValue('140');
  await expect(page.getByLabel('Touch limit set by')).toHaveValue('contact-time');
  await expect(page.getByLabel('Contact time, s')).toHaveValue('5');
  await expect(page.getByLabel('Dew-point margin °F')).toHaveValue('3.6');
  // Saving unchanged values converts back to the same SI numbers: no new revision.
  await page.getByRole('button', { name: 'Save design basis' }).click();
  await expect(
    page.getByRole('status').filter({ hasText: `Saved as design-basis revision ${rev0 + 1}.` }),
  ).toBeVisible();
  await expect(page.getByTestId('basis-revision')).toHaveText(`Revision ${rev0 + 1}`);

  await page.getByRole('navigation', { name: 'Project' }).getByRole('link', { name: 'Line list' }).click();
  await solveStaleLines(page, 2);
  const row = page.locator('tr[data-tag="US-1"]');
  await expect(row.locator('td').nth(4)).toHaveText('428.0');
  await expect(page.getByRole('columnheader', { name: /T °F/ })).toBeVisible();
  await expect(row).toContainText('Btu/h·ft');
  // The inch series in fractions of an inch, never "38.1 mm" or float noise.
  const rec = (await row.locator('td').nth(5).innerText()).trim();
  expect(rec).toMatch(/^(\d+|\d+-\d+\/\d+|\d+\/\d+)"$/);
  // The picker: each candidate with the personnel surface temperature beside the 132.8 °F touch limit (ISO 13732-1, bare metal at 5 s).
  const { select, value, label } = await recommendedOption(page, 'US-1');
  expect(label).toContain(`${rec} ★`);
  expect(label).toMatch(/personnel \d+\.\d °F \(limit 132\.8 °F\)/);
  expect(label).toMatch(/heat loss \d+\.\d °F, [\d.,]+ Btu\/h·ft/);
  const bare = select.locator('option[value="0"]');
  const bareText = (await bare.textContent())!;
  const barePersonnelF = Number(/personnel ([\d.]+) °F/.exec(bareText)![1]);
  expect(barePersonnelF).toBeGreaterThan(140); // a bare 428 °F line is far over the touch limit
  await select.selectOption(value);
  await expect(page.getByTestId('deciding-US-1')).toContainText(/personnel \d+\.\d °F \(limit 132\.8 °F\)/);
  await page.screenshot({ path: `${SHOTS}/picker-us.png`, fullPage: false });
  await row.getByRole('button', { name: 'Save' }).click();
  await expect(row.getByText('undecided')).toHaveCount(0);
  // Worst margin at the chosen thickness: the touch limit minus the personnel temperature, in °F.
  await expect(row.locator('td').nth(9)).toHaveText(/^\+\d+\.\d °F personnel$/);

  await row.getByRole('link', { name: 'US-1' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'US-1' })).toBeVisible();
  await expect(page.getByText('428.0 °F / 446.0 °F')).toBeVisible();
  await expect(page.getByText('131 ft', { exact: true })).toBeVisible();
  await expect(page.getByTestId('recommended')).toHaveText(rec);
  await expect(page.getByTestId('rec-personnel')).toHaveText(/^\d+\.\d °F \(limit 132\.8 °F\)$/);
  const cands = page.getByRole('table', { name: 'Candidates' });
  await expect(
    cands.getByRole('columnheader', { name: 'Surface (personnel) · limit 132.8 °F' }),
  ).toBeVisible();
  await expect(cands.locator(`tr[data-mm="${value}"]`)).toContainText(`${rec} ★`);
  await expect(cands.locator('tr[data-mm="0"] td').nth(3)).toHaveText(`${barePersonnelF.toFixed(1)} °F`);
  await expect(page.getByText(/Annual energy \/ cost \/ CO₂/)).toBeVisible();
  await expect(page.locator('dd', { hasText: /MMBtu · USD [\d,]+ ·/ })).toBeVisible();
  await expect(
    page.locator('dd', { hasText: /^[\d.,]+ Btu\/h·ft · [\d,]+ Btu\/h for the line/ }),
  ).toBeVisible();
  // The record shows readable changes, no raw JSON.
  const audit = page.getByRole('table', { name: 'Audit trail' });
  await expect(audit).toContainText(`thickness: ${rec}`);
  await expect(audit).not.toContainText('{"');
  await page.screenshot({ path: `${SHOTS}/line-page-us.png`, fullPage: true });

  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Heat-loss budget' })
    .click();
  const totals = page.getByRole('table', { name: 'Totals' });
  await expect(totals.getByRole('columnheader', { name: 'Cost per year (USD)' })).toBeVisible();
  await expect(totals.locator('tr', { hasText: 'Designed' })).toContainText(/[\d,]+ Btu\/h/);
  await expect(totals.locator('tr', { hasText: 'Designed' })).toContainText(/USD [\d,]+/);
  await expect(totals.locator('tr', { hasText: 'Designed' })).toContainText(/MMBtu/);

  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Bill of quantities' })
    .click();
  await page.getByRole('button', { name: 'Issue revision 1' }).click();
  // Issued by a background job; the page follows it and then shows the issue.
  await expect(
    page.getByRole('status').filter({ hasText: /^Issue 1 issued: \d+ lines counted, \d+ pending\.$/ }),
  ).toBeVisible({ timeout: 60_000 });
  const summary = page.getByRole('table', { name: 'Material summary' });
  await expect(summary).toContainText(`${rec}`);
  await expect(summary).toContainText(/[\d,]+ ft/);
  await expect(summary).toContainText(/[\d.,]+ ft³/);
  await expect(page.getByTestId('bill-material-cost')).toContainText(/USD [\d,]+/);
  expect(id).toBeTruthy();
});

test('dispositions fit the hazard and a second review round carries over unchanged decisions', async ({
  page,
  browser,
}) => {
  const eng = demo('engineer');
  await signIn(page, eng.email, eng.password);
  const id = await createProjectWithLines(page, 'Carry-over walk', [
    lineRow('CW-H', '4', 220, 'H'),
    lineRow('CW-C', '2', 5, 'C'),
  ]);
  // The SI picker, for the screenshot: °C and mm, the personnel temperature beside its 56 °C limit (5 s contact, bare metal).
  const { label } = await recommendedOption(page, 'CW-H');
  expect(label).toMatch(/personnel \d+\.\d °C \(limit 60\.0 °C\)/);
  const cLabel = (await recommendedOption(page, 'CW-C')).label;
  expect(cLabel).toMatch(/condensation \d+\.\d °C \(min \d+\.\d °C\)/);
  await page.screenshot({ path: `${SHOTS}/picker-si.png` });
  await page.locator('tr[data-tag="CW-H"]').getByRole('link', { name: 'CW-H' }).click();
  await expect(
    page
      .getByRole('table', { name: 'Candidates' })
      .getByRole('columnheader', { name: 'Surface (personnel) · limit 56.0 °C' }),
  ).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/line-page-si.png`, fullPage: true });

  await page.goto(`/projects/${id}/review`);
  const asked1 = new Date(Date.now() - 2000);
  await page.getByRole('button', { name: 'Request a review of the flagged lines' }).click();
  await expect(
    page.getByRole('status').filter({ hasText: /Round 1 requested for 2 lines; 1 reviewer notified/ }),
  ).toBeVisible();

  const ctx = await browser.newContext();
  const rp = await ctx.newPage();
  const rev = demo('reviewer');
  await signIn(rp, rev.email, rev.password);
  const m1 = await mailLink(
    rev.email,
    /Safety review requested: .* round 1 \(2 lines\)/,
    'Open review round 1',
    { after: asked1 },
  );
  await rp.goto(m1.url);
  await expect(rp.getByRole('heading', { level: 1, name: 'Review round 1' })).toBeVisible();
  // Sweating lines get the sweat list; a warning sign is not offered.
  await rp.getByLabel('Flag', { exact: true }).selectOption('sweating');
  const disp = rp.getByLabel('Disposition', { exact: true });
  await expect(disp.locator('option')).toHaveText([
    'Choose…',
    'Insulate for protection (back to the engineer with the thickness)',
    'Repair or seal the vapour retarder',
    'Accepted with drip protection (drip tray or drain)',
    'Returned to the engineer',
  ]);
  await disp.selectOption('drip-protection');
  await rp.getByLabel('Comment (required to accept or return)').fill('Drip tray under the chiller header');
  await rp.getByRole('button', { name: 'Apply to all 1 shown' }).click();
  await expect(rp.getByTestId('queue-counts')).toHaveText('2 lines · 1 open · 1 decided · 0 re-opened');
  await rp.getByLabel('Flag', { exact: true }).selectOption('hot-surface');
  await expect(disp.locator('option')).toHaveText([
    'Choose…',
    'Insulate for protection (back to the engineer with the thickness)',
    'Guard or cage (stand-off shield)',
    'Warning sign and restricted access',
    'Accepted as not accessible (out of reach in operation)',
    'Returned to the engineer',
  ]);
  await disp.selectOption('guard');
  await rp.getByLabel('Comment (required to accept or return)').fill('Mesh guard at the walkway');
  await rp.getByRole('button', { name: 'Apply to all 1 shown' }).click();
  await expect(rp.getByTestId('queue-counts')).toHaveText('2 lines · 0 open · 2 decided · 0 re-opened');
  await rp.getByRole('button', { name: 'Sign off the round' }).click();
  await expect(rp.getByText(/^Signed off \d{4}-/)).toBeVisible();

  // Nothing changed on either line: round 2 starts with both decisions carried over, and says so.
  await page.goto(`/projects/${id}/review`);
  const asked2 = new Date(Date.now() - 2000);
  await page.getByRole('button', { name: 'Request a review of the flagged lines' }).click();
  await expect(
    page.getByRole('status').filter({
      hasText: 'Round 2 requested for 2 lines (2 decisions carried over: line, design and flags unchanged)',
    }),
  ).toBeVisible();
  const m2 = await mailLink(
    rev.email,
    /Safety review requested: .* round 2 \(2 lines\)/,
    'Open review round 2',
    { after: asked2 },
  );
  expect(m2.text).toContain(
    '2 decisions carried over from earlier signed-off rounds (line, design and flags unchanged); 0 to decide.',
  );
  await rp.goto(m2.url);
  await expect(rp.getByRole('heading', { level: 1, name: 'Review round 2' })).toBeVisible();
  await expect(rp.getByTestId('queue-counts')).toHaveText('2 lines · 0 open · 2 decided · 0 re-opened');
  await expect(rp.getByTestId('carried-summary')).toContainText(
    '2 decisions carried over from earlier signed-off rounds',
  );
  await expect(rp.locator('tr[data-tag="CW-C"]')).toContainText(
    'Accepted with drip protection (drip tray or drain)',
  );
  await expect(rp.getByTestId('carried-CW-C')).toHaveText(
    'Carried over from round 1: line, design and flags unchanged.',
  );
  await expect(rp.getByTestId('carried-CW-H')).toHaveText(
    'Carried over from round 1: line, design and flags unchanged.',
  );
  await ctx.close();
});
