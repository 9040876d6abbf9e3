/**
 * The Plan tab on the demo's classroom design: it chooses the cluster-means calculation and
 * shows classrooms per arm; changing the ICC changes the number and the power curve (read from
 * the curve's data table); a saved result is listed with the design revision it came from.
 *
 * The fourth demo study, falls counted per resident in care homes, shows the rate-ratio inputs
 * and its number of care homes; its Checks read as checks of a count.
 *
 * The end-to-end database is not seeded with the demo (other specs create users first, and the
 * seed adds demo studies only to a database that has the demo), so the spec loads the demo's
 * designs into new studies through the design API, as their owner.
 */
import { expect, test } from '@playwright/test';
import { CLASSROOM_DESIGN, FALLS_DESIGN } from '../../db/demo/designs';
import { PlanPage } from './pages/plan-page';
import { WorkspacePage } from './pages/workspace-page';
import { expectNoSeriousA11yViolations as checkA11y } from './support/axe';
import { expectSolveForKeepsInputs } from './support/solve-for-cycle';
import { registerAndSignIn } from './support/flows';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

test('classroom design: clusters per arm, live ICC change, saved with its revision', async ({ page }) => {
  test.slow();
  await registerAndSignIn(page, { name: 'Priya Planner', email: uniqueEmail('plan'), password: STRONG_PASSWORD });
  const studyId = await new WorkspacePage(page).createStudyNamed('Reading-support programme, randomised by classroom', 'Plan test');
  const put = await page.request.put(`/api/v1/studies/${studyId}/design`, { data: { baseRevision: 1, design: CLASSROOM_DESIGN } });
  expect(put.status(), await put.text()).toBe(200);
  const revision = ((await put.json()) as { revision: number }).revision;

  const plan = new PlanPage(page);
  let before = 0;
  let curveBefore: string[] = [];

  await test.step('Plan shows classrooms per arm for the classroom design', async () => {
    await plan.goto(studyId);
    await expect(plan.heading).toHaveText(`Cluster-randomised means, for revision ${revision}`);
    await expect(plan.assumptions).toContainText('Regional reading-test report, classroom ICCs');
    await expect(plan.caution).toBeVisible();
    await expect(plan.headline('clustersPerArm')).toHaveText(/^\d+$/);
    before = Number(await plan.headline('clustersPerArm').textContent());
    expect(before).toBeGreaterThan(10);
    curveBefore = await plan.curveRows();
    expect(curveBefore.length).toBeGreaterThan(5);
    await expect(plan.heatmap).toBeVisible();
    await checkA11y(page, 'plan tab');
  });

  await test.step('a smaller ICC needs fewer classrooms, and the curve changes', async () => {
    await plan.input('Intracluster correlation (ICC)').fill('0.05');
    await expect.poll(async () => Number(await plan.headline('clustersPerArm').textContent())).toBeLessThan(before);
    await expect.poll(async () => (await plan.curveRows()).join('|')).not.toBe(curveBefore.join('|'));
    await expect(plan.curveSummary).toContainText('classrooms per arm');
  });

  await test.step('switching what to solve for never rewrites an input (every cycle of the choice)', async () => {
    const seen = await expectSolveForKeepsInputs(plan.inputs);
    expect(seen.icc).toBe('0.05');
    await plan.inputs.getByRole('group', { name: 'Solve for' }).locator('input[value="clustersPerArm"]').check();
    await expect(plan.inputs.locator('input[name="power"]')).toHaveValue(seen.power!);
    await expect(plan.headline('clustersPerArm')).toHaveText(/^\d+$/);
  });

  await test.step('save: the result is listed with the revision', async () => {
    const after = await plan.headline('clustersPerArm').textContent();
    await plan.saveResult('ICC 0.05 as in the lower published range');
    const row = plan.saved.getByRole('row').filter({ hasText: `Clusters per arm ${after}` });
    await expect(row).toBeVisible();
    await expect(row.getByRole('cell').first()).toHaveText(String(revision));
    await page.reload();
    await expect(plan.saved.getByRole('row').filter({ hasText: `Clusters per arm ${after}` })).toBeVisible();
  });
});

test('a count outcome: the Plan asks for the rate-ratio inputs and sizes the classrooms by Hayes & Bennett', async ({ page }) => {
  test.slow();
  await registerAndSignIn(page, { name: 'Rita Rates', email: uniqueEmail('plan-rates'), password: STRONG_PASSWORD });
  const studyId = await new WorkspacePage(page).createStudyNamed('Absences, randomised by classroom', 'Plan test');
  const source = { kind: 'expert', certainty: 'medium' } as const;
  const design = {
    ...CLASSROOM_DESIGN,
    outcome: { ...CLASSROOM_DESIGN.outcome, name: 'Days absent', unit: 'days', type: 'count' as const },
    assumptions: {
      ...CLASSROOM_DESIGN.assumptions,
      baselineRate: { value: 0.5, source },
      rateRatio: { value: 0.75, source },
      followUpTime: { value: 6, source },
      dispersion: { value: 0, source },
      betweenClusterCv: { value: 0.25, source: { kind: 'published', citation: 'Invented absence study, classroom rates', certainty: 'low' } as const },
    },
  };
  const put = await page.request.put(`/api/v1/studies/${studyId}/design`, { data: { baseRevision: 1, design } });
  expect(put.status(), await put.text()).toBe(200);
  const revision = ((await put.json()) as { revision: number }).revision;

  const plan = new PlanPage(page);
  await plan.goto(studyId);
  await expect(plan.heading).toHaveText(`Cluster-randomised event rates, for revision ${revision}`);
  await expect(plan.assumptions).toContainText('Invented absence study, classroom rates');
  await expect(plan.input(/^Rate ratio$/)).toHaveValue('0.75');
  await expect(plan.input('Between-cluster coefficient of variation of the rate')).toHaveValue('0.25');
  // Hayes & Bennett by hand, 23 pupils analysed for 6 months: c = 1 + 7.8489 × (0.875/138 + 0.0625 × 0.390625)/0.125² = 16.47 → 17.
  await expect(plan.headline('clustersPerArm')).toHaveText('17');
  await plan.input(/^Rate ratio$/).fill('0.6');
  await expect.poll(async () => Number(await plan.headline('clustersPerArm').textContent())).toBeLessThan(17);
  await checkA11y(page, 'plan tab for counts');
});

test('falls demo: the Plan shows the rate-ratio inputs and the care homes per arm; the Checks read as checks of counts', async ({ page }) => {
  test.slow();
  await registerAndSignIn(page, { name: 'Priya Planner', email: uniqueEmail('plan-falls'), password: STRONG_PASSWORD });
  const studyId = await new WorkspacePage(page).createStudyNamed('Falls-prevention programme, randomised by care home', 'Plan test');
  const put = await page.request.put(`/api/v1/studies/${studyId}/design`, { data: { baseRevision: 1, design: FALLS_DESIGN } });
  expect(put.status(), await put.text()).toBe(200);
  const revision = ((await put.json()) as { revision: number }).revision;

  const plan = new PlanPage(page);
  await test.step('Plan: Hayes & Bennett from the rate, rate ratio, follow-up, overdispersion and between-home CV', async () => {
    await plan.goto(studyId);
    await expect(plan.heading).toHaveText(`Cluster-randomised event rates, for revision ${revision}`);
    await expect(plan.input('Baseline rate (events per unit of follow-up time)')).toHaveValue('1.8');
    await expect(plan.input(/^Rate ratio$/)).toHaveValue('0.7');
    await expect(plan.input(/^Follow-up time/)).toHaveValue('1');
    await expect(plan.input(/^Overdispersion between participants/)).toHaveValue('0.8');
    await expect(plan.input('Between-cluster coefficient of variation of the rate')).toHaveValue('0.3');
    await expect(plan.inputs.getByRole('spinbutton', { name: /^Residents per care home/ })).toHaveValue('22');
    await expect(plan.assumptions).toContainText('Harrow Vale care-home falls audit 2023');
    await expect(plan.assumptions).toContainText('Falls of residents in six pilot care homes');
    await expect(plan.caution).toBeVisible();
    // 1 + 7.8489 × V / 0.54², V = 3.06/22 + 0.8 × 5.0676/22 + 0.09 × 5.0676 = 0.7491: 21.16 → 22 care homes per arm.
    await expect(plan.headline('clustersPerArm')).toHaveText('22');
    await expect(plan.curveSummary).toContainText('care homes per arm');
    await checkA11y(page, 'plan tab of the falls demo');
  });

  await test.step('Checks: the care home as the unit, and the Poisson model of overdispersed counts', async () => {
    await page.goto(`/studies/${studyId}/checks`);
    const main = page.getByRole('main');
    await expect(page.getByRole('article').filter({ hasText: 'Blocker' }).first()).toContainText('Analysed per resident, but the falls-prevention programme is assigned per care home');
    await expect(main).toContainText('The plan uses a Poisson model, but the counts are expected to be overdispersed');
    await expect(main).toContainText('1 + 0.8 × 1.8 = 2.44 times the mean');
    await expect(main).toContainText('offset(log(follow_up_time))');
    await checkA11y(page, 'checks tab of the falls demo');
  });
});
