import { expect, type Locator, type Page } from '@playwright/test';

/** /sign-in: password or e-mailed link, toggled by two pressed/unpressed buttons. */
export class SignInPage {
  readonly heading: Locator;
  readonly passwordMode: Locator;
  readonly linkMode: Locator;
  readonly email: Locator;
  readonly password: Locator;
  readonly submit: Locator;
  readonly sendLink: Locator;
  readonly forgotPassword: Locator;
  readonly createAccount: Locator;

  constructor(readonly page: Page) {
    this.heading = page.getByRole('heading', { level: 1, name: 'Sign in' });
    const modes = page.getByRole('group', { name: 'How to sign in' });
    this.passwordMode = modes.getByRole('button', { name: 'Password', exact: true });
    this.linkMode = modes.getByRole('button', { name: 'E-mail me a link' });
    this.email = page.getByLabel('E-mail', { exact: true });
    this.password = page.getByLabel('Password', { exact: true });
    this.submit = page.getByRole('button', { name: 'Sign in', exact: true });
    this.sendLink = page.getByRole('button', { name: 'Send sign-in link' });
    this.forgotPassword = page.getByRole('link', { name: 'Forgot your password?' });
    this.createAccount = page.getByRole('main').getByRole('link', { name: 'Create an account' });
  }

  async goto(callbackUrl?: string): Promise<void> {
    await this.page.goto(callbackUrl ? `/sign-in?callbackUrl=${encodeURIComponent(callbackUrl)}` : '/sign-in');
    await expect(this.heading).toBeVisible();
  }

  async signIn(email: string, password: string): Promise<void> {
    await this.email.fill(email);
    await this.password.fill(password);
    await this.submit.click();
  }

  /** Signs in and waits until the browser has left /sign-in. */
  async signInAndLeave(email: string, password: string): Promise<void> {
    await this.signIn(email, password);
    await this.page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  }

  async requestLink(email: string): Promise<void> {
    await this.linkMode.click();
    await expect(this.linkMode).toHaveAttribute('aria-pressed', 'true');
    await this.email.fill(email);
    await this.sendLink.click();
  }

  /** The outcome message of the form (its aria-live region). */
  message(text: string | RegExp): Locator {
    return this.page.getByRole('main').getByText(text);
  }
}
