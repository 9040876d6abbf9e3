/**
 * Multi-page journeys the specs share: create an account and confirm its address through the
 * outbox, then sign in.
 */
import { expect, type Page } from '@playwright/test';
import { VerifyEmailPage } from '../pages/email-pages';
import { OutboxHelper } from '../pages/outbox';
import { SignInPage } from '../pages/sign-in-page';
import { SignUpPage } from '../pages/sign-up-page';
import { WorkspacePage } from '../pages/workspace-page';

export interface NewUser {
  name: string;
  email: string;
  password: string;
}

export const VERIFY_SUBJECT = 'Confirm your e-mail address for Unitwise';

/** Signs up (from the current sign-up page, or opens /sign-up) and waits for the "check your inbox" status. */
export async function signUp(page: Page, user: NewUser, { open = true } = {}): Promise<void> {
  const signUpPage = new SignUpPage(page);
  if (open) await signUpPage.goto();
  await signUpPage.signUp(user);
  await signUpPage.expectCheckInbox(user.email);
}

/** Opens the newest verification link sent to the user and confirms the address. */
export async function verifyThroughOutbox(page: Page, email: string, outbox = new OutboxHelper()): Promise<void> {
  const { link } = await outbox.waitForLink({ to: email, subject: VERIFY_SUBJECT });
  expect(link).toMatch(/^http:\/\/localhost:3100\/verify-email\?token=/);
  const verify = new VerifyEmailPage(page);
  await verify.open(link);
  await verify.confirmAddress();
}

/** Signs in with the password and returns the id of the workspace the browser lands on. */
export async function signInToWorkspace(page: Page, email: string, password: string): Promise<string> {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn(email, password);
  return new WorkspacePage(page).expectLoaded();
}

/** Sign up, verify and sign in; resolves with the personal workspace's id. */
export async function registerAndSignIn(page: Page, user: NewUser): Promise<string> {
  await signUp(page, user);
  await verifyThroughOutbox(page, user.email);
  return signInToWorkspace(page, user.email, user.password);
}
