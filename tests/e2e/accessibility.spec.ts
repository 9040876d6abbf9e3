/**
 * Automated WCAG 2.1 A/AA checks (axe) of every main page, failing on serious or critical
 * violations, plus a keyboard check of the sign-in page.
 */
import { expect, test, type BrowserContext, type Page } from '@playwright/test';
import { ForgotPasswordPage } from './pages/email-pages';
import { InvitationPage } from './pages/invitation-page';
import { OutboxHelper, OutboxPage } from './pages/outbox';
import { SignInPage } from './pages/sign-in-page';
import { SignUpPage } from './pages/sign-up-page';
import { StudyPage } from './pages/study-page';
import { WorkspacePage } from './pages/workspace-page';
import { expectNoSeriousA11yViolations } from './support/axe';
import { registerAndSignIn } from './support/flows';
import { APP_ORIGIN, distinctClientHeaders, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

const clientHeaders = distinctClientHeaders();
test.use({ extraHTTPHeaders: clientHeaders });

test.describe('signed-out pages', () => {
  test('landing page', async ({ page }) => {
    await page.goto('/');
    await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
    await expectNoSeriousA11yViolations(page, 'Landing page');
  });

  test('sign-in page, in both modes', async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.goto();
    await expectNoSeriousA11yViolations(page, 'Sign-in page (password)');
    await signIn.linkMode.click();
    await expect(signIn.sendLink).toBeVisible();
    await expectNoSeriousA11yViolations(page, 'Sign-in page (e-mail link)');
  });

  test('sign-up page, also with field errors shown', async ({ page }) => {
    const signUp = new SignUpPage(page);
    await signUp.goto();
    await expectNoSeriousA11yViolations(page, 'Sign-up page');
    await signUp.submit.click(); // empty form: client-side errors on every field
    await expect(signUp.name).toHaveAttribute('aria-invalid', 'true');
    await expectNoSeriousA11yViolations(page, 'Sign-up page with errors');
  });

  test('forgot-password page', async ({ page }) => {
    await new ForgotPasswordPage(page).goto();
    await expectNoSeriousA11yViolations(page, 'Forgot-password page');
  });

  test('outbox page', async ({ page }) => {
    await new OutboxPage(page).goto();
    await expectNoSeriousA11yViolations(page, 'Outbox page');
  });

  test('keyboard: Tab reaches the E-mail field on sign-in, with a visible focus outline', async ({ page }) => {
    const signIn = new SignInPage(page);
    await signIn.goto();
    let reached = false;
    for (let i = 0; i < 15 && !reached; i += 1) {
      await page.keyboard.press('Tab');
      reached = await signIn.email.evaluate((el) => el === document.activeElement);
    }
    expect(reached, 'Tab never reached the E-mail field within 15 presses').toBe(true);
    await expect(signIn.email).toBeFocused();
    const outline = await signIn.email.evaluate((el) => {
      const s = getComputedStyle(el);
      return { style: s.outlineStyle, width: s.outlineWidth, focusVisible: el.matches(':focus-visible') };
    });
    expect(outline.focusVisible).toBe(true);
    expect(outline.style, `focused E-mail field has outline ${JSON.stringify(outline)}`).not.toBe('none');
    expect(parseFloat(outline.width)).toBeGreaterThan(0);
  });
});

test.describe('signed-in pages', () => {
  test.describe.configure({ mode: 'serial' });

  let context: BrowserContext;
  let page: Page;
  let workspaceId = '';
  let studyId = '';
  let invitationLink = '';

  test.beforeAll(async ({ browser }) => {
    test.setTimeout(60_000);
    context = await browser.newContext({ baseURL: APP_ORIGIN, extraHTTPHeaders: clientHeaders });
    page = await context.newPage();
    const owner = { name: 'Iris Nakamura', email: uniqueEmail('a11y'), password: STRONG_PASSWORD };
    workspaceId = await registerAndSignIn(page, owner);
    studyId = await new WorkspacePage(page).createStudyNamed('Classroom noise and attention', 'Pupils nested in classrooms, measured twice.');
    const invitee = uniqueEmail('a11y-invitee');
    await new StudyPage(page).inviteSomeone(invitee, 'Viewer');
    ({ link: invitationLink } = await new OutboxHelper().waitForLink({ to: invitee, subject: /invited you to/ }));
  });

  test.afterAll(async () => {
    await context?.close();
  });

  test('workspace studies page', async () => {
    const workspace = new WorkspacePage(page);
    await workspace.goto(workspaceId);
    await expect(workspace.studyLink('Classroom noise and attention')).toBeVisible();
    await expectNoSeriousA11yViolations(page, 'Workspace studies page');
    await workspace.newStudy.click();
    await expect(workspace.title).toBeVisible();
    await expectNoSeriousA11yViolations(page, 'Workspace studies page with the New study form');
  });

  test('study overview', async () => {
    const study = new StudyPage(page);
    await study.goto(studyId);
    await expect(study.team.getByRole('listitem').first()).toBeVisible();
    await expect(study.invite.getByRole('listitem').first()).toBeVisible();
    await expectNoSeriousA11yViolations(page, 'Study overview');
  });

  test('a tab that is not built yet (Pilot data)', async () => {
    const study = new StudyPage(page);
    await study.goto(studyId);
    await study.tab('Pilot data').click();
    await expect(study.notBuiltHeading('Pilot data')).toBeVisible();
    await expect(study.tab('Pilot data')).toHaveAttribute('aria-current', 'page');
    await expectNoSeriousA11yViolations(page, 'Study Pilot data tab');
  });

  test('workspace members page', async () => {
    await page.goto(`/workspaces/${workspaceId}/members`);
    await expect(page.getByRole('heading', { level: 1, name: 'Members' })).toBeVisible();
    await expect(page.getByRole('region', { name: 'People in this workspace' }).getByRole('listitem').first()).toBeVisible();
    await expectNoSeriousA11yViolations(page, 'Workspace members page');
  });

  test('invitation page, signed out and signed in as someone else', async ({ browser }) => {
    const signedOut = await browser.newContext({ baseURL: APP_ORIGIN, extraHTTPHeaders: clientHeaders });
    try {
      const guestPage = await signedOut.newPage();
      const invitation = new InvitationPage(guestPage);
      await invitation.open(invitationLink);
      await expect(invitation.signInToAccept).toBeVisible();
      await expectNoSeriousA11yViolations(guestPage, 'Invitation page (signed out)');
    } finally {
      await signedOut.close();
    }
    const invitation = new InvitationPage(page);
    await invitation.open(invitationLink);
    await expect(invitation.summary(/You are signed in as/)).toBeVisible();
    await expectNoSeriousA11yViolations(page, 'Invitation page (signed in as another address)');
  });
});
