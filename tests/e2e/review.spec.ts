/**
 * Review (issue 12), the part of the scenario that threads and suggestions cover: the demo
 * consultant opens the classroom study, which already has a review in progress (the demo's open
 * and resolved threads and her pending suggestion), comments on the unit-of-analysis finding and
 * mentions the owner, picking her from the member list with the keyboard; the owner, whose Review
 * tab is already open, sees the comment arrive without reloading, replies, and accepts the
 * consultant's suggestion, which becomes a new revision of the design. Filters live in the
 * address. Every screen passes axe (no serious or critical violations).
 *
 * Then the rest of the scenario: the mention e-mail reaches the owner's outbox; the
 * consultant signs off the named version; an edit marks it changed since sign-off; the comparison
 * shows the difference.
 */
import { expect, test } from '@playwright/test';
import { DesignWizardPage } from './pages/design-wizard-page';
import { OutboxHelper } from './pages/outbox';
import { ReviewPage } from './pages/review-page';
import { expectNoSeriousA11yViolations as checkA11y } from './support/axe';
import { atBothWidths } from './support/widths';
import { seedClassroomReview } from './support/demo-review';
import { signInToWorkspace } from './support/flows';
import { APP_ORIGIN, distinctClientHeaders } from './support/test-data';

const clientHeaders = distinctClientHeaders();
test.use({ extraHTTPHeaders: clientHeaders });

const UNIT_FINDING = /Analysed per pupil, but the reading-support programme is assigned per classroom/;

test('the consultant comments on the classroom study and mentions the owner; the owner sees it live, replies and accepts a suggestion', async ({ page, browser }) => {
  test.slow(); // two people in two browsers
  const { studyId, owner, consultant } = await seedClassroomReview();

  // The owner opens the Review tab first and keeps it open.
  const ownerContext = await browser.newContext({ baseURL: APP_ORIGIN, extraHTTPHeaders: clientHeaders });
  const ownerPage = await ownerContext.newPage();
  try {
    const ownerReview = new ReviewPage(ownerPage);
    await test.step('the owner sees the review in progress: one open thread, one resolved, a suggestion waiting', async () => {
      await signInToWorkspace(ownerPage, owner.email, owner.password);
      await ownerReview.goto(studyId);
      await expect(ownerPage.getByRole('navigation', { name: 'Study sections' }).getByRole('link', { name: 'Review 1 open thread' })).toBeVisible();
      await expect(ownerReview.openThreads.getByRole('article')).toHaveCount(1);
      await expect(ownerReview.thread(UNIT_FINDING, ownerReview.openThreads)).toContainText('@Priya Nair the programme is given to whole classrooms');
      await expect(ownerReview.thread(/Intracluster correlation \(ICC\) for Classroom/, ownerReview.resolvedThreads)).toContainText('Resolved');
      await expect(ownerReview.suggestion(/Adjusts for the baseline measurement/)).toContainText('Waiting for a decision');
      await atBothWidths(ownerPage, 'review-tab-owner');
    });

    const since = new Date();
    await test.step('the consultant comments on the unit-of-analysis finding from the Checks tab and mentions the owner', async () => {
      await signInToWorkspace(page, consultant.email, consultant.password);
      await page.goto(`/studies/${studyId}/checks`);
      const finding = page.getByRole('article', { name: UNIT_FINDING });
      await expect(finding.getByRole('link', { name: /1 open comment thread on the finding/ })).toBeVisible();
      await finding.getByRole('button', { name: /^Comment on the finding/ }).click();
      const box = finding.getByLabel(/^Comment on the finding/);
      await expect(box).toBeFocused();
      await ReviewPage.compose(box, [{ mention: 'Priya Nair' }, 'please size the study on the 20 classrooms, not on the pupils.']);
      await expect(box).toHaveValue('@Priya Nair please size the study on the 20 classrooms, not on the pupils.');
      await finding.getByRole('button', { name: 'Start thread' }).click();
      await expect(finding.getByRole('status')).toContainText('Comment saved.');
      await expect(finding.getByRole('link', { name: /2 open comment threads on the finding/ })).toBeVisible();
      await checkA11y(page, 'checks tab with a comment marker (consultant)');
    });

    await test.step('the owner gets the mention by e-mail, with a link to the thread and a one-click unsubscribe', async () => {
      const mail = await new OutboxHelper().waitForMail({ to: owner.email, subject: 'mentioned you on', since, timeoutMs: 20_000 });
      expect(mail.subject).toContain('Lena Vogel mentioned you on');
      expect(mail.text).toContain('please size the study on the 20 classrooms');
      expect(mail.text).toContain(`/studies/${studyId}/review`);
    });

    const newThread = ownerReview.thread(UNIT_FINDING, ownerReview.openThreads).filter({ hasText: 'please size the study on the 20 classrooms' });
    await test.step('the owner sees the new comment without reloading, and replies', async () => {
      await expect(newThread).toBeVisible({ timeout: 20_000 });
      await expect(newThread.getByText('@Priya Nair', { exact: true })).toBeVisible();
      await newThread.getByRole('button', { name: 'Reply' }).click();
      const reply = newThread.getByLabel(/^Reply on/);
      await expect(reply).toBeFocused();
      await ReviewPage.compose(reply, [{ mention: 'Lena Vogel' }, 'thank you, we will plan on 20 classrooms with a mixed model.']);
      await newThread.getByRole('button', { name: 'Reply', exact: true }).click();
      await expect(newThread.getByRole('status')).toContainText('Reply added.');
      await expect(newThread).toContainText('@Lena Vogel thank you, we will plan on 20 classrooms with a mixed model.');
    });

    await test.step('the owner accepts the consultant’s suggestion: the design gets a new revision with it', async () => {
      const suggestion = ownerReview.suggestion(/Adjusts for the baseline measurement/);
      await expect(suggestion).toContainText(/No\s*→\s*changed to\s*Yes/);
      await suggestion.getByRole('button', { name: 'Accept' }).click();
      await expect(suggestion.getByRole('status')).toContainText('Accepted: the design is now at revision 2.');
      await expect(suggestion).toContainText('Accepted by Priya Nair');
      const design = await ownerPage.request.get(`/api/v1/studies/${studyId}/design`);
      const body = (await design.json()) as { revision: number; design: { analysis: { adjustsForBaseline: boolean } } };
      expect(body.revision).toBe(2);
      expect(body.design.analysis.adjustsForBaseline).toBe(true);
      await checkA11y(ownerPage, 'review tab after replying and accepting (owner)');
    });

    await test.step('the consultant filters the threads she wrote in, by the address', async () => {
      const review = new ReviewPage(page);
      await review.goto(studyId);
      await review.state.selectOption({ label: 'Resolved' });
      await expect(page).toHaveURL(/state=resolved/);
      await expect(review.openThreads.getByRole('article')).toHaveCount(0);
      await expect(review.resolvedThreads.getByRole('article')).toHaveCount(1);
      await page.reload();
      await expect(review.state).toHaveValue('resolved');
      await review.about.selectOption({ label: 'Findings' });
      await expect(page).toHaveURL(/anchorKind=finding/);
      await expect(review.resolvedThreads.getByRole('article')).toHaveCount(0);
      await checkA11y(page, 'review tab filtered (consultant)');
    });

    await test.step('the consultant signs off the newest version under a name', async () => {
      await page.goto(`/studies/${studyId}/review/versions`);
      await page.getByLabel('Name of the version').fill('Ethics board v1');
      await page.getByLabel('What you reviewed').fill('The design, the checks and the Plan; the analysis accounts for classrooms.');
      await page.getByRole('button', { name: /^Sign off version \d+$/ }).click();
      await expect(page.getByText('Status: Signed off')).toBeVisible();
      await atBothWidths(page, 'versions-after-signoff-consultant');
    });

    await test.step('an edit by the owner marks the study changed since sign-off, and the comparison shows it', async () => {
      const wizard = new DesignWizardPage(ownerPage);
      await wizard.open(studyId, 'outcome');
      await ownerPage.getByLabel('Unit', { exact: true }).fill('points on the reading test');
      await wizard.waitSaved();
      await ownerPage.goto(`/studies/${studyId}/review/versions`);
      const banner = ownerPage.getByRole('note', { name: 'Changed since sign-off' });
      await expect(banner).toContainText('Ethics board v1');
      await banner.getByRole('link', { name: 'See what changed' }).click();
      await ownerPage.waitForURL(/\/review\/compare\?from=\d+&to=\d+$/);
      // The Outcome step also writes its unticked yes/no boxes as "No" where the seeded design left
      // them not given (a known wizard fault, noted on issue 12); the Unit row is the edit made here.
      const change = ownerPage.getByTestId('change').filter({ hasText: 'Unit' });
      await expect(change).toHaveCount(1);
      await expect(change).toContainText('points');
      await expect(change).toContainText('points on the reading test');
      await atBothWidths(ownerPage, 'compare-after-signoff-owner');
    });
  } finally {
    await ownerContext.close();
  }
});
