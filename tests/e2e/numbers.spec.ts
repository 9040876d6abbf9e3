/**
 * Numbers that never drift or contradict (issue 11 points 9–12), in the browser: the repeated-
 * measures headline is the exact t answer (42 per group; R 4.2.2, fixtures/generate_one_answer.R)
 * with the normal formula's 41 only in a note; a difference of 1e9 with SD 1 is answered at once
 * ("already met with 2 per group"); the budget card names one best cluster size; the sleep demo's
 * Plan says it plans on the raw scale while the analysis works on the log. Every screen passes axe.
 * With UNITWISE_SCREENSHOTS=<folder> each screen is also saved as a picture for review.
 */
import { expect, test, type Page } from '@playwright/test';
import { CLASSROOM_DESIGN, SLEEP_DESIGN } from '../../db/demo/designs';
import { CalculatorPage } from './pages/calculator-page';
import { PlanPage } from './pages/plan-page';
import { WorkspacePage } from './pages/workspace-page';
import { expectNoSeriousA11yViolations as checkA11y } from './support/axe';
import { registerAndSignIn } from './support/flows';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

async function picture(page: Page, name: string): Promise<void> {
  const folder = process.env.UNITWISE_SCREENSHOTS;
  if (folder) await page.screenshot({ path: `${folder}/${name}.png`, fullPage: true });
}

test('calculators: the exact answer leads, and an extreme difference is answered at once', async ({ page }) => {
  const calc = new CalculatorPage(page);
  await calc.goto('repeated-measures', 'Baseline and follow-up measures');
  // Sleep example: ANCOVA, 2 baselines, 6 follow-ups, ρ 0.6, δ 20, SD 60, 90% power.
  await expect(calc.answer('Sample size per group')).toHaveText('42');
  await expect(calc.result).toContainText('The published normal-approximation formula gives 41 per group');
  await picture(page, 'calculator-repeated-measures');
  await checkA11y(page, 'Repeated-measures calculator');

  await calc.goto('two-group-means', 'Two group means');
  await calc.solveFor('sample size');
  await calc.setAll({ 'Difference in means': '1000000000', 'Standard deviation': '1', Power: '0.8' });
  await expect(calc.answer('Sample size per group')).toHaveText('2');
  await expect(calc.result).toContainText('The target power of 80.0% is already met with 2 per group, the smallest allowed');
  await picture(page, 'calculator-difference-1e9');
  await checkA11y(page, 'Two group means at a difference of 1e9');

  await calc.goto('two-proportions', 'Two proportions');
  await picture(page, 'calculator-two-proportions');
  await calc.goto('optimal-allocation', 'Cluster size under a budget');
  await calc.set('Budget', '');
  await expect(calc.answer('Best whole cluster size')).toHaveText('13');
  await picture(page, 'calculator-optimal-allocation-costs-only');
});

test('Plan: one optimum on the budget card; the sleep demo says the scale it plans on', async ({ page }) => {
  test.slow();
  const workspaceId = await registerAndSignIn(page, { name: 'Nora Numbers', email: uniqueEmail('numbers'), password: STRONG_PASSWORD });
  const workspace = new WorkspacePage(page);
  const plan = new PlanPage(page);
  const sleepId = await workspace.createStudyNamed('Sleep timing and reaction time', 'Numbers test');
  await workspace.goto(workspaceId);
  const classroomId = await workspace.createStudyNamed('Reading support, randomised by classroom', 'Numbers test');

  const put = await page.request.put(`/api/v1/studies/${classroomId}/design`, { data: { baseRevision: 1, design: CLASSROOM_DESIGN } });
  expect(put.status(), await put.text()).toBe(200);
  await plan.goto(classroomId);
  const budget = page.getByRole('region', { name: 'Cluster size under a budget' });
  await budget.getByLabel(/^Cost per /).first().fill('1200');
  await budget.getByLabel('Cost per unit').fill('40');
  const summary = page.getByTestId('cost-curve-summary');
  await expect(summary).toContainText(/^The best cluster size is \d+ /);
  await expect(summary).not.toContainText('about');
  const best = (await summary.textContent())!.match(/best cluster size is (\d+)/)![1];
  await expect(budget.locator('[data-result="clusterSizeInteger"]')).toHaveText(best!);
  await picture(page, 'plan-budget-card');
  await checkA11y(page, 'plan tab with the budget card');

  const putSleep = await page.request.put(`/api/v1/studies/${sleepId}/design`, { data: { baseRevision: 1, design: SLEEP_DESIGN } });
  expect(putSleep.status(), await putSleep.text()).toBe(200);
  await plan.goto(sleepId);
  await expect(page.getByRole('main')).toContainText('The recommended analysis works on log(reaction time); this calculation plans on the raw scale (ms)');
  await picture(page, 'plan-sleep-scale-note');
  await checkA11y(page, 'plan tab of the sleep demo');
});
