/**
 * The public calculators, signed out: the two-group answer matches R's power.t.test
 * (delta 3, sd 10, power 0.8 → n = 175.38, so 176 per group; R 4.2.2, strict = TRUE), the answer
 * follows the inputs live, the cluster calculators give clusters per arm (for event rates by Hayes &
 * Bennett's formula, checked by hand), and the pages pass axe.
 */
import { expect, test } from '@playwright/test';
import { CalculatorPage } from './pages/calculator-page';
import { expectNoSeriousA11yViolations } from './support/axe';
import { expectSolveForKeepsInputs } from './support/solve-for-cycle';
import { distinctClientHeaders } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

test.describe('calculators, signed out', () => {
  test('the index lists every kind and passes axe', async ({ page }) => {
    const calc = new CalculatorPage(page);
    await calc.gotoIndex();
    for (const title of ['Two group means', 'Linear regression', 'Cluster-randomised means', 'Baseline and follow-up measures', 'Rates of change', 'Two proportions', 'Cluster-randomised proportions', 'Two event rates', 'Cluster-randomised event rates', 'Design effect', 'Cluster size under a budget']) {
      await expect(page.getByRole('link', { name: title, exact: true })).toBeVisible();
    }
    await expect(calc.caution()).toBeVisible();
    await expectNoSeriousA11yViolations(page, 'Calculators index');
  });

  test('two group means: 176 per group, and the answer follows the inputs', async ({ page }) => {
    const calc = new CalculatorPage(page);
    await calc.goto('two-group-means', 'Two group means');
    await calc.solveFor('sample size');
    await calc.set('Difference in means', '3');
    await calc.set('Standard deviation', '10');
    await calc.set('Power', '0.8');
    await calc.set('Significance level (alpha)', '0.05');
    await expect(calc.answer('Sample size per group')).toHaveText('176');
    await expect(calc.answer('Power')).toHaveText('80.1%');
    await expect(calc.result).toContainText('With 176 per group, a two-sided test at alpha 0.05 has 80.1% power');
    await expect(calc.caution()).toBeVisible();

    // A larger difference needs fewer: power.t.test(delta = 4, sd = 10, power = .8) gives n = 99.08 → 100.
    await calc.set('Difference in means', '4');
    await expect(calc.answer('Sample size per group')).toHaveText('100');

    // Solving for power carries the last size into its field.
    await calc.solveFor('power');
    await expect(calc.field('Sample size per group')).toHaveValue('100');
    await expect(calc.answer('Power')).toHaveText('80.4%');

    await calc.set('Standard deviation', '-1');
    await expect(calc.status).toContainText('Enter the standard deviation as a number above 0.');
    await expect(calc.field('Standard deviation')).toHaveAttribute('aria-invalid', 'true');
    await expectNoSeriousA11yViolations(page, 'Two group means calculator with an error');
  });

  test('switching what to solve for never rewrites an input (every cycle of the choice)', async ({ page }) => {
    const calc = new CalculatorPage(page);
    await calc.goto('two-group-means', 'Two group means');
    await calc.solveFor('sample size');
    await calc.setAll({ 'Difference in means': '3', 'Standard deviation': '10', Power: '0.8' });
    await expect(calc.answer('Sample size per group')).toHaveText('176');
    const seen = await expectSolveForKeepsInputs(calc.inputs);
    expect(seen.power).toBe('0.8');
    expect(seen.delta).toBe('3');
    await calc.solveFor('sample size');
    await expect(calc.field('Power')).toHaveValue('0.8');
    await expect(calc.answer('Sample size per group')).toHaveText('176');

    await calc.goto('cluster-means', 'Cluster-randomised means');
    const cluster = await expectSolveForKeepsInputs(calc.inputs);
    expect(cluster.power).toBe('0.8');
  });

  test('two proportions opens with independent units; the best cluster size needs only the ICC and the costs', async ({ page }) => {
    const calc = new CalculatorPage(page);
    await calc.goto('two-proportions', 'Two proportions');
    await expect(calc.field('Intracluster correlation (ICC)')).toHaveValue('');
    await expect(calc.field('Units per cluster')).toHaveValue('');
    // R 4.2.2: ceiling(power.prop.test(p1 = 0.55, p2 = 0.7, power = 0.8)$n) = 163.
    await expect(calc.answer('Sample size per group')).toHaveText('163');

    await calc.goto('optimal-allocation', 'Cluster size under a budget');
    await calc.setAll({ 'Intracluster correlation (ICC)': '0.15', 'Cost per cluster': '1200', 'Cost per unit': '40', Budget: '' });
    // Raudenbush 1997: √(1200/40 × 0.85/0.15) = 13.04 → 13 (R 4.2.2, fixtures/generate_one_answer.R).
    await expect(calc.answer('Best whole cluster size')).toHaveText('13');
    await expect(calc.status).toHaveCount(0);
    await expectNoSeriousA11yViolations(page, 'Cluster size under a budget, costs only');
  });

  test('cluster-randomised means shows clusters per arm', async ({ page }) => {
    const calc = new CalculatorPage(page);
    await calc.goto('cluster-means', 'Cluster-randomised means');
    await calc.solveFor('clusters per arm');
    await calc.set('Difference in means', '4');
    await calc.set('Standard deviation', '12');
    await calc.set('Intracluster correlation (ICC)', '0.15');
    await calc.set('Units per cluster', '25');
    await calc.set('Variation in cluster size (CV)', '0.3');
    await calc.set('Power', '0.8');
    await calc.set('Expected attrition', '0');
    // R: power.t.test(delta = 4, sd = 12 * sqrt(4.9375 / 25), power = .8, strict = TRUE)$n = 28.9 → 29.
    await expect(calc.answer('Clusters per arm')).toHaveText('29');
    await expect(calc.result).toContainText('Design effect');
    await expectNoSeriousA11yViolations(page, 'Cluster-randomised means calculator');
  });

  test('cluster-randomised event rates: clusters per arm by Hayes & Bennett, inputs in plain words', async ({ page }) => {
    const calc = new CalculatorPage(page);
    await calc.goto('cluster-rates', 'Cluster-randomised event rates');
    await calc.solveFor('clusters per arm');
    await calc.set('Baseline rate (events per unit of follow-up time)', '0.5');
    await calc.set('Rate ratio', '0.75');
    await calc.set('Participants per cluster', '25');
    await calc.set('Follow-up time per participant', '6');
    await calc.set('Between-cluster coefficient of variation of the rate', '0.25');
    await calc.set('Power', '0.8');
    // Hayes & Bennett 1999 by hand: c = 1 + 7.8489 × (0.875/150 + 0.0625 × 0.390625)/0.125² = 16.19 → 17.
    await expect(calc.answer('Clusters per arm')).toHaveText('17');
    await expect(calc.inputs.getByRole('group', { name: 'Clusters and follow-up' })).toBeVisible();
    await expect(calc.result).toContainText('Hayes & Bennett');
    await expectNoSeriousA11yViolations(page, 'Cluster-randomised event rates calculator');
  });

  test('an unknown kind is a 404', async ({ page }) => {
    const res = await page.goto('/calculators/anova-of-everything');
    expect(res?.status()).toBe(404);
  });
});
