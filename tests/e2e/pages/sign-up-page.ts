import { expect, type Locator, type Page } from '@playwright/test';

/** /sign-up: name, e-mail and password; success replaces the form with a "check your inbox" status. */
export class SignUpPage {
  readonly heading: Locator;
  readonly name: Locator;
  readonly email: Locator;
  readonly password: Locator;
  readonly submit: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 1, name: 'Create an account' });
    this.name = page.getByLabel('Name', { exact: true });
    this.email = page.getByLabel('E-mail', { exact: true });
    this.password = page.getByLabel('Password', { exact: true });
    this.submit = page.getByRole('button', { name: 'Create account' });
  }

  async goto(callbackUrl?: string): Promise<void> {
    await this.page.goto(callbackUrl ? `/sign-up?callbackUrl=${encodeURIComponent(callbackUrl)}` : '/sign-up');
    await expect(this.heading).toBeVisible();
  }

  async fill(values: { name: string; email: string; password: string }): Promise<void> {
    await this.name.fill(values.name);
    await this.email.fill(values.email);
    await this.password.fill(values.password);
  }

  async signUp(values: { name: string; email: string; password: string }): Promise<void> {
    await this.fill(values);
    await this.submit.click();
  }

  /** The outcome message of the form (its aria-live region). */
  message(text: string | RegExp): Locator {
    return this.page.getByRole('main').getByText(text);
  }

  async expectCheckInbox(email: string): Promise<void> {
    await expect(this.message(`Check your inbox at ${email}`)).toBeVisible();
  }
}
