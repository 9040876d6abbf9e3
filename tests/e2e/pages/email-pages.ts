import { expect, type Locator, type Page } from '@playwright/test';

/** /verify-email?token=…: one button confirms, then a "Go to sign-in" link. */
export class VerifyEmailPage {
  readonly heading: Locator;
  readonly confirm: Locator;
  readonly confirmed: Locator;
  readonly goToSignIn: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 1, name: 'Confirm your e-mail address' });
    this.confirm = page.getByRole('button', { name: 'Confirm my e-mail address' });
    this.confirmed = page.getByRole('main').getByText('Your e-mail address is confirmed');
    this.goToSignIn = page.getByRole('link', { name: 'Go to sign-in' });
  }

  async open(link: string): Promise<void> {
    await this.page.goto(link);
    await expect(this.heading).toBeVisible();
  }

  async confirmAddress(): Promise<void> {
    await this.confirm.click();
    await expect(this.confirmed).toBeVisible();
    await expect(this.goToSignIn).toBeVisible();
  }
}

/** /forgot-password: one e-mail field. */
export class ForgotPasswordPage {
  readonly heading: Locator;
  readonly email: Locator;
  readonly submit: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 1, name: 'Reset your password' });
    this.email = page.getByLabel('E-mail', { exact: true });
    this.submit = page.getByRole('button', { name: 'Send reset link' });
  }

  async goto(): Promise<void> {
    await this.page.goto('/forgot-password');
    await expect(this.heading).toBeVisible();
  }

  async request(email: string): Promise<void> {
    await this.email.fill(email);
    await this.submit.click();
    await expect(this.page.getByRole('main').getByText(`If ${email} has an account, a reset link is on its way`)).toBeVisible();
  }
}

/** /reset-password?token=…: new password twice. */
export class ResetPasswordPage {
  readonly heading: Locator;
  readonly password: Locator;
  readonly confirm: Locator;
  readonly submit: Locator;
  readonly goToSignIn: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 1, name: 'Choose a new password' });
    this.password = page.getByLabel('New password', { exact: true });
    this.confirm = page.getByLabel('New password again', { exact: true });
    this.submit = page.getByRole('button', { name: 'Change password' });
    this.goToSignIn = page.getByRole('link', { name: 'Go to sign-in' });
  }

  async open(link: string): Promise<void> {
    await this.page.goto(link);
    await expect(this.heading).toBeVisible();
  }

  async change(password: string): Promise<void> {
    await this.password.fill(password);
    await this.confirm.fill(password);
    await this.submit.click();
  }

  message(text: string | RegExp): Locator {
    return this.page.getByRole('main').getByText(text);
  }
}
