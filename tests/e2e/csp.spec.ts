/**
 * The main pages under the Content-Security-Policy, in Chromium: every script, style, font and
 * chart loads and works, and the browser reports no violation. Pages: sign-in, the studies list, a
 * study's design wizard, Plan (its charts), Stress test, the calculators.
 */
import { expect, test, type Page } from '@playwright/test';
import { CLASSROOM_DESIGN } from '../../db/demo/designs';
import { CalculatorPage } from './pages/calculator-page';
import { DesignWizardPage } from './pages/design-wizard-page';
import { PlanPage } from './pages/plan-page';
import { SignInPage } from './pages/sign-in-page';
import { StressTestPage } from './pages/stress-test-page';
import { WorkspacePage } from './pages/workspace-page';
import { registerAndSignIn } from './support/flows';
import { distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });

/** Records the violations the browser reports, and its console errors about the policy. */
async function watchPolicy(page: Page): Promise<() => Promise<string[]>> {
  await page.addInitScript(() => {
    const seen: string[] = [];
    (window as unknown as { __violations: string[] }).__violations = seen;
    document.addEventListener('securitypolicyviolation', (e) => seen.push(`${e.violatedDirective} blocked ${e.blockedURI || '(inline)'} at ${e.sourceFile}:${e.lineNumber}`));
  });
  const console: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error' && /Content Security Policy|Refused to/i.test(m.text())) console.push(m.text());
  });
  return async () => [...(await page.evaluate(() => (window as unknown as { __violations?: string[] }).__violations ?? [])), ...console.splice(0)];
}

test('the main pages work under the policy with no violation reported', async ({ page }) => {
  test.slow();
  const violations = await watchPolicy(page);
  const visit = async (what: string, open: () => Promise<void>) => {
    await test.step(what, async () => {
      await open();
      await page.waitForLoadState('networkidle');
      expect(await violations(), `policy violations on ${what}`).toEqual([]);
    });
  };

  await visit('sign-in', async () => {
    const response = await page.goto('/sign-in');
    const csp = response!.headers()['content-security-policy'];
    expect(csp).toMatch(/script-src 'self' 'nonce-[^']+' 'strict-dynamic'/);
    expect(csp).not.toContain('unsafe-eval');
    await expect(new SignInPage(page).heading).toBeVisible();
    // the page's own font, from next/font, is in use
    expect(await page.evaluate(() => document.fonts.check('16px Inter') || [...document.fonts].some((f) => f.status === 'loaded'))).toBe(true);
  });

  await registerAndSignIn(page, { name: 'Cyrus Policy', email: uniqueEmail('csp'), password: STRONG_PASSWORD });
  const workspace = new WorkspacePage(page);
  const studyId = await workspace.createStudyNamed('Reading-support programme, randomised by classroom', 'CSP test');
  const put = await page.request.put(`/api/v1/studies/${studyId}/design`, { data: { baseRevision: 1, design: CLASSROOM_DESIGN } });
  expect(put.status(), await put.text()).toBe(200);

  await visit('the studies list', async () => {
    await page.goto('/studies');
    await workspace.expectLoaded();
    await expect(workspace.studyLink('Reading-support programme, randomised by classroom')).toBeVisible();
  });

  await visit('the design wizard, with its diagram', async () => {
    const wizard = new DesignWizardPage(page);
    await wizard.open(studyId, 'structure');
    await expect(wizard.diagram).toBeVisible();
  });

  await visit('Plan, with its power curve and heat map', async () => {
    const plan = new PlanPage(page);
    await plan.goto(studyId);
    await expect(plan.headline('clustersPerArm')).toHaveText(/^\d+$/);
    await expect(plan.heatmap).toBeVisible();
    await expect(page.locator('svg.recharts-surface').first()).toBeVisible();
    await plan.input('Intracluster correlation (ICC)').fill('0.05');
    await expect(plan.curveSummary).toContainText('classrooms per arm');
  });

  await visit('Stress test', async () => {
    const stress = new StressTestPage(page);
    await stress.goto(studyId);
    await expect(stress.caution).toBeVisible();
  });

  await visit('the calculators', async () => {
    const calculators = new CalculatorPage(page);
    await calculators.gotoIndex();
    await calculators.goto('cluster-means', 'Cluster-randomised means');
  });
});
