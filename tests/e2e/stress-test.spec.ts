/**
 * The Stress test tab on the demo's classroom design: a small run (300 replicates) goes through
 * the queue and the worker that the end-to-end setup starts; the progress bar advances to its
 * maximum; the results table (scenario × analysis, each value ± MC SE) and the dot plots appear,
 * with the summary sentences; the run is listed with its design revision; sorting is kept in the
 * URL; no serious or critical axe violations.
 *
 * The sleep-timing demo (each volunteer follows both schedules over 8 nights) runs from its tab
 * too: a cross-over of 8 periods with the carry-over scenario the design asks for, to a finished
 * result.
 *
 * As in plan.spec.ts, the end-to-end database is not seeded with the demo, so the spec loads the
 * demo's classroom design into a new study through the design API, as its owner.
 */
import { expect, test } from '@playwright/test';
import { CLASSROOM_DESIGN, SLEEP_DESIGN } from '../../db/demo/designs';
import { StressTestPage } from './pages/stress-test-page';
import { WorkspacePage } from './pages/workspace-page';
import { expectNoSeriousA11yViolations as checkA11y } from './support/axe';
import { registerAndSignIn } from './support/flows';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

test('classroom design: a small stress test runs, shows progress, then results and charts', async ({ page }) => {
  test.setTimeout(240_000);
  await registerAndSignIn(page, { name: 'Priya Stress', email: uniqueEmail('stress'), password: STRONG_PASSWORD });
  const studyId = await new WorkspacePage(page).createStudyNamed('Reading-support programme, randomised by classroom', 'Stress test');
  const put = await page.request.put(`/api/v1/studies/${studyId}/design`, { data: { baseRevision: 1, design: CLASSROOM_DESIGN } });
  expect(put.status(), await put.text()).toBe(200);
  const revision = ((await put.json()) as { revision: number }).revision;

  const stress = new StressTestPage(page);

  await test.step('defaults come from the design: assumptions hold; ols against the clustered analyses', async () => {
    await stress.goto(studyId);
    await expect(stress.heading).toHaveText(`Stress test of revision ${revision}`);
    await expect(stress.caution).toBeVisible();
    await expect(stress.scenario(/^Assumptions hold/)).toBeChecked();
    await expect(stress.scenario(/^Heavy-tailed errors \(t with 3 df/)).not.toBeChecked();
    for (const a of ['ols', 'cluster-robust', 'cluster-means', 'mixed']) await expect(stress.analysis(a)).toBeChecked();
    await expect(stress.pastRuns).toContainText('No stress test has been run on this study yet.');
    await checkA11y(page, 'stress test tab before a run');
  });

  await test.step('a run of 300 replicates: the progress bar advances to its maximum', async () => {
    await stress.replicates.fill('300');
    await expect(stress.form).toContainText('Monte Carlo SE of 1.3 percentage points');
    await stress.run.click();
    await expect(stress.progress).toBeVisible({ timeout: 30_000 });
    await expect(stress.progress).toHaveAttribute('aria-valuemax', '300');
    const first = (await stress.replicatesDone()) ?? 0;
    await expect.poll(() => stress.replicatesDone(), { timeout: 180_000, intervals: [250, 500, 1000] }).toBe(300);
    expect(first).toBeLessThanOrEqual(300);
    await expect(stress.progressText).toHaveText('300 of 300 replicates');
  });

  await test.step('results: table, dot plots with their data tables, summary sentences', async () => {
    await expect(stress.results).toBeVisible({ timeout: 30_000 });
    const rows = await stress.resultRows();
    expect(rows).toHaveLength(4);
    // Ignoring the classrooms (ICC 0.15, 25 pupils each), ols's false-positive rate is far above 5%.
    const ols = rows.find((r) => / least squares \d/.test(` ${r} `));
    expect(ols, rows.join('\n')).toMatch(/^Assumptions hold .* least squares \d+\.\d% ± \d+\.\d% \d+\.\d% ± \d+\.\d%/);
    await expect(stress.summary).toContainText('analysed with least squares, the false-positive rate is');
    await expect(stress.falsePositiveChart.locator('.recharts-surface')).toBeVisible();
    await expect(stress.coverageChart.locator('.recharts-surface')).toBeVisible();
    await expect(stress.falsePositiveChart.getByTestId('chart-false-positive-table').locator('tbody tr')).toHaveCount(4);
    await expect(stress.pastRuns.getByRole('row').filter({ hasText: 'Shown above' })).toContainText(`${revision}`);
    await checkA11y(page, 'stress test tab with results');
  });

  await test.step('sorting by the false-positive rate is kept in the URL', async () => {
    await stress.results.getByRole('button', { name: /False-positive rate/ }).click();
    await expect(page).toHaveURL(/sort=typeIError\.asc/);
    await stress.results.getByRole('button', { name: /False-positive rate/ }).click();
    await expect(page).toHaveURL(/sort=typeIError\.desc/);
    await expect(stress.results.getByRole('columnheader', { name: /False-positive rate/ })).toHaveAttribute('aria-sort', 'descending');
    await expect(stress.results.locator('tbody tr').first().getByRole('rowheader')).toHaveText('least squares');
  });
});

test('sleep-timing design: the cross-over of 8 nights runs from the tab, carry-over included, to a finished result', async ({ page }) => {
  test.setTimeout(240_000);
  await registerAndSignIn(page, { name: 'Lena Sleep', email: uniqueEmail('sleep'), password: STRONG_PASSWORD });
  const studyId = await new WorkspacePage(page).createStudyNamed('Sleep timing and next-day reaction time', 'Stress test of a cross-over');
  const put = await page.request.put(`/api/v1/studies/${studyId}/design`, { data: { baseRevision: 1, design: SLEEP_DESIGN } });
  expect(put.status(), await put.text()).toBe(200);

  const stress = new StressTestPage(page);
  await stress.goto(studyId);
  await expect(page.getByText('Not simulated from this design yet')).toHaveCount(0);
  await expect(stress.scenario(/^Assumptions hold/)).toBeChecked();
  await expect(stress.scenario(/^Carry-over: 50% of the effect persists/)).toBeChecked();
  await expect(stress.scenario(/^Serial correlation/)).toHaveCount(0);
  for (const a of ['ols', 'cluster-robust', 'mixed', 'huber']) await expect(stress.analysis(a)).toBeChecked();
  await expect(stress.analysis('cluster-means')).toHaveCount(0);

  // Two scenarios only, to keep the run short: assumptions hold, and carry-over.
  await stress.scenario(/^Right-skewed errors/).uncheck();
  await stress.scenario(/^Outliers/).uncheck();
  await stress.replicates.fill('100');
  await stress.run.click();
  await expect(stress.progress).toBeVisible({ timeout: 30_000 });
  await expect(stress.progress).toHaveAttribute('aria-valuemax', '200');
  await expect.poll(() => stress.replicatesDone(), { timeout: 180_000, intervals: [250, 500, 1000] }).toBe(200);

  await expect(stress.results).toBeVisible({ timeout: 30_000 });
  const rows = await stress.resultRows();
  expect(rows).toHaveLength(8);
  expect(rows.filter((r) => r.startsWith('Carry-over'))).toHaveLength(4);
  const mixed = rows.find((r) => /^Assumptions hold .* linear mixed model /.test(r));
  expect(mixed, rows.join('\n')).toMatch(/ linear mixed model \d+\.\d% ± \d+\.\d% \d+\.\d% ± \d+\.\d%/);
  // Carry-over biases every analysis that adjusts for period only (the design's warning, made visible).
  await expect(stress.summary).toContainText('With carry-over between periods, analysed with linear mixed model, the estimate is off by');
  await expect(page.getByText(/12 volunteers per sequence/).first()).toBeVisible();
});
