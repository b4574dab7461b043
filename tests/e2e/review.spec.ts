import { expect, test } from './fixtures';
import { createProjectWithLines, demo, lineRow, mailLink, signIn } from './helpers';

test('engineer requests a review, the reviewer gets the e-mail, disposes and signs off, the engineer sees the outcome', async ({
  page,
  browser,
}) => {
  const eng = demo('engineer');
  await signIn(page, eng.email, eng.password);
  const id = await createProjectWithLines(page, 'Review walk', [
    lineRow('RW-1', '4', 220, 'H'),
    lineRow('RW-2', '2', 160, 'H'),
    lineRow('RW-3', '3', 240, 'H', { Accessible: 'no' }),
  ]);
  // Nothing decided yet: the two accessible hot lines count as bare and are flagged; the inaccessible one is not.
  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Safety review' })
    .click();
  await expect(page.getByRole('heading', { name: 'Flagged now: 2 lines' })).toBeVisible();
  await page.getByLabel('Note to the reviewer').fill('Before the walkdown on Friday');
  const requestedAt = new Date(Date.now() - 2000);
  await page.getByRole('button', { name: 'Request a review of the flagged lines' }).click();
  await expect(
    page
      .getByRole('status')
      .filter({ hasText: /Round 1 requested for 2 lines; 1 reviewer notified by e-mail\./ }),
  ).toBeVisible();

  const ctx = await browser.newContext();
  const rp = await ctx.newPage();
  const rev = demo('reviewer');
  await signIn(rp, rev.email, rev.password);
  // The e-mail links to the round itself.
  const mail = await mailLink(
    rev.email,
    /Safety review requested: .* round 1 \(2 lines\)/,
    'Open review round 1',
    { after: requestedAt },
  );
  expect(mail.text).toContain('Surface over the touch limit: 2');
  expect(mail.url).toMatch(new RegExp(`/projects/${id}/review/[0-9a-f-]{36}$`));
  await rp.goto(mail.url);
  await expect(rp.getByRole('heading', { level: 1, name: 'Review round 1' })).toBeVisible();
  await expect(rp.getByTestId('queue-counts')).toHaveText('2 lines · 2 open · 0 decided · 0 re-opened');
  await expect(rp.locator('tr[data-tag="RW-1"]')).toContainText(
    /Surface \d+\.\d °C over the 56 °C touch limit \(bare\)/,
  );

  // Acceptance without a comment is refused.
  await rp.getByLabel('Disposition', { exact: true }).selectOption('guard');
  await rp.getByLabel('Select RW-1').check();
  await rp.getByRole('button', { name: 'Apply to 1 selected' }).click();
  await expect(
    rp.getByRole('alert').filter({ hasText: 'A comment is required for this disposition.' }),
  ).toBeVisible();
  await rp.getByLabel('Comment (required to accept or return)').fill('Mesh guard at the platform');
  await rp.getByRole('button', { name: 'Apply to 1 selected' }).click();
  await expect(rp.getByTestId('queue-counts')).toHaveText('2 lines · 1 open · 1 decided · 0 re-opened');
  // Sign-off with an open line is refused.
  await rp.getByRole('button', { name: 'Sign off the round' }).click();
  await expect(rp.getByRole('alert').filter({ hasText: '1 line is not decided yet (RW-2)' })).toBeVisible();
  await rp.getByLabel('Disposition', { exact: true }).selectOption('warning-sign');
  await rp.getByLabel('Comment (required to accept or return)').fill('Hot-surface signs at the ladder');
  await rp.getByLabel('Status').selectOption('open');
  await rp.getByRole('button', { name: 'Apply to all 1 shown' }).click();
  await expect(rp.getByTestId('queue-counts')).toHaveText('2 lines · 0 open · 2 decided · 0 re-opened');
  await rp.getByRole('button', { name: 'Sign off the round' }).click();
  await expect(rp.getByText(/^Signed off \d{4}-/)).toBeVisible();
  await ctx.close();

  // The engineer sees the outcome and the printable report lists exactly the flagged lines.
  await page.goto(`/projects/${id}/review`);
  await expect(page.getByRole('table', { name: 'Review rounds' })).toContainText('signed off');
  const signedMail = await mailLink(
    demo('engineer').email,
    /review round 1 signed off/,
    'Open the review report',
    { after: requestedAt },
  );
  expect(signedMail.url).toContain(`/projects/${id}/review/`);
  await page.goto(`/projects/${id}/review`);
  await page.getByRole('link', { name: 'Report', exact: true }).click();
  await expect(page.getByTestId('signoff')).toContainText('Signed off by Mira Castell');
  const report = page.getByRole('table', { name: 'Flagged surfaces' });
  // A row per flag: RW-1 over the touch limit; RW-2 (160–170 °C) over it and in the carbon-steel
  // corrosion-under-insulation window (to 175 °C), which new projects flag for review.
  await expect(report.locator('tr[data-tag]')).toHaveCount(3);
  await expect(report.locator('tr[data-tag="RW-1"]')).toContainText('Guard or cage');
  await expect(report.locator('tr[data-tag="RW-2"]').first()).toContainText(
    'Warning sign and restricted access',
  );
  await expect(report.locator('tr[data-tag="RW-2"]').nth(1)).toContainText(
    'Corrosion-under-insulation window',
  );
  await expect(report.locator('tr[data-tag="RW-3"]')).toHaveCount(0);
  await expect(page.getByText('Final decisions follow local codes and a qualified person.')).toBeVisible();
});

test('the demo reviewer finds a signed-off round and one in progress; an engineer cannot dispose', async ({
  page,
}) => {
  const eng = demo('engineer');
  await signIn(page, eng.email, eng.password);
  await page.getByRole('link', { name: 'Brack Point steam network upgrade' }).click();
  await page
    .getByRole('navigation', { name: 'Project' })
    .getByRole('link', { name: 'Safety review' })
    .click();
  const rounds = page.getByRole('table', { name: 'Review rounds' });
  await expect(rounds).toContainText('signed off');
  await expect(rounds).toContainText('open');
  await rounds.getByRole('link', { name: 'Round 2' }).click();
  await expect(page.getByTestId('queue-counts')).toContainText('decided');
  await expect(page.getByRole('button', { name: 'Sign off the round' })).toHaveCount(0);
  await expect(page.getByLabel('Disposition', { exact: true })).toHaveCount(0);
});
