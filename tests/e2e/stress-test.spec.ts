/**
 * The Stress test tab on the demo's classroom design: a small run (300 replicates) goes through
 * the queue and the worker that the end-to-end setup starts; the progress bar advances to its
 * maximum; the result leads with the verdict grid — the planned analysis (a t test of pupils,
 * ols) fails its false-positive rate and its power is not counted, each cell's Monte Carlo
 * error shows on keyboard focus — then the best alternative; the detail table (scenario ×
 * analysis, each value ± MC SE) and the summary sentences are collapsed below; the run is listed
 * with its design revision; sorting is kept in the URL; cancelling a second run asks first and
 * keeps the finished run in view; no serious or critical axe violations.
 *
 * The sleep-timing demo (each volunteer follows both schedules over 8 nights) runs from its tab
 * too: a cross-over of 8 periods with the carry-over scenario the design asks for, to a finished
 * result. From 100 replicates a 5% rate has a Monte Carlo interval of about 0.7% to 9.3%, which
 * reaches past 7.5% (1.5α): cells read "Too few runs to tell", say on focus how many replicates
 * would settle them, and the grid offers to run again with that many.
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
import { atBothWidths } from './support/widths';

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

  await test.step('results: the verdict grid first, the best alternative, the detail table collapsed', async () => {
    await expect(stress.grid).toBeVisible({ timeout: 30_000 });
    // The planned analysis leads: a t test of the pupils ignores the classrooms (ICC 0.15).
    await expect(stress.plannedRow.getByRole('rowheader')).toContainText('least squares');
    await expect(stress.plannedRow.getByRole('rowheader')).toContainText('planned');
    const cell = stress.plannedRow.getByTestId('verdict-cell');
    await expect(cell).toHaveAttribute('data-verdict', 'broken');
    await expect(cell).toContainText('Fails');
    await expect(cell).toContainText('Power not counted');
    await expect(page.getByTestId('verdict-headline')).toContainText('The planned analysis, least squares, fails in 1 of 1 scenario');
    // The legend says what each verdict means, in whole sentences.
    await expect(page.getByText(/Slightly off: above 5\.0% beyond the Monte Carlo error, but within that bound\./)).toBeVisible();
    // The Monte Carlo error on keyboard focus, as a tooltip the cell is described by.
    await cell.focus();
    const tip = page.getByRole('tooltip');
    await expect(tip).toBeVisible();
    await expect(tip).toContainText(/False-positive rate \d+\.\d% ± \d+\.\d% MC SE/);
    await expect(cell).toHaveAccessibleDescription(/not counted/);
    await page.keyboard.press('Escape');
    await expect(tip).toBeHidden();
    // From 300 replicates a rate of 5.1% or more already reaches past 7.5% (1.5α): the alternative may be undecided.
    await expect(stress.bestAlternative).toContainText(
      /^(Cluster-robust SE \(CR2\)|Analysis of cluster or unit means|Linear mixed model) (keeps its false-positive rate and coverage in every scenario|is the best of the others on this run, but there are too few runs to tell)/,
    );
    // Every figure is still there, collapsed.
    await expect(stress.results).toBeHidden();
    await stress.openDetails();
    await expect(stress.results).toBeVisible();
    const rows = await stress.resultRows();
    expect(rows).toHaveLength(4);
    // Ignoring the classrooms (ICC 0.15, 23 pupils analysed in each), least squares' false-positive rate is far above 5%.
    const ols = rows.find((r) => / least squares \d/.test(` ${r} `));
    expect(ols, rows.join('\n')).toMatch(/^Assumptions hold .* least squares \d+\.\d% ± \d+\.\d% \d+\.\d% ± \d+\.\d%/);
    await expect(stress.summary).toContainText('analysed with least squares, the false-positive rate is');
    await expect(stress.pastRuns.getByRole('row').filter({ hasText: 'Shown above' })).toContainText(`${revision}`);
    await checkA11y(page, 'stress test tab with results');
    await atBothWidths(page, 'stress-test-classroom-results');
    // On a phone the planned verdict is read whole, and the table's explanation wraps rather than being cut off.
    await page.setViewportSize({ width: 390, height: 900 });
    const plannedCell = await stress.plannedRow.getByTestId('verdict-cell').boundingBox();
    expect(plannedCell!.x + plannedCell!.width).toBeLessThanOrEqual(390);
    const explanation = page.getByText(/^Each value ± its Monte Carlo SE/);
    const box = await explanation.boundingBox();
    expect(box!.x + box!.width).toBeLessThanOrEqual(390);
    await page.setViewportSize({ width: 1280, height: 900 });
  });

  await test.step('sorting by the false-positive rate is kept in the URL', async () => {
    await stress.results.getByRole('button', { name: /False-positive rate/ }).click();
    await expect(page).toHaveURL(/sort=typeIError\.asc/);
    await stress.results.getByRole('button', { name: /False-positive rate/ }).click();
    await expect(page).toHaveURL(/sort=typeIError\.desc/);
    await expect(stress.results.getByRole('columnheader', { name: /False-positive rate/ })).toHaveAttribute('aria-sort', 'descending');
    await expect(stress.results.locator('tbody tr').first().getByRole('rowheader')).toHaveText('least squares');
  });

  await test.step('cancelling asks first, and the finished run stays in view', async () => {
    // A long run (6 scenarios × 20,000 replicates), so that it is still going when cancelled.
    for (const name of [/^Right-skewed/, /^Heavy-tailed/, /^Outliers/, /^Unequal variance/, /^Curved relation/]) await stress.scenario(name).check();
    await stress.replicates.fill('20000');
    await stress.run.click();
    await expect(stress.cancel).toBeVisible({ timeout: 30_000 });
    await stress.cancel.click();
    await expect(page.getByText('Stop this run?')).toBeVisible();
    await page.getByRole('button', { name: 'Keep it running' }).click();
    await expect(page.getByText('Stop this run?')).toHaveCount(0);
    await expect(stress.lastFinished).toBeVisible();
    await expect(stress.lastFinished.getByTestId('planned-row').getByTestId('verdict-cell')).toHaveAttribute('data-verdict', 'broken');
    await checkA11y(page, 'stress test tab while a run goes on, the finished one in view');
    await stress.cancel.click();
    await page.getByRole('button', { name: 'Yes, stop the run' }).click();
    await expect(page.getByText('Cancelled', { exact: true }).first()).toBeVisible({ timeout: 30_000 });
    await expect(stress.lastFinished).toBeVisible();
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

  await expect(stress.grid).toBeVisible({ timeout: 30_000 });
  await expect(stress.grid.getByTestId('verdict-cell')).toHaveCount(8);
  // Too few runs to tell: said in words and an icon, with the replicates that would settle it on focus.
  const unsure = stress.grid.locator('[data-testid="verdict-cell"][data-verdict="undecided"]');
  expect(await unsure.count()).toBeGreaterThan(0);
  await expect(unsure.first()).toContainText('Too few runs to tell');
  await expect(unsure.first()).toContainText('Power not counted');
  await unsure.first().focus();
  await expect(page.getByRole('tooltip').filter({ visible: true })).toContainText(/About [\d,]+ replicates per scenario \([\d,]+ more than this run’s 100\) would settle it/);
  await page.keyboard.press('Escape');
  await expect(stress.moreReplicates).toContainText(/too few runs to tell\. About [\d,]+ replicates per scenario would settle/);
  await checkA11y(page, 'stress test of the sleep design, cells with too few runs to tell');
  await stress.openDetails();
  const rows = await stress.resultRows();
  expect(rows).toHaveLength(8);
  expect(rows.filter((r) => r.startsWith('Carry-over'))).toHaveLength(4);
  const mixed = rows.find((r) => /^Assumptions hold .* linear mixed model /.test(r));
  expect(mixed, rows.join('\n')).toMatch(/ linear mixed model \d+\.\d% ± \d+\.\d% \d+\.\d% ± \d+\.\d%/);
  // Carry-over biases every analysis that adjusts for period only (the design's warning, made visible).
  await expect(stress.summary).toContainText('With carry-over between periods, analysed with linear mixed model, the estimate is off by');
  await expect(page.getByText(/12 volunteers per sequence/).first()).toBeVisible();
  await atBothWidths(page, 'stress-test-sleep-results');

  // The grid's offer runs the same two scenarios again with more replicates; stopped straight away.
  const again = stress.moreReplicates.getByRole('button', { name: /^Run again with [\d,]+ replicates$/ });
  const offered = Number(((await again.textContent()) ?? '').replace(/\D/g, ''));
  expect(offered).toBeGreaterThan(100);
  await again.click();
  await expect(stress.progress).toHaveAttribute('aria-valuemax', String(2 * offered), { timeout: 30_000 });
  await expect(stress.lastFinished).toBeVisible();
  await stress.cancel.click();
  await page.getByRole('button', { name: 'Yes, stop the run' }).click();
  await expect(page.getByText('Cancelled', { exact: true }).first()).toBeVisible({ timeout: 30_000 });
});
