/**
 * Versions (issue 12): the wizard never says "Saved" while a field shows an error; autosaves
 * become versions; a version is named; two are picked and compared, the change shown in the
 * wizard's words. The versions and compare pages pass axe.
 */
import { expect, test } from '@playwright/test';
import { DesignWizardPage } from './pages/design-wizard-page';
import { WorkspacePage } from './pages/workspace-page';
import { expectNoSeriousA11yViolations as checkA11y } from './support/axe';
import { registerAndSignIn } from './support/flows';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

test('versions: name one, compare two, in the wizard’s words', async ({ page }) => {
  test.slow();
  await registerAndSignIn(page, { name: 'Priya Versions', email: uniqueEmail('versions'), password: STRONG_PASSWORD });
  const studyId = await new WorkspacePage(page).createStudyNamed('Greenhouse trial of two growing substrates', 'Versions test');
  const wizard = new DesignWizardPage(page);
  const status = page.getByRole('status').filter({ hasText: /saved|Saving/i });

  await test.step('a field with an error: the status line says Not saved, never Saved', async () => {
    await wizard.open(studyId, 'outcome');
    await page.getByLabel('Primary outcome', { exact: true }).fill('Leaf area');
    await wizard.waitSaved();
    await page.getByLabel('Number of primary outcomes').fill('0');
    await expect(status).toContainText('Not saved: fix the highlighted fields');
    await expect(status).not.toContainText('Saved ·');
    await page.getByLabel('Number of primary outcomes').fill('1');
    await wizard.waitSaved();
  });

  await test.step('the versions page: one version so far, named', async () => {
    await page.goto(`/studies/${studyId}/review/versions`);
    await expect(page.getByRole('heading', { level: 2, name: 'Versions and sign-off' })).toBeVisible();
    await expect(page.getByTestId('version-row')).toHaveCount(1);
    await checkA11y(page, 'versions page');
    await page.getByRole('button', { name: 'Name version 1' }).click();
    await page.getByLabel('Name of version 1').fill('First draft');
    await page.getByRole('button', { name: 'Save the name' }).click();
    await expect(page.getByRole('status').filter({ hasText: 'Version 1 is now called “First draft”.' })).toBeVisible();
    await expect(page.getByTestId('version-row').first()).toContainText('Version 1, “First draft”');
  });

  await test.step('an edit after naming is a new version', async () => {
    await wizard.open(studyId, 'outcome');
    await page.getByLabel('Unit', { exact: true }).fill('cm²');
    await wizard.waitSaved();
    await page.goto(`/studies/${studyId}/review/versions`);
    await expect(page.getByTestId('version-row')).toHaveCount(2);
  });

  await test.step('pick two and compare', async () => {
    await page.getByRole('checkbox', { name: 'Compare Version 1, “First draft”' }).check();
    await page.getByRole('checkbox', { name: 'Compare Version 2' }).check();
    await page.getByRole('button', { name: 'Compare the two' }).click();
    await page.waitForURL(/\/review\/compare\?from=1&to=2$/);
    const change = page.getByTestId('change');
    await expect(change).toHaveCount(1);
    await expect(change).toContainText('Unit');
    await expect(change).toContainText('not given');
    await expect(change).toContainText('cm²');
    await expect(page.getByRole('heading', { name: 'The Plan’s sample size and power' })).toBeVisible();
    await checkA11y(page, 'compare page');
  });
});
