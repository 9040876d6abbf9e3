/**
 * Accounts: breached passwords, unverified sign-in, generic wrong-password answers, password
 * reset (single use), magic-link sign-in and sign-out. One account goes through the steps in
 * order (serial), so the spec creates a single user plus one refused sign-up.
 */
import { expect, test } from '@playwright/test';
import { ForgotPasswordPage, ResetPasswordPage } from './pages/email-pages';
import { OutboxHelper } from './pages/outbox';
import { SignInPage } from './pages/sign-in-page';
import { SignUpPage } from './pages/sign-up-page';
import { WorkspacePage } from './pages/workspace-page';
import { signUp, verifyThroughOutbox, VERIFY_SUBJECT } from './support/flows';
import { distinctClientHeaders, OTHER_STRONG_PASSWORD, STRONG_PASSWORD, uniqueEmail } from './support/test-data';

test.use({ extraHTTPHeaders: distinctClientHeaders() });
test.describe.configure({ mode: 'serial' });

const GENERIC_SIGN_IN_ERROR = 'That e-mail and password do not match an account. Check both, or use a sign-in link instead.';
const outbox = new OutboxHelper();
const user = { name: 'Bruno Achterberg', email: uniqueEmail('auth'), password: STRONG_PASSWORD };

test('a common password is refused at sign-up, on the Password field', async ({ page }) => {
  const signUpPage = new SignUpPage(page);
  await signUpPage.goto();
  const email = uniqueEmail('common');
  await signUpPage.signUp({ name: 'Casey Common', email, password: 'password123' });
  await expect(signUpPage.password).toHaveAttribute('aria-invalid', 'true');
  await expect(signUpPage.password).toHaveAccessibleDescription(/appears in lists of commonly used or breached passwords/);
  await expect(signUpPage.submit).toBeVisible(); // still on the form: no account was made
  await expect(signUpPage.message(/Check your inbox/)).toHaveCount(0);
  // Give a refused sign-up's mail time to arrive, if the app sent one by mistake.
  await page.waitForTimeout(500);
  expect(await outbox.find({ to: email, subject: /./ })).toHaveLength(0);
});

test('signing in before confirming the e-mail address asks to confirm it first', async ({ page }) => {
  await signUp(page, user);
  await outbox.waitForMail({ to: user.email, subject: VERIFY_SUBJECT });
  const since = new Date();
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn(user.email, user.password);
  await expect(signIn.message('Confirm your e-mail address first. We have sent you a new confirmation link.')).toBeVisible();
  await expect(page).toHaveURL(/\/sign-in/);
  // The promised new confirmation link arrives.
  await outbox.waitForMail({ to: user.email, subject: VERIFY_SUBJECT, since });
});

test('a wrong password gets a generic answer that does not reveal whether the account exists', async ({ page }) => {
  await verifyThroughOutbox(page, user.email, outbox);
  const signIn = new SignInPage(page);

  await signIn.goto();
  await signIn.signIn(user.email, 'Not-The-Right-Password-1');
  await expect(signIn.message(GENERIC_SIGN_IN_ERROR)).toBeVisible();
  await expect(page).toHaveURL(/\/sign-in/);

  await signIn.goto();
  await signIn.signIn(uniqueEmail('nobody'), 'Not-The-Right-Password-1');
  await expect(signIn.message(GENERIC_SIGN_IN_ERROR)).toBeVisible();
  await expect(page).toHaveURL(/\/sign-in/);
  // No wording that would tell an existing address from an unknown one.
  await expect(page.getByRole('main')).not.toContainText(/no account|not registered|unknown|does not exist/i);
});

test('a password reset link changes the password once', async ({ page }) => {
  const since = new Date();
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.forgotPassword.click();
  const forgot = new ForgotPasswordPage(page);
  await expect(forgot.heading).toBeVisible();
  await forgot.request(user.email);

  const { link } = await outbox.waitForLink({ to: user.email, subject: 'Reset your Unitwise password', since });
  expect(link).toMatch(/^http:\/\/localhost:3100\/reset-password\?token=/);

  const reset = new ResetPasswordPage(page);
  await reset.open(link);
  await reset.change(OTHER_STRONG_PASSWORD);
  await expect(reset.message('Your password is changed')).toBeVisible();
  await reset.goToSignIn.click();

  await expect(signIn.heading).toBeVisible();
  await signIn.signIn(user.email, user.password);
  await expect(signIn.message(GENERIC_SIGN_IN_ERROR)).toBeVisible(); // the old password is gone
  await signIn.password.fill(OTHER_STRONG_PASSWORD);
  await signIn.submit.click();
  await new WorkspacePage(page).expectLoaded();
  user.password = OTHER_STRONG_PASSWORD;

  // The same link a second time is refused.
  await reset.open(link);
  await reset.change('Second-Attempt-Willow-55');
  await expect(reset.message('This reset link has expired or was already used. Ask for a new one.')).toBeVisible();
  await expect(reset.goToSignIn).toHaveCount(0);
});

test('a magic link signs the user in', async ({ page }) => {
  const since = new Date();
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.requestLink(user.email);
  await page.waitForURL(/\/sign-in\/check-email/);
  await expect(page.getByRole('heading', { level: 1, name: 'Check your inbox' })).toBeVisible();

  const { link } = await outbox.waitForLink({ to: user.email, subject: 'Your sign-in link for Unitwise', since });
  expect(link.startsWith('http://localhost:3100/')).toBe(true);
  await page.goto(link);
  const workspace = new WorkspacePage(page);
  await workspace.expectLoaded();
  await expect(workspace.header.signOut).toBeVisible();
});

test('signing out returns to the landing page and protects /studies again', async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn(user.email, user.password);
  const workspace = new WorkspacePage(page);
  await workspace.expectLoaded();

  await workspace.header.signOut.click();
  await page.waitForURL((url) => url.pathname === '/');
  await expect(page.getByRole('heading', { level: 1, name: 'Count the units that are really independent.' })).toBeVisible();
  await expect(page.getByRole('navigation', { name: 'Account' }).getByRole('link', { name: 'Sign in' })).toBeVisible();

  await page.goto('/studies');
  await expect(page).toHaveURL(/\/sign-in(\?|$)/);
  await expect(signIn.heading).toBeVisible();
});
