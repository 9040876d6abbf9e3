/**
 * Our own presentation (issue 11 point 15), in the browser: the allocation between groups is
 * "units in the second group for each one in the first" with its shares; a result lists its
 * inputs grouped by where they came from, without short symbols; a baseline-and-follow-up answer
 * shows its three analyses side by side with ANCOVA recommended, no option to pick; the budget
 * card lists candidate cluster sizes with the cost and the power of each. Each screen passes axe
 * at 390 and 1366 px. With UNITWISE_SCREENSHOTS=<folder> each is saved as a picture for review.
 */
import { expect, test } from '@playwright/test';
import { CLASSROOM_DESIGN } from '../../db/demo/designs';
import { CalculatorPage } from './pages/calculator-page';
import { PlanPage } from './pages/plan-page';
import { WorkspacePage } from './pages/workspace-page';
import { registerAndSignIn } from './support/flows';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';
import { atBothWidths } from './support/widths';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

test('calculators: three analyses of a baseline side by side; allocation as units per unit and shares; inputs by origin', async ({ page }) => {
  const calc = new CalculatorPage(page);
  await calc.goto('repeated-measures', 'Baseline and follow-up measures');
  await expect(calc.inputs.getByLabel('Analysis', { exact: true })).toHaveCount(0);
  const cards = page.getByTestId('baseline-comparison');
  await expect(cards.getByRole('listitem')).toHaveCount(3);
  const ancova = cards.locator('[data-analysis="ancova"]');
  await expect(ancova).toContainText('Recommended');
  // The sleep example: 2 baselines, 6 follow-ups, ρ 0.6, δ 20, SD 60, 90% power → 42 per group (numbers.spec.ts).
  await expect(ancova).toContainText('42');
  const size = async (a: string) => Number((await cards.locator(`[data-analysis="${a}"] .text-2xl`).textContent())?.replace(/,/g, ''));
  expect(await size('ancova')).toBeLessThanOrEqual(await size('change'));
  expect(await size('ancova')).toBeLessThanOrEqual(await size('post'));
  const inputs = page.getByTestId('inputs-by-origin');
  await expect(inputs).toContainText('Entered here');
  await expect(inputs).toContainText('Test settings');
  await expect(calc.result).not.toContainText('(delta)');
  await atBothWidths(page, 'calculator-repeated-measures');

  await calc.goto('two-group-means', 'Two group means');
  await calc.set('Units in the second group for each one in the first', '2');
  await expect(page.getByTestId('inputs-by-origin')).toContainText('2 (shares 33.3% and 66.7%)');
  await atBothWidths(page, 'calculator-two-group-means-ratio-2');
});

test('Plan: inputs by origin and a budget card of candidate cluster sizes with their cost and power', async ({ page }) => {
  test.slow();
  await registerAndSignIn(page, { name: 'Oona Own', email: uniqueEmail('own'), password: STRONG_PASSWORD });
  const classroomId = await new WorkspacePage(page).createStudyNamed('Reading support, randomised by classroom', 'Presentation test');
  const put = await page.request.put(`/api/v1/studies/${classroomId}/design`, { data: { baseRevision: 1, design: CLASSROOM_DESIGN } });
  expect(put.status(), await put.text()).toBe(200);
  const plan = new PlanPage(page);
  await plan.goto(classroomId);
  const inputs = page.getByTestId('inputs-by-origin').first();
  await expect(inputs).toContainText('From the design');
  await expect(page.getByRole('main')).not.toContainText('(clusterSize)');

  const budget = page.getByRole('region', { name: 'Cluster size under a budget' });
  await budget.getByLabel(/^Cost per /).first().fill('1200');
  await budget.getByLabel('Cost per unit').fill('40');
  const table = budget.getByTestId('budget-candidates');
  await expect(table.locator('tbody tr').first()).toBeVisible();
  const best = await budget.locator('[data-result="clusterSizeInteger"]').textContent();
  await expect(table.locator('tr[data-optimum]').getByRole('rowheader')).toContainText(`${best}`);
  await expect(table.locator('tr[data-optimum]')).toContainText('%');
  await budget.getByLabel('Budget (optional)').fill('100000');
  await expect(table.getByRole('columnheader', { name: 'Power within the budget' })).toBeVisible();
  await expect(table.locator('tr[data-optimum] td').last()).toContainText(/\d+\.\d% \(\d+ per arm\)/);
  await atBothWidths(page, 'plan-classroom-inputs-and-budget');
});
