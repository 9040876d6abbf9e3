/**
 * The design wizard on the demo's classroom design: build it step by step, see the
 * unit-of-analysis blocker with its false-positive rate, switch the planned analysis to a mixed
 * model and see it clear; reloading mid-way loses nothing; the diagram shows the levels.
 */
import { expect, test } from '@playwright/test';
import { DesignWizardPage } from './pages/design-wizard-page';
import { WorkspacePage } from './pages/workspace-page';
import { registerAndSignIn } from './support/flows';
import { expectNoSeriousA11yViolations as checkA11y } from './support/axe';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

test('classroom design: the unit-of-analysis blocker appears and clears with a mixed model', async ({ page }) => {
  test.slow();
  await registerAndSignIn(page, { name: 'Priya Wizard', email: uniqueEmail('wizard'), password: STRONG_PASSWORD });
  const studyId = await new WorkspacePage(page).createStudyNamed('Reading-support programme, randomised by classroom', 'Wizard test');
  const wizard = new DesignWizardPage(page);

  await test.step('outcome', async () => {
    await wizard.open(studyId, 'outcome');
    await page.getByLabel('Primary outcome', { exact: true }).fill('Reading score');
    await page.getByLabel('Unit', { exact: true }).fill('points');
    await page.getByLabel('Type of outcome').selectOption('continuous');
    await wizard.waitSaved();
    await checkA11y(page, 'design wizard: outcome');
  });

  await test.step('structure: classroom → pupil', async () => {
    await wizard.step('Structure');
    await page.getByRole('button', { name: 'Add a level' }).click();
    const top = wizard.level(1);
    await top.getByLabel('Name', { exact: true }).fill('Classroom');
    await top.getByLabel('Kind of level').selectOption('grouping');
    await top.getByLabel('Number in the study').fill('20');
    await page.getByRole('button', { name: 'Add a level' }).click();
    const second = wizard.level(2);
    await second.getByLabel('Name', { exact: true }).fill('Pupil');
    await second.getByLabel('Kind of level').selectOption('independent');
    await second.getByLabel('Number per Classroom').fill('25');
    await wizard.waitSaved();
    await expect(wizard.diagram).toBeVisible();
    await expect(wizard.diagram).toContainText('Classroom');
    await expect(wizard.diagram).toContainText('Pupil');
  });

  await test.step('reload mid-way loses nothing', async () => {
    await page.reload();
    await expect(wizard.level(1).getByLabel('Name', { exact: true })).toHaveValue('Classroom');
    await expect(wizard.level(2).getByLabel('Number per Classroom')).toHaveValue('25');
  });

  await test.step('assignment: classrooms are randomised', async () => {
    await wizard.step('Assignment');
    await page.getByLabel('What varies').selectOption('randomised');
    await page.getByLabel('Name of the treatment or variable').fill('Programme');
    await page.getByLabel('Level at which it is assigned').selectOption({ label: 'Classroom' });
    await page.getByRole('button', { name: 'Add an arm' }).click();
    await page.getByRole('button', { name: 'Add an arm' }).click();
    await wizard.waitSaved();
  });

  await test.step('assumptions', async () => {
    await wizard.step('Assumptions');
    await page.getByLabel(/Standard deviation of the outcome/).fill('10');
    await page.getByLabel(/Smallest important difference/).fill('3');
    await page.getByLabel(/Intracluster correlation \(ICC\) for Classroom/).fill('0.15');
    await wizard.waitSaved();
  });

  await test.step('analysis: a t-test per pupil raises the blocker with its false-positive rate', async () => {
    await wizard.step('Analysis plan');
    await page.getByLabel('Planned analysis').selectOption('t-test');
    await page.getByLabel('Unit counted as n').selectOption({ label: 'Pupil' });
    await wizard.waitSaved();
    await expect(wizard.checks).toContainText(/[1-9]\d* blockers?/);
    await page.goto(`/studies/${studyId}/checks`);
    const blocker = page.getByRole('article').filter({ hasText: 'Blocker' }).first();
    await expect(blocker).toBeVisible();
    await expect(page.getByRole('main')).toContainText(/false-positive rate/i);
    await expect(page.getByRole('main')).toContainText(/3\d(\.\d)?%/);
    await checkA11y(page, 'checks tab');
  });

  await test.step('a mixed model with a random intercept per classroom clears it', async () => {
    await wizard.open(studyId, 'analysis');
    await page.getByLabel('Planned analysis').selectOption('mixed-model');
    await page.getByRole('checkbox', { name: 'Classroom' }).check();
    await wizard.waitSaved();
    await expect(wizard.checks).toContainText('0 blockers');
    // Levels with few units can be entered as fixed effects; the option is folded away until opened.
    await page.getByText('Levels with few units as fixed effects').click();
    await expect(page.getByRole('group', { name: /as a fixed effect instead of a random intercept/ }).getByRole('checkbox', { name: 'Classroom' })).not.toBeChecked();
    await checkA11y(page, 'design wizard: analysis plan');
    await page.goto(`/studies/${studyId}/checks`);
    await expect(page.getByRole('article').filter({ hasText: 'Blocker' })).toHaveCount(0);
    await expect(page.getByRole('complementary')).toContainText('(1 | classroom)');
  });
});
